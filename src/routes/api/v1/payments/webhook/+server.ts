import { json } from '@sveltejs/kit';
import { MAX_WEBHOOK_BYTES, receivePaymentWebhook } from '$lib/server/payment-webhook';
import type { RequestHandler } from './$types';

/** The payment service's webhook: no session, authenticated by its signature over the raw body. */
export const POST: RequestHandler = async ({ request }) => {
	const length = Number(request.headers.get('content-length') ?? 0);
	if (length > MAX_WEBHOOK_BYTES) return json({ received: false, error: { code: 'too_large', message: 'Body too large.' } }, { status: 413 });
	const raw = await request.text();
	if (raw.length > MAX_WEBHOOK_BYTES) return json({ received: false, error: { code: 'too_large', message: 'Body too large.' } }, { status: 413 });
	const answer = await receivePaymentWebhook(raw, request.headers.get('stripe-signature'));
	return json(answer.body, { status: answer.status });
};
