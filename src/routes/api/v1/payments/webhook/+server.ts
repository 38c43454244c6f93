import { json } from '@sveltejs/kit';
import { readBodyText } from '$lib/server/api';
import { MAX_WEBHOOK_BYTES, receivePaymentWebhook } from '$lib/server/payment-webhook';
import type { RequestHandler } from './$types';

/**
 * The payment service's webhook: no session and no Origin (listed in ORIGIN_FREE); it is
 * authenticated by the signature over the raw body, so the body is read as text, never parsed first.
 */
export const POST: RequestHandler = async ({ request }) => {
	const read = await readBodyText(request, MAX_WEBHOOK_BYTES);
	if (!read.ok) return read.response;
	const answer = await receivePaymentWebhook(read.text, request.headers.get('stripe-signature'));
	return json(answer.body, { status: answer.status });
};
