import { randomBytes } from 'node:crypto';
import type Stripe from 'stripe';
import { getCourse } from '$lib/content';
import type { Identity } from '$lib/roles';
import { isCompanyAdmin } from '$lib/roles';
import { recordAudit } from './audit';
import { paymentSettings } from './config';
import { db as defaultDb, inTransaction, type DB } from './db';
import { isUniqueViolation } from './db/errors';
import type { OrderState, SeatProduct } from './db/schema';
import { isEnrolled } from './enrolments';
import { paymentClient, paymentErrorMessage } from './payments';
import { createSeats, removeSeatEnrolment } from './seats';

/**
 * Orders for seats, paid through the payment service's Checkout. The app never grants seats on
 * the buyer's return: only a verified webhook moves an order, in one transaction with the seats.
 *
 * States: open -> paid | expired | cancelled; paid -> partly refunded -> refunded.
 */

export const MAX_SEATS_PER_ORDER = 200;

export const orderStateLabels: Record<OrderState, string> = {
	open: 'Waiting for payment',
	paid: 'Paid',
	expired: 'Expired',
	cancelled: 'Cancelled',
	refunded: 'Refunded',
	'partly refunded': 'Partly refunded'
};

const orderColumns = [
	'course_order.id',
	'course_order.number',
	'course_order.buyer_id',
	'course_order.company_id',
	'course_order.course_slug',
	'course_order.product',
	'course_order.quantity',
	'course_order.unit_amount',
	'course_order.total_amount',
	'course_order.currency',
	'course_order.state',
	'course_order.checkout_session_id',
	'course_order.checkout_url',
	'course_order.payment_intent_id',
	'course_order.refunded_quantity',
	'course_order.refunded_amount',
	'course_order.created_at',
	'course_order.paid_at',
	'course_order.updated_at'
] as const;

export class OrderRefused extends Error {
	constructor(
		message: string,
		readonly status: 400 | 403 | 404 | 409 | 502 = 400,
		readonly field?: string
	) {
		super(message);
	}
}

/** Whether the person holds a current (not revoked, not replaced) certificate of the course. */
export async function holdsCertificateOf(userId: string, courseSlug: string, db: DB = defaultDb): Promise<boolean> {
	const row = await db
		.selectFrom('certificate')
		.select('id')
		.where('user_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('slot', 'is not', null)
		.where('revoked_at', 'is', null)
		.executeTakeFirst();
	return !!row;
}

/** An order number people can read out: year and eight letters and digits without look-alikes. */
function newOrderNumber(): string {
	const alphabet = '23456789ABCDEFGHJKLMNPQRSTUVWXYZ';
	const bytes = randomBytes(8);
	return `PW-${new Date().getUTCFullYear()}-${[...bytes].map((b) => alphabet[b % alphabet.length]).join('')}`;
}

export interface OrderRequest {
	courseSlug: string;
	quantity: number;
	/** The company buying; null for a person buying one seat for themselves. */
	companyId: string | null;
	/** The full course (default) or the shorter renewal path, at the course's renewal price. */
	product?: SeatProduct;
}

/**
 * Records an open order and opens a checkout for it. Returns the order with the hosted payment
 * page's address. Throws OrderRefused for anything the buyer can fix.
 */
export async function startOrder(buyer: Identity, request: OrderRequest, origin: string, db: DB = defaultDb) {
	const course = getCourse(request.courseSlug);
	if (!course) throw new OrderRefused('There is no such course.', 404, 'course');
	if (!Number.isSafeInteger(request.quantity) || request.quantity < 1) throw new OrderRefused('Buy at least one seat.', 400, 'quantity');
	const product: SeatProduct = request.product ?? 'course';
	if (product !== 'course' && product !== 'renewal') throw new OrderRefused('Buy a course seat or a renewal seat.', 400, 'product');
	const unitAmount = product === 'renewal' ? course.renewal.priceCents : course.priceCents;
	if (request.companyId) {
		if (!isCompanyAdmin(buyer, request.companyId)) throw new OrderRefused('Only an admin of that company can buy its seats.', 403, 'companyId');
		if (request.quantity > MAX_SEATS_PER_ORDER) throw new OrderRefused(`Buy at most ${MAX_SEATS_PER_ORDER} seats in one order.`, 400, 'quantity');
	} else {
		if (request.quantity !== 1) throw new OrderRefused('A person buys one seat for themselves.', 400, 'quantity');
		if (product === 'course' && (await isEnrolled(buyer.id, course.slug, db))) throw new OrderRefused('You already have a seat on this course.', 409, 'course');
		if (product === 'renewal' && !(await holdsCertificateOf(buyer.id, course.slug, db))) {
			throw new OrderRefused('A renewal seat is for someone who holds this course\u2019s certificate.', 409, 'course');
		}
	}
	if (unitAmount <= 0) throw new OrderRefused('This course has no price to pay.', 409, 'course');

	const now = new Date().toISOString();
	const order = {
		id: crypto.randomUUID(),
		number: newOrderNumber(),
		buyer_id: buyer.id,
		company_id: request.companyId,
		course_slug: course.slug,
		product,
		quantity: request.quantity,
		unit_amount: unitAmount,
		total_amount: unitAmount * request.quantity,
		currency: course.currency.toUpperCase(),
		state: 'open' as OrderState,
		checkout_session_id: null,
		checkout_url: null,
		payment_intent_id: null,
		refunded_quantity: 0,
		refunded_amount: 0,
		created_at: now,
		paid_at: null,
		updated_at: now
	};
	if (!Number.isSafeInteger(order.total_amount)) throw new OrderRefused('That total is too large.', 400, 'quantity');
	await inTransaction(db, async (trx) => {
		await trx.insertInto('course_order').values(order).execute();
		await recordAudit({ actorId: buyer.id, action: 'order.create', subjectType: 'order', subjectId: order.id, detail: { number: order.number, courseSlug: order.course_slug, product, quantity: order.quantity, totalAmount: order.total_amount, currency: order.currency, companyId: order.company_id } }, trx);
	});

	let session: Stripe.Checkout.Session;
	try {
		session = await paymentClient().checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						quantity: order.quantity,
						price_data: { currency: order.currency.toLowerCase(), unit_amount: order.unit_amount, product_data: { name: `${course.title} (${course.code}), ${product === 'renewal' ? 'one renewal seat' : 'one seat'}` } }
					}
				],
				client_reference_id: order.id,
				metadata: { order_id: order.id, order_number: order.number },
				payment_intent_data: { metadata: { order_id: order.id } },
				customer_email: buyer.email,
				success_url: `${origin}/orders/${order.id}?paid=1`,
				cancel_url: `${origin}/orders/${order.id}/cancel`,
				expires_at: Math.floor(Date.now() / 1000) + paymentSettings.checkoutMinutes * 60
			},
			{ idempotencyKey: `order-${order.id}` }
		);
	} catch (e) {
		await setState(buyer.id, order.id, 'open', 'cancelled', { reason: 'checkout could not be opened' }, db);
		throw new OrderRefused(paymentErrorMessage(e), 502);
	}
	await db.updateTable('course_order').set({ checkout_session_id: session.id, checkout_url: session.url, updated_at: new Date().toISOString() }).where('id', '=', order.id).execute();
	return { ...order, checkout_session_id: session.id, checkout_url: session.url };
}

/** Moves an order from one state to another only if it is still in `from`; returns whether it moved. */
async function setState(actorId: string | null, orderId: string, from: OrderState, to: OrderState, detail: Record<string, unknown>, db: DB, extra: Partial<{ paid_at: string; payment_intent_id: string }> = {}) {
	return inTransaction(db, async (trx) => {
		const result = await trx
			.updateTable('course_order')
			.set({ state: to, updated_at: new Date().toISOString(), ...extra })
			.where('id', '=', orderId)
			.where('state', '=', from)
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) !== 1) return false;
		await recordAudit({ actorId, action: 'order.state', subjectType: 'order', subjectId: orderId, detail: { from, to, ...detail } }, trx);
		return true;
	});
}

export function getOrder(orderId: string, db: DB = defaultDb) {
	return db
		.selectFrom('course_order')
		.innerJoin('User', 'User.id', 'course_order.buyer_id')
		.leftJoin('company', 'company.id', 'course_order.company_id')
		.select([...orderColumns, 'User.name as buyer_name', 'User.email as buyer_email', 'company.name as company_name'])
		.where('course_order.id', '=', orderId)
		.executeTakeFirst();
}

export type OrderRow = NonNullable<Awaited<ReturnType<typeof getOrder>>>;

/** Who may see an order: its buyer, an admin of its company, a registrar. */
export function canSeeOrder(user: Identity, order: Pick<OrderRow, 'buyer_id' | 'company_id'>): boolean {
	return order.buyer_id === user.id || (!!order.company_id && isCompanyAdmin(user, order.company_id)) || user.roles.includes('registrar');
}

/** Orders a person placed or that belong to companies they run, newest first. */
export function listOrdersFor(user: Identity, db: DB = defaultDb) {
	const adminOf = user.companies.filter((c) => c.role === 'admin').map((c) => c.id);
	return db
		.selectFrom('course_order')
		.innerJoin('User', 'User.id', 'course_order.buyer_id')
		.leftJoin('company', 'company.id', 'course_order.company_id')
		.select([...orderColumns, 'User.name as buyer_name', 'User.email as buyer_email', 'company.name as company_name'])
		.where((eb) => (adminOf.length ? eb.or([eb('course_order.buyer_id', '=', user.id), eb('course_order.company_id', 'in', adminOf)]) : eb('course_order.buyer_id', '=', user.id)))
		.orderBy('course_order.created_at', 'desc')
		.limit(200)
		.execute();
}

/** Every order that took or returned money, for the registrar. */
export function listAllOrders(db: DB = defaultDb) {
	return db
		.selectFrom('course_order')
		.innerJoin('User', 'User.id', 'course_order.buyer_id')
		.leftJoin('company', 'company.id', 'course_order.company_id')
		.select([...orderColumns, 'User.name as buyer_name', 'User.email as buyer_email', 'company.name as company_name'])
		.orderBy('course_order.created_at', 'desc')
		.limit(500)
		.execute();
}

/** The buyer gave up on the payment page: the checkout is closed at the service, then the order cancelled. */
export async function cancelOrder(user: Identity, orderId: string, db: DB = defaultDb): Promise<void> {
	const order = await getOrder(orderId, db);
	if (!order || !canSeeOrder(user, order)) throw new OrderRefused('No such order.', 404);
	if (order.state !== 'open') return;
	if (order.checkout_session_id) {
		try {
			await paymentClient().checkout.sessions.expire(order.checkout_session_id);
		} catch (e) {
			// A session that was paid meanwhile cannot be expired: the webhook will mark the order paid.
			const session = await paymentClient().checkout.sessions.retrieve(order.checkout_session_id).catch(() => null);
			if (session?.status === 'complete') return;
			if (session?.status !== 'expired') throw new OrderRefused(paymentErrorMessage(e), 502);
		}
	}
	await setState(user.id, order.id, 'open', 'cancelled', { reason: 'buyer cancelled' }, db);
}

// ---------------------------------------------------------------------------------------------
// Webhook events

export type EventOutcome =
	| { status: 200; outcome: string }
	/** Not applicable yet (a refund for an order whose payment has not arrived): the service retries. */
	| { status: 409; outcome: string };

/**
 * Applies one verified event exactly once. The event id is recorded in the same transaction as
 * the change it causes, so a repeat delivery (or two at once) is a no-op.
 */
export async function applyPaymentEvent(event: Pick<Stripe.Event, 'id' | 'type' | 'data'>, db: DB = defaultDb): Promise<EventOutcome> {
	try {
		return await inTransaction(db, async (trx) => {
			const seen = await trx.selectFrom('payment_event').select('outcome').where('id', '=', event.id).executeTakeFirst();
			if (seen) return { status: 200, outcome: `duplicate (${seen.outcome})` } as const;
			const result = await applyOnce(event, trx);
			if (result.status === 200) {
				await trx.insertInto('payment_event').values({ id: event.id, type: event.type, received_at: new Date().toISOString(), outcome: result.outcome }).execute();
			}
			return result;
		});
	} catch (e) {
		if (isUniqueViolation(e)) return { status: 200, outcome: 'duplicate' };
		throw e;
	}
}

async function orderForSession(session: Stripe.Checkout.Session, db: DB) {
	const byId = session.client_reference_id ?? session.metadata?.order_id ?? null;
	const order = byId ? await db.selectFrom('course_order').selectAll().where('id', '=', byId).executeTakeFirst() : undefined;
	// The session id must match too, so an event cannot point a real session at another order.
	return order && order.checkout_session_id === session.id ? order : undefined;
}

async function applyOnce(event: Pick<Stripe.Event, 'id' | 'type' | 'data'>, db: DB): Promise<EventOutcome> {
	const audit = (subjectId: string, action: string, detail: Record<string, unknown>) =>
		recordAudit({ actorId: null, action, subjectType: 'order', subjectId, detail: { eventId: event.id, ...detail } }, db);

	if (event.type === 'checkout.session.completed') {
		const session = event.data.object as Stripe.Checkout.Session;
		const order = await orderForSession(session, db);
		if (!order) return { status: 200, outcome: 'ignored: unknown session' };
		if (session.payment_status !== 'paid') return { status: 200, outcome: 'ignored: not paid yet' };
		if (order.state !== 'open') {
			if (order.state === 'expired' || order.state === 'cancelled') {
				await audit(order.id, 'order.payment-after-close', { state: order.state, paymentIntent: session.payment_intent });
			}
			return { status: 200, outcome: `ignored: order already ${order.state}` };
		}
		if (session.amount_total !== order.total_amount || session.currency?.toUpperCase() !== order.currency) {
			await audit(order.id, 'order.amount-mismatch', { expected: order.total_amount, got: session.amount_total, currency: session.currency });
			return { status: 200, outcome: 'ignored: amount does not match the order' };
		}
		const paymentIntent = typeof session.payment_intent === 'string' ? session.payment_intent : (session.payment_intent?.id ?? null);
		const moved = await setState(null, order.id, 'open', 'paid', { eventId: event.id, paymentIntent }, db, { paid_at: new Date().toISOString(), ...(paymentIntent ? { payment_intent_id: paymentIntent } : {}) });
		if (!moved) return { status: 200, outcome: 'ignored: order changed meanwhile' };
		await createSeats(order, db);
		await recordAudit({ actorId: null, action: 'seat.grant', subjectType: 'order', subjectId: order.id, detail: { quantity: order.quantity, courseSlug: order.course_slug, product: order.product, companyId: order.company_id } }, db);
		return { status: 200, outcome: `paid: ${order.quantity} seats granted` };
	}

	if (event.type === 'checkout.session.expired') {
		const session = event.data.object as Stripe.Checkout.Session;
		const order = await orderForSession(session, db);
		if (!order) return { status: 200, outcome: 'ignored: unknown session' };
		const moved = await setState(null, order.id, 'open', 'expired', { eventId: event.id }, db);
		return { status: 200, outcome: moved ? 'expired' : `ignored: order already ${order.state}` };
	}

	if (event.type === 'charge.refunded') {
		const charge = event.data.object as Stripe.Charge;
		const pi = typeof charge.payment_intent === 'string' ? charge.payment_intent : (charge.payment_intent?.id ?? null);
		const order = pi ? await db.selectFrom('course_order').selectAll().where('payment_intent_id', '=', pi).executeTakeFirst() : undefined;
		if (!order) {
			// Events can arrive out of order: a refund for an order whose payment is not recorded yet is retried later.
			const pending = charge.metadata?.order_id
				? await db.selectFrom('course_order').select('state').where('id', '=', charge.metadata.order_id).executeTakeFirst()
				: undefined;
			return pending?.state === 'open' ? { status: 409, outcome: 'payment not recorded yet' } : { status: 200, outcome: 'ignored: unknown payment' };
		}
		return settleRefund(order, charge.amount_refunded, event.id, db);
	}

	return { status: 200, outcome: `ignored: ${event.type} is not used` };
}

/**
 * Brings the order's refunded seats up to the service's cumulative refunded amount. The
 * amount is cumulative, so events settled in any order or twice end in the same ledger.
 */
async function settleRefund(order: { id: string; product: SeatProduct; quantity: number; unit_amount: number; total_amount: number; refunded_quantity: number; refunded_amount: number; state: OrderState; course_slug: string }, amountRefunded: number, eventId: string, db: DB): Promise<EventOutcome> {
	if (amountRefunded <= order.refunded_amount) return { status: 200, outcome: 'ignored: refund already settled' };
	const seatsRefunded = amountRefunded >= order.total_amount ? order.quantity : Math.floor(amountRefunded / order.unit_amount);
	const newSeats = Math.max(0, seatsRefunded - order.refunded_quantity);
	const unused = await db
		.selectFrom('seat')
		.select(['id', 'holder_id'])
		.where('order_id', '=', order.id)
		.where('refunded_at', 'is', null)
		.where('used_at', 'is', null)
		// Unassigned seats go first, then seats whose holders have not started.
		.orderBy((eb) => eb.case().when('holder_id', 'is', null).then(0).else(1).end())
		.orderBy('created_at')
		.limit(newSeats)
		.execute();
	const at = new Date().toISOString();
	for (const seat of unused) {
		await db.updateTable('seat').set({ refunded_at: at }).where('id', '=', seat.id).execute();
		if (seat.holder_id && order.product === 'course') await removeSeatEnrolment(null, seat.holder_id, order.course_slug, db);
	}
	if (unused.length < newSeats) {
		await recordAudit({ actorId: null, action: 'order.refund-short', subjectType: 'order', subjectId: order.id, detail: { eventId, wanted: newSeats, unusedFound: unused.length } }, db);
	}
	const refundedQuantity = order.refunded_quantity + unused.length;
	const state: OrderState = amountRefunded >= order.total_amount ? 'refunded' : 'partly refunded';
	await db.updateTable('course_order').set({ state, refunded_quantity: refundedQuantity, refunded_amount: amountRefunded, updated_at: at }).where('id', '=', order.id).execute();
	await recordAudit({ actorId: null, action: 'order.refund-settled', subjectType: 'order', subjectId: order.id, detail: { eventId, from: order.state, to: state, seatsRefunded: unused.length, amountRefunded } }, db);
	return { status: 200, outcome: `${state}: ${unused.length} seats refunded` };
}

// ---------------------------------------------------------------------------------------------
// Refunds (registrar)

/** Seats of the order that can still be refunded: not refunded and never used. */
export async function refundableSeats(orderId: string, db: DB = defaultDb): Promise<number> {
	const row = await db
		.selectFrom('seat')
		.select((eb) => eb.fn.countAll<number>().as('n'))
		.where('order_id', '=', orderId)
		.where('refunded_at', 'is', null)
		.where('used_at', 'is', null)
		.executeTakeFirstOrThrow();
	return Number(row.n);
}

/**
 * Asks the service to refund `seats` unused seats (or every remaining seat with 'all'). Nothing
 * changes here: the `charge.refunded` webhook settles the ledger. Used seats are never refunded.
 */
export async function requestRefund(actorId: string, orderId: string, seats: number | 'all', db: DB = defaultDb) {
	const order = await db.selectFrom('course_order').selectAll().where('id', '=', orderId).executeTakeFirst();
	if (!order) throw new OrderRefused('No such order.', 404);
	if (order.state !== 'paid' && order.state !== 'partly refunded') throw new OrderRefused(`An order that is ${orderStateLabels[order.state].toLowerCase()} cannot be refunded.`, 409);
	if (!order.payment_intent_id) throw new OrderRefused('The order has no recorded payment.', 409);
	const remaining = order.quantity - order.refunded_quantity;
	const unused = await refundableSeats(order.id, db);
	const count = seats === 'all' ? remaining : seats;
	if (!Number.isSafeInteger(count) || count < 1) throw new OrderRefused('Refund at least one seat.', 400, 'seats');
	if (count > unused) {
		const used = remaining - unused;
		throw new OrderRefused(
			seats === 'all'
				? `${used} of the remaining ${remaining} seats are in use; used seats cannot be refunded. Refund up to ${unused} unused seats instead.`
				: `Only ${unused} unused seats can be refunded; used seats cannot be refunded.`,
			409,
			'seats'
		);
	}
	const amount = count === remaining ? order.total_amount - order.refunded_amount : count * order.unit_amount;
	try {
		const refund = await paymentClient().refunds.create(
			{ payment_intent: order.payment_intent_id, amount, metadata: { order_id: order.id, seats: String(count) } },
			{ idempotencyKey: `refund-${order.id}-${order.refunded_amount}-${count}` }
		);
		await recordAudit({ actorId, action: 'order.refund-request', subjectType: 'order', subjectId: order.id, detail: { seats: count, amount, currency: order.currency, refundId: refund.id } }, db);
		return { refundId: refund.id, seats: count, amount };
	} catch (e) {
		throw new OrderRefused(paymentErrorMessage(e), 502);
	}
}

/** Plain data for pages and the API; amounts in minor units with the currency. */
export function orderView(order: OrderRow) {
	const course = getCourse(order.course_slug);
	return {
		id: order.id,
		number: order.number,
		state: order.state,
		stateLabel: orderStateLabels[order.state],
		course: { slug: order.course_slug, title: course?.title ?? order.course_slug, code: course?.code ?? '' },
		product: order.product,
		company: order.company_id ? { id: order.company_id, name: order.company_name } : null,
		buyer: { name: order.buyer_name, email: order.buyer_email },
		quantity: order.quantity,
		unitAmount: order.unit_amount,
		totalAmount: order.total_amount,
		currency: order.currency,
		refundedQuantity: order.refunded_quantity,
		refundedAmount: order.refunded_amount,
		createdAt: order.created_at,
		paidAt: order.paid_at,
		checkoutUrl: order.state === 'open' ? order.checkout_url : null
	};
}
