import Stripe from 'stripe';
import { paymentSettings } from './config';

/**
 * The payment service's SDK, configured only from the environment (see .env.example): the
 * local fake and the real service differ in host, port, protocol and keys, never in code.
 */
let client: Stripe | undefined;
let clientKey = '';

export function paymentClient(): Stripe {
	const key = [paymentSettings.secretKey, paymentSettings.apiHost, paymentSettings.apiPort, paymentSettings.apiProtocol].join('|');
	if (!client || key !== clientKey) {
		if (!paymentSettings.secretKey) throw new PaymentsNotConfigured();
		clientKey = key;
		client = new Stripe(paymentSettings.secretKey, {
			host: paymentSettings.apiHost,
			port: paymentSettings.apiPort,
			protocol: paymentSettings.apiProtocol,
			maxNetworkRetries: 2,
			timeout: 20_000,
			telemetry: false
		});
	}
	return client;
}

export class PaymentsNotConfigured extends Error {
	constructor() {
		super('Payments are not set up on this server (STRIPE_SECRET_KEY is empty).');
	}
}

/**
 * Verifies a webhook delivery with the SDK (signature over the raw body, timestamp within the
 * tolerance) and returns the event; throws `Stripe.errors.StripeSignatureVerificationError`.
 */
export function verifyWebhook(rawBody: string, signature: string, nowSeconds?: number): Stripe.Event {
	if (!paymentSettings.webhookSecret) throw new PaymentsNotConfigured();
	return paymentClient().webhooks.constructEvent(rawBody, signature, paymentSettings.webhookSecret, paymentSettings.webhookToleranceSeconds, undefined, nowSeconds);
}

/** A short message for a failed call to the service; never the key or the raw request. */
export function paymentErrorMessage(e: unknown): string {
	if (e instanceof PaymentsNotConfigured) return e.message;
	if (e instanceof Stripe.errors.StripeError) return `The payment service refused: ${e.message}`;
	return 'The payment service did not answer. Nothing was charged; try again in a minute.';
}
