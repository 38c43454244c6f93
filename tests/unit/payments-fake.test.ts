import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseFormBody, startPaymentsFake } from '../../fakes/payments';

/**
 * The payments fake as the unmodified `stripe` SDK (stripe-node) sees it: the SDK's own error
 * classes must come out of the fake's error bodies, and Idempotency-Key must replay answers.
 */
let fake: Awaited<ReturnType<typeof startPaymentsFake>>;
let client: Stripe;
const session = () => ({
	mode: 'payment' as const,
	line_items: [{ quantity: 2, price_data: { currency: 'eur', unit_amount: 39000, product_data: { name: 'Seat' } } }],
	success_url: 'http://app.test/ok',
	cancel_url: 'http://app.test/cancel'
});

beforeAll(async () => {
	fake = await startPaymentsFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), 'pw-fake-')), webhookUrl: null, webhookSecret: 'whsec_x', secretKey: 'sk_test_right' });
	client = new Stripe('sk_test_right', { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0, telemetry: false });
});
afterAll(async () => fake.close());

describe('payments fake', () => {
	it('creates, retrieves and expires a checkout session with the amounts in minor units', async () => {
		const created = await client.checkout.sessions.create(session());
		expect(created).toMatchObject({ object: 'checkout.session', status: 'open', amount_total: 78000, currency: 'eur' });
		expect(created.url).toBe(`${fake.url}pay/${created.id}`);
		expect((await client.checkout.sessions.retrieve(created.id)).id).toBe(created.id);
		expect((await client.checkout.sessions.expire(created.id)).status).toBe('expired');
		expect(fake.state.events.at(-1)?.type).toBe('checkout.session.expired');
	});

	it('answers with the SDK error shapes', async () => {
		const missing = await client.checkout.sessions.create({ ...session(), success_url: undefined } as never).catch((e) => e);
		expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
		expect(missing).toMatchObject({ statusCode: 400, code: 'parameter_missing', param: 'success_url' });
		const unknown = await client.checkout.sessions.retrieve('cs_test_nothing').catch((e) => e);
		expect(unknown).toMatchObject({ statusCode: 404, code: 'resource_missing' });
		const again = await client.checkout.sessions.expire((await client.checkout.sessions.create(session())).id).then((s) => client.checkout.sessions.expire(s.id)).catch((e) => e);
		expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
		const wrongKey = new Stripe('sk_test_wrong', { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });
		expect(await wrongKey.checkout.sessions.create(session()).catch((e) => e)).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
		const refund = await client.refunds.create({ payment_intent: 'pi_nothing' }).catch((e) => e);
		expect(refund).toMatchObject({ statusCode: 404, param: 'payment_intent' });
	});

	it('replays an Idempotency-Key and refuses it with other parameters', async () => {
		const first = await client.checkout.sessions.create(session(), { idempotencyKey: 'order-1' });
		const second = await client.checkout.sessions.create(session(), { idempotencyKey: 'order-1' });
		expect(second.id).toBe(first.id);
		const other = await client.checkout.sessions.create({ ...session(), cancel_url: 'http://app.test/else' }, { idempotencyKey: 'order-1' }).catch((e) => e);
		expect(other).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
	});

	it('refunds fully or partly, never beyond the charge, and signals charge.refunded each time', async () => {
		const created = await client.checkout.sessions.create(session());
		const back = await fetch(`${fake.url}pay/${created.id}`, { method: 'POST', body: new URLSearchParams({ card: '4242 4242 4242 4242' }), redirect: 'manual' });
		expect(back.headers.get('location')).toBe('http://app.test/ok');
		const pi = (await client.checkout.sessions.retrieve(created.id)).payment_intent as string;
		expect((await client.refunds.create({ payment_intent: pi, amount: 39000 })).amount).toBe(39000);
		expect(await client.refunds.create({ payment_intent: pi, amount: 39001 }).catch((e) => e)).toMatchObject({ code: 'amount_too_large', param: 'amount' });
		expect((await client.refunds.create({ payment_intent: pi })).amount).toBe(39000);
		expect(await client.refunds.create({ payment_intent: pi }).catch((e) => e)).toMatchObject({ code: 'charge_already_refunded' });
		const refunded = fake.state.events.filter((e) => e.type === 'charge.refunded').map((e) => (e.data.object as { amount_refunded: number }).amount_refunded);
		expect(refunded.slice(-2)).toEqual([39000, 78000]);
	});

	it('refuses keys that reach an object prototype', () => {
		expect(() => parseFormBody('__proto__[admin]=1')).toThrow(/Invalid parameter/);
		expect(() => parseFormBody('metadata[constructor][x]=1')).toThrow(/Invalid parameter/);
		expect(parseFormBody('line_items[0][quantity]=2&metadata[a]=b')).toEqual({ line_items: [{ quantity: '2' }], metadata: { a: 'b' } });
	});
});
