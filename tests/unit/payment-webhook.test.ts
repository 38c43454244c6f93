import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { listAudit } from '$lib/server/audit';
import { addMember, createCompany } from '$lib/server/companies';
import type { DB } from '$lib/server/db';
import { isEnrolled } from '$lib/server/enrolments';
import { getOrder, startOrder } from '$lib/server/orders';
import { receivePaymentWebhook } from '$lib/server/payment-webhook';
import { loadIdentity } from '$lib/server/roles';
import { seatLedger } from '$lib/server/seats';
import { createUser } from '$lib/server/users';
import { createTestDb } from '../helpers/db';
import { startPaymentsHarness, WEBHOOK_SECRET } from '../helpers/payments';

/**
 * The webhook end to end through the real `stripe` SDK and the local payments fake. Signatures
 * are made with the SDK's own `webhooks.generateTestHeaderString` (stripe-node), which follows
 * the service's published scheme; every case asserts the seat ledger, not only the status.
 */
const COURSE = 'point-repair-installer';
const sdk = new Stripe('sk_test_unit');

let db: DB;
let harness: Awaited<ReturnType<typeof startPaymentsHarness>>;
let companyId: string;
let adminId: string;

beforeAll(async () => {
	harness = await startPaymentsHarness(() => db);
});
afterAll(async () => harness.close());

beforeEach(async () => {
	db = await createTestDb();
	harness.fake.setDelivery('normal');
	const admin = await createUser({ email: 'boss@crew.test', name: 'Boss' }, db);
	adminId = admin.id;
	companyId = (await createCompany(null, 'Crew Test Ltd', db)).id;
	await addMember(null, companyId, admin.id, 'admin', db);
});

const admin = async () => (await loadIdentity(adminId, db))!;
const bought = async () => (await seatLedger(companyId, db)).find((l) => l.courseSlug === COURSE)?.bought ?? 0;

async function openOrder(quantity: number) {
	return startOrder(await admin(), { courseSlug: COURSE, quantity, companyId }, 'http://app.test', db);
}

function signed(event: object, options: { secret?: string; timestamp?: number } = {}) {
	const payload = JSON.stringify(event);
	const header = sdk.webhooks.generateTestHeaderString({ payload, secret: options.secret ?? WEBHOOK_SECRET, timestamp: options.timestamp });
	return { payload, header };
}

function completedEvent(order: { id: string; checkout_session_id: string | null; total_amount: number }, id = `evt_${crypto.randomUUID()}`) {
	return {
		id,
		object: 'event',
		type: 'checkout.session.completed',
		data: { object: { id: order.checkout_session_id, object: 'checkout.session', client_reference_id: order.id, metadata: { order_id: order.id }, payment_status: 'paid', status: 'complete', amount_total: order.total_amount, currency: 'eur', payment_intent: `pi_${id}` } }
	};
}

describe('payment webhook', () => {
	it('a paid checkout grants the seats once, with the order paid and audited', async () => {
		const order = await openOrder(5);
		expect(order.checkout_url).toMatch(/\/pay\/cs_test_/);
		expect(order.total_amount).toBe(5 * 39000);
		const back = await harness.pay(order.checkout_session_id!, '4242 4242 4242 4242');
		expect(back).toBe(`http://app.test/orders/${order.id}?paid=1`);
		await harness.settled();
		expect(await bought()).toBe(5);
		const stored = await getOrder(order.id, db);
		expect(stored?.state).toBe('paid');
		expect(stored?.payment_intent_id).toMatch(/^pi_/);
		expect((await listAudit({ subjectType: 'order', subjectId: order.id }, db)).map((a) => a.action)).toEqual(expect.arrayContaining(['order.create', 'order.state', 'seat.grant']));
	});

	it('a declined card or insufficient funds leaves the order open and no seats', async () => {
		const order = await openOrder(2);
		for (const card of ['4000000000000002', '4000000000009995']) {
			expect(await harness.pay(order.checkout_session_id!, card)).toMatch(/\/pay\//);
		}
		await harness.settled();
		expect((await getOrder(order.id, db))?.state).toBe('open');
		expect(await bought()).toBe(0);
	});

	it('duplicate delivery (the fake sends every event twice) grants once', async () => {
		harness.fake.setDelivery('twice');
		const order = await openOrder(3);
		await harness.pay(order.checkout_session_id!, '4242424242424242');
		await harness.settled();
		const event = harness.fake.state.events.at(-1)!;
		expect(event.deliveries.length).toBe(2);
		expect(await bought()).toBe(3);
	});

	it('a replayed event, signed afresh, is a 200 no-op', async () => {
		const order = await openOrder(2);
		const event = completedEvent(order);
		const first = signed(event);
		expect((await receivePaymentWebhook(first.payload, first.header, db)).status).toBe(200);
		const again = signed(event);
		const answer = await receivePaymentWebhook(again.payload, again.header, db);
		expect(answer.status).toBe(200);
		expect(answer.body.outcome).toMatch(/^duplicate/);
		expect(await bought()).toBe(2);
	});

	it('forged signature, wrong secret and stale timestamp are refused and grant nothing', async () => {
		const order = await openOrder(4);
		const event = completedEvent(order);
		const good = signed(event);
		const forged = good.header.replace(/v1=([0-9a-f])/, (_m, c) => `v1=${c === '0' ? '1' : '0'}`);
		expect((await receivePaymentWebhook(good.payload, forged, db)).status).toBe(400);
		const tampered = good.payload.replace('"amount_total":156000', '"amount_total":1');
		expect((await receivePaymentWebhook(tampered, good.header, db)).status).toBe(400);
		const wrong = signed(event, { secret: 'whsec_someone_else' });
		expect((await receivePaymentWebhook(wrong.payload, wrong.header, db)).status).toBe(400);
		const stale = signed(event, { timestamp: Math.floor(Date.now() / 1000) - 301 });
		expect((await receivePaymentWebhook(stale.payload, stale.header, db)).status).toBe(400);
		expect((await receivePaymentWebhook(good.payload, null, db)).status).toBe(400);
		expect(await bought()).toBe(0);
		expect((await getOrder(order.id, db))?.state).toBe('open');
		// The same event, correctly signed and fresh, still works afterwards: the refusals recorded nothing.
		expect((await receivePaymentWebhook(good.payload, good.header, db)).status).toBe(200);
		expect(await bought()).toBe(4);
	});

	it('completed after expired grants nothing and leaves a trace for the registrar', async () => {
		const order = await openOrder(2);
		const client = new Stripe('sk_test_unit', { host: '127.0.0.1', port: harness.fake.port, protocol: 'http', maxNetworkRetries: 0 });
		await client.checkout.sessions.expire(order.checkout_session_id!);
		await harness.settled();
		expect((await getOrder(order.id, db))?.state).toBe('expired');
		const late = signed(completedEvent(order));
		expect((await receivePaymentWebhook(late.payload, late.header, db)).status).toBe(200);
		expect(await bought()).toBe(0);
		expect((await getOrder(order.id, db))?.state).toBe('expired');
		expect((await listAudit({ subjectId: order.id }, db)).map((a) => a.action)).toContain('order.payment-after-close');
	});

	it('an unknown session, or a real session pointed at another order, is acknowledged and ignored', async () => {
		const order = await openOrder(2);
		const unknown = signed(completedEvent({ id: crypto.randomUUID(), checkout_session_id: 'cs_test_nobody', total_amount: 78000 }));
		const answer = await receivePaymentWebhook(unknown.payload, unknown.header, db);
		expect(answer).toMatchObject({ status: 200, body: { outcome: 'ignored: unknown session' } });
		const crossed = signed(completedEvent({ ...order, checkout_session_id: 'cs_test_other' }));
		expect((await receivePaymentWebhook(crossed.payload, crossed.header, db)).body.outcome).toBe('ignored: unknown session');
		expect(await bought()).toBe(0);
	});

	it('an amount that does not match the order grants nothing', async () => {
		const order = await openOrder(2);
		const cheap = signed(completedEvent({ ...order, total_amount: 100 }));
		expect((await receivePaymentWebhook(cheap.payload, cheap.header, db)).body.outcome).toMatch(/amount/);
		expect(await bought()).toBe(0);
	});

	it('a person without a company buys one seat and is enrolled by the webhook', async () => {
		const solo = await createUser({ email: 'solo@self.test', name: 'Solo' }, db);
		const identity = (await loadIdentity(solo.id, db))!;
		await expect(startOrder(identity, { courseSlug: COURSE, quantity: 2, companyId: null }, 'http://app.test', db)).rejects.toThrow(/one seat/);
		await expect(startOrder(identity, { courseSlug: COURSE, quantity: 1, companyId }, 'http://app.test', db)).rejects.toThrow(/admin/);
		const order = await startOrder(identity, { courseSlug: COURSE, quantity: 1, companyId: null }, 'http://app.test', db);
		expect(await isEnrolled(solo.id, COURSE, db)).toBe(false);
		await harness.pay(order.checkout_session_id!, '4242424242424242');
		await harness.settled();
		expect(await isEnrolled(solo.id, COURSE, db)).toBe(true);
		const source = await db.selectFrom('enrolment').select('source').where('user_id', '=', solo.id).executeTakeFirst();
		expect(source?.source).toBe('seat');
	});

	it('quantity is 1 to 200 for a company', async () => {
		await expect(openOrder(0)).rejects.toThrow(/at least one/);
		await expect(openOrder(201)).rejects.toThrow(/at most 200/);
		await expect(openOrder(1.5)).rejects.toThrow();
	});
});

describe('renewal seats through the same order flow', () => {
	it('a company buys renewal seats at the renewal price; the webhook grants them as renewal seats, not course seats', async () => {
		const { renewalSeatLedger } = await import('$lib/server/seats');
		const order = await startOrder(await admin(), { courseSlug: COURSE, quantity: 3, companyId, product: 'renewal' }, 'http://app.test', db);
		// the renewal price of the course definition (content/courses/point-repair-installer/course.md)
		expect(order.unit_amount).toBe(19500);
		expect(order.total_amount).toBe(3 * 19500);
		const session = harness.fake.state.sessions.find((s) => s.id === order.checkout_session_id)!;
		expect(session.line_items).toEqual([{ name: 'Point-repair installer (PR-100), one renewal seat', currency: 'eur', unit_amount: 19500, quantity: 3 }]);
		await harness.pay(order.checkout_session_id!, '4242 4242 4242 4242');
		await harness.settled();
		expect((await getOrder(order.id, db))?.state).toBe('paid');
		expect(await renewalSeatLedger(companyId, db)).toEqual([{ courseSlug: COURSE, courseTitle: 'Point-repair installer', bought: 3, used: 0, free: 3 }]);
		expect(await bought()).toBe(0);
	});

	it('a person buys a renewal seat for themselves only when they hold the course certificate', async () => {
		const person = await createUser({ email: 'solo@crew.test', name: 'Solo' }, db);
		const identity = (await loadIdentity(person.id, db))!;
		await expect(startOrder(identity, { courseSlug: COURSE, quantity: 1, companyId: null, product: 'renewal' }, 'http://app.test', db)).rejects.toThrow(/holds this course/);
	});
});
