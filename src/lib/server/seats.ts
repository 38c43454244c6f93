import { getCourse } from '$lib/content';
import { recordAudit } from './audit';
import { db as defaultDb, inTransaction, type DB } from './db';
import type { SeatProduct } from './db/schema';
import { enrol } from './enrolments';

/**
 * Seats: one row per paid place on a course. A seat is bought (its order paid), assigned when it
 * has a holder, in use from the first paid lesson the holder opens, and refunded when the
 * payment service confirms a refund. Free = bought − assigned − invitations still open.
 * Course seats (product 'course') give a place on a course; renewal seats (product 'renewal',
 * see renewals.ts) are taken and used at once when a holder starts a renewal. Everything below
 * but `renewalSeatLedger` is about course seats.
 */

export interface SeatLedgerLine {
	courseSlug: string;
	courseTitle: string;
	bought: number;
	assigned: number;
	inUse: number;
	invited: number;
	free: number;
}

const nowIso = () => new Date().toISOString();

/** Creates `quantity` seats for a paid order. Part of the order's transaction. */
export async function createSeats(
	order: { id: string; company_id: string | null; course_slug: string; quantity: number; buyer_id: string; product?: SeatProduct },
	db: DB
): Promise<void> {
	const product = order.product ?? 'course';
	const at = nowIso();
	const rows = Array.from({ length: order.quantity }, () => ({
		id: crypto.randomUUID(),
		order_id: order.id,
		company_id: order.company_id,
		course_slug: order.course_slug,
		product,
		// A seat bought for oneself is assigned to the buyer at once.
		holder_id: order.company_id ? null : order.buyer_id,
		assigned_at: order.company_id ? null : at,
		used_at: null,
		refunded_at: null,
		created_at: at
	}));
	for (let i = 0; i < rows.length; i += 100) await db.insertInto('seat').values(rows.slice(i, i + 100)).execute();
	// A renewal seat needs no enrolment: its holder is enrolled already, and it is used when the renewal starts.
	if (!order.company_id && product === 'course') await enrol(order.buyer_id, order.buyer_id, order.course_slug, 'seat', db);
}

/** Open invitations per course for a company (not accepted, withdrawn or expired). */
async function openInvitationCounts(companyId: string, db: DB): Promise<Map<string, number>> {
	const rows = await db
		.selectFrom('invitation')
		.select(['course_slug', (eb) => eb.fn.countAll<number>().as('n')])
		.where('company_id', '=', companyId)
		.where('accepted_at', 'is', null)
		.where('withdrawn_at', 'is', null)
		.where('expires_at', '>', nowIso())
		.groupBy('course_slug')
		.execute();
	return new Map(rows.map((r) => [r.course_slug, Number(r.n)]));
}

/** The company's seats per course: bought, assigned, in use, invited and free. */
export async function seatLedger(companyId: string, db: DB = defaultDb): Promise<SeatLedgerLine[]> {
	const rows = await db
		.selectFrom('seat')
		.select((eb) => [
			'course_slug',
			eb.fn.countAll<number>().as('bought'),
			eb.fn.count<number>('holder_id').as('assigned'),
			eb.fn.count<number>('used_at').as('in_use')
		])
		.where('company_id', '=', companyId)
		.where('product', '=', 'course')
		.where('refunded_at', 'is', null)
		.groupBy('course_slug')
		.execute();
	const invited = await openInvitationCounts(companyId, db);
	const slugs = new Set([...rows.map((r) => r.course_slug), ...invited.keys()]);
	return [...slugs].sort().map((slug) => {
		const row = rows.find((r) => r.course_slug === slug);
		const bought = Number(row?.bought ?? 0);
		const assigned = Number(row?.assigned ?? 0);
		const open = invited.get(slug) ?? 0;
		return {
			courseSlug: slug,
			courseTitle: getCourse(slug)?.title ?? slug,
			bought,
			assigned,
			inUse: Number(row?.in_use ?? 0),
			invited: open,
			free: Math.max(0, bought - assigned - open)
		};
	});
}

/** Seats free to invite someone to, for one company and course. */
export async function freeSeats(companyId: string, courseSlug: string, db: DB = defaultDb): Promise<number> {
	return (await seatLedger(companyId, db)).find((l) => l.courseSlug === courseSlug)?.free ?? 0;
}

/** The company's assigned seats with their holders, for the seat page. */
export function listAssignedSeats(companyId: string, db: DB = defaultDb) {
	return db
		.selectFrom('seat')
		.innerJoin('User', 'User.id', 'seat.holder_id')
		.select(['seat.id', 'seat.course_slug', 'seat.assigned_at', 'seat.used_at', 'User.id as holder_id', 'User.name as holder_name', 'User.email as holder_email'])
		.where('seat.company_id', '=', companyId)
		.where('seat.product', '=', 'course')
		.where('seat.refunded_at', 'is', null)
		.orderBy('seat.course_slug')
		.orderBy('User.name')
		.execute();
}

/**
 * Gives a free seat of the company's course to a person. Safe under concurrency: the update
 * only takes a seat that still has no holder, so two claims never share one. Returns the seat
 * id or null when none is free.
 */
export async function claimSeat(companyId: string, courseSlug: string, userId: string, db: DB): Promise<string | null> {
	return claimFree([companyId], courseSlug, 'course', userId, null, db);
}

/** Takes the oldest free seat of the product for one of the companies; `usedAt` also marks it in use. */
async function claimFree(companyIds: string[], courseSlug: string, product: SeatProduct, userId: string, usedAt: string | null, db: DB): Promise<string | null> {
	for (let tries = 0; tries < 5; tries++) {
		const candidate = await db
			.selectFrom('seat')
			.select('id')
			.where('company_id', 'in', companyIds)
			.where('course_slug', '=', courseSlug)
			.where('product', '=', product)
			.where('holder_id', 'is', null)
			.where('refunded_at', 'is', null)
			.orderBy('created_at')
			.limit(1)
			.executeTakeFirst();
		if (!candidate) return null;
		const result = await db
			.updateTable('seat')
			.set({ holder_id: userId, assigned_at: usedAt ?? nowIso(), ...(usedAt ? { used_at: usedAt } : {}) })
			.where('id', '=', candidate.id)
			.where('holder_id', 'is', null)
			.where('refunded_at', 'is', null)
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) === 1) return candidate.id;
	}
	return null;
}

/**
 * Marks the person's seat for the course as in use, once: called when they open a lesson
 * that is not a free preview. Returns true when this call started the seat's use.
 */
export async function markSeatInUse(userId: string, courseSlug: string, db: DB = defaultDb): Promise<boolean> {
	// Every lesson view asks; almost always the seat is marked already. A plain read answers that
	// without the write lock, so readers do not queue behind one another's transactions.
	if (!db.isTransaction && !(await unusedSeatId(userId, courseSlug, db))) return false;
	return inTransaction(db, async (trx) => {
		const seatId = await unusedSeatId(userId, courseSlug, trx);
		if (!seatId) return false;
		const result = await trx.updateTable('seat').set({ used_at: nowIso() }).where('id', '=', seatId).where('used_at', 'is', null).executeTakeFirst();
		if (Number(result.numUpdatedRows) !== 1) return false;
		await recordAudit({ actorId: userId, action: 'seat.in-use', subjectType: 'seat', subjectId: seatId, detail: { courseSlug } }, trx);
		return true;
	});
}

/** A person's course seat not yet counted as in use (shared by `markSeatInUse` and the lesson view's prepared read). */
export const unusedSeatRow = (db: DB, userId: string, courseSlug: string) =>
	db
		.selectFrom('seat')
		.select('id')
		.where('holder_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('product', '=', 'course')
		.where('refunded_at', 'is', null)
		.where('used_at', 'is', null);

async function unusedSeatId(userId: string, courseSlug: string, db: DB): Promise<string | null> {
	return (await unusedSeatRow(db, userId, courseSlug).executeTakeFirst())?.id ?? null;
}

export type TakeBackResult = { ok: true } | { ok: false; message: string };

/**
 * Takes an assigned seat back from a holder who has not started (no paid lesson opened and no
 * lesson done), so it can go to someone else. The holder's seat enrolment goes with it.
 */
export async function takeBackSeat(actorId: string, companyId: string, seatId: string, db: DB = defaultDb): Promise<TakeBackResult> {
	return inTransaction(db, async (trx) => {
		const seat = await trx
			.selectFrom('seat')
			.select(['id', 'holder_id', 'used_at', 'course_slug'])
			.where('id', '=', seatId)
			.where('company_id', '=', companyId)
			.where('product', '=', 'course')
			.where('refunded_at', 'is', null)
			.executeTakeFirst();
		if (!seat || !seat.holder_id) return { ok: false, message: 'That seat is not assigned to anyone.' };
		const started = await trx
			.selectFrom('lesson_progress')
			.select('lesson_slug')
			.where('user_id', '=', seat.holder_id)
			.where('course_slug', '=', seat.course_slug)
			.executeTakeFirst();
		if (seat.used_at || started) return { ok: false, message: 'That seat is in use: its holder has started the course, so it cannot be taken back.' };
		const result = await trx
			.updateTable('seat')
			.set({ holder_id: null, assigned_at: null })
			.where('id', '=', seat.id)
			.where('holder_id', '=', seat.holder_id)
			.where('used_at', 'is', null)
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) !== 1) return { ok: false, message: 'The seat changed meanwhile; reload and try again.' };
		await removeSeatEnrolment(actorId, seat.holder_id, seat.course_slug, trx);
		await recordAudit({ actorId, action: 'seat.take-back', subjectType: 'seat', subjectId: seat.id, detail: { companyId, holderId: seat.holder_id, courseSlug: seat.course_slug } }, trx);
		return { ok: true };
	});
}

/** Removes an enrolment that came from a seat, unless the person still holds another seat for the course. */
export async function removeSeatEnrolment(actorId: string | null, userId: string, courseSlug: string, db: DB): Promise<void> {
	const another = await db
		.selectFrom('seat')
		.select('id')
		.where('holder_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('product', '=', 'course')
		.where('refunded_at', 'is', null)
		.executeTakeFirst();
	if (another) return;
	const result = await db
		.deleteFrom('enrolment')
		.where('user_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('source', '=', 'seat')
		.executeTakeFirst();
	if (Number(result.numDeletedRows) > 0) {
		await recordAudit({ actorId, action: 'enrolment.remove', subjectType: 'user', subjectId: userId, detail: { courseSlug, source: 'seat' } }, db);
	}
}

export interface RenewalSeatLine {
	courseSlug: string;
	courseTitle: string;
	bought: number;
	used: number;
	free: number;
}

/** The company's renewal seats per course: bought, used by a started renewal, and free. */
export async function renewalSeatLedger(companyId: string, db: DB = defaultDb): Promise<RenewalSeatLine[]> {
	const rows = await db
		.selectFrom('seat')
		.select((eb) => ['course_slug', eb.fn.countAll<number>().as('bought'), eb.fn.count<number>('holder_id').as('used')])
		.where('company_id', '=', companyId)
		.where('product', '=', 'renewal')
		.where('refunded_at', 'is', null)
		.groupBy('course_slug')
		.orderBy('course_slug')
		.execute();
	return rows.map((r) => ({
		courseSlug: r.course_slug,
		courseTitle: getCourse(r.course_slug)?.title ?? r.course_slug,
		bought: Number(r.bought),
		used: Number(r.used),
		free: Math.max(0, Number(r.bought) - Number(r.used))
	}));
}

/** An unused renewal seat the person bought for themselves. */
export function ownRenewalSeat(userId: string, courseSlug: string, db: DB = defaultDb) {
	return db
		.selectFrom('seat')
		.select('id')
		.where('holder_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('product', '=', 'renewal')
		.where('refunded_at', 'is', null)
		.where('used_at', 'is', null)
		.orderBy('created_at')
		.executeTakeFirst();
}

/**
 * Takes a renewal seat for a holder starting a renewal: one they bought for themselves, else a
 * free one of a company they belong to. The guarded update keeps two claims off one seat.
 * Marks it used at once. Returns the seat id, or null when there is none.
 */
export async function takeRenewalSeat(userId: string, courseSlug: string, now: Date, db: DB): Promise<string | null> {
	const at = now.toISOString();
	const own = await ownRenewalSeat(userId, courseSlug, db);
	if (own) {
		const used = await db.updateTable('seat').set({ used_at: at }).where('id', '=', own.id).where('used_at', 'is', null).executeTakeFirst();
		if (Number(used.numUpdatedRows) === 1) return own.id;
	}
	const companies = (await db.selectFrom('membership').select('company_id').where('user_id', '=', userId).execute()).map((m) => m.company_id);
	return companies.length ? claimFree(companies, courseSlug, 'renewal', userId, at, db) : null;
}
