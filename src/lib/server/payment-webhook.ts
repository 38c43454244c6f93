import Stripe from 'stripe';
import type { ApiErrorCode } from '$lib/api-error';
import { db as defaultDb, type DB } from './db';
import { applyPaymentEvent } from './orders';
import { PaymentsNotConfigured, verifyWebhook } from './payments';

export const MAX_WEBHOOK_BYTES = 512 * 1024;

export interface WebhookAnswer {
	status: number;
	body: { received: boolean; outcome?: string; error?: { code: ApiErrorCode; message: string; reason: string } };
}

/** Refusals in the API's error shape, with the finer reason for the service's delivery log. */
const refuse = (status: number, reason: string, message: string): WebhookAnswer => ({
	status,
	body: { received: false, error: { code: status === 503 ? 'unavailable' : 'bad_request', message, reason } }
});

/**
 * One webhook delivery: the signature is checked over the exact bytes received (a re-encoded
 * body would not verify), stale timestamps are refused, then the event is applied once.
 * 2xx tells the service to stop; anything else makes it retry with back-off.
 */
export async function receivePaymentWebhook(rawBody: string, signature: string | null, db: DB = defaultDb, nowSeconds?: number): Promise<WebhookAnswer> {
	if (!signature) return refuse(400, 'signature-missing', 'The Stripe-Signature header is missing.');
	let event: Stripe.Event;
	try {
		event = verifyWebhook(rawBody, signature, nowSeconds);
	} catch (e) {
		if (e instanceof PaymentsNotConfigured) return refuse(503, 'not-configured', e.message);
		if (e instanceof Stripe.errors.StripeSignatureVerificationError) return refuse(400, 'signature-invalid', 'The signature does not match, or the event is too old.');
		return refuse(400, 'payload-invalid', 'The body is not an event.');
	}
	if (typeof event?.id !== 'string' || typeof event.type !== 'string' || !event.data) return refuse(400, 'payload-invalid', 'The body is not an event.');
	const result = await applyPaymentEvent(event, db);
	return { status: result.status, body: { received: result.status === 200, outcome: result.outcome } };
}
