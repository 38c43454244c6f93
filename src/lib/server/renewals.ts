import { getCourse } from '$lib/content';
import { parseNumber } from '$lib/certificates/number';
import { recordAudit } from './audit';
import { checkRenewal, renewalWindow, type RenewalCheck } from './certificates';
import { db as defaultDb, inTransaction, type DB } from './db';
import { openRenewalOf } from './renewal-open';
import { ownRenewalSeat, renewalSeatLedger, takeRenewalSeat } from './seats';

/**
 * Renewal: the shorter path that keeps a certificate going. The holder starts it inside the
 * course's window (`renewal.opensDaysBefore` days before expiry up to `renewal.graceDays`
 * after, in the course definition) with a renewal seat: one they bought, or a free one of
 * their company. Starting it opens the course test afresh and voids the sign-offs of the
 * skills the course marks `renewal: true`, so those are shown to a trainer again; the other
 * sign-offs stand. When the test is passed and those skills are signed off (before the window
 * closes), `issueIfEarned` issues the new certificate (see `renewIfEarned` in certificates.ts).
 */

interface Options {
	db?: DB;
	now?: Date;
}

export type RenewalStage = 'too-early' | 'open' | 'started' | 'completed' | 'closed' | 'revoked' | 'replaced';

export interface RenewalView {
	number: string;
	courseSlug: string;
	courseTitle: string;
	courseCode: string;
	expiresOn: string;
	opensOn: string;
	closesOn: string;
	stage: RenewalStage;
	startedAt: string | null;
	/** Set once completed: the certificate that replaced this one. */
	newNumber: string | null;
	newExpiresOn: string | null;
	progress: RenewalCheck | null;
	/** Whether a renewal seat is ready for the holder (their own or their company's). */
	seatReady: boolean;
	renewalPriceCents: number;
	currency: string;
}

const isoDay = (d: Date) => d.toISOString().slice(0, 10);

async function seatReady(userId: string, courseSlug: string, db: DB): Promise<boolean> {
	if (await ownRenewalSeat(userId, courseSlug, db)) return true;
	const companies = await db.selectFrom('membership').select('company_id').where('user_id', '=', userId).execute();
	for (const c of companies) {
		if ((await renewalSeatLedger(c.company_id, db)).some((l) => l.courseSlug === courseSlug && l.free > 0)) return true;
	}
	return false;
}

async function ownRow(userId: string, number: string, db: DB) {
	const parsed = parseNumber(number);
	if (!parsed.ok) return undefined;
	const row = await db.selectFrom('certificate').selectAll().where('number', '=', parsed.formatted).executeTakeFirst();
	return row && row.user_id === userId ? row : undefined;
}

/** Where the holder stands with renewing one of their certificates; null when it is not theirs. */
export async function renewalView(userId: string, number: string, { db = defaultDb, now = new Date() }: Options = {}): Promise<RenewalView | null> {
	const row = await ownRow(userId, number, db);
	const course = row && getCourse(row.course_slug);
	if (!row || !course) return null;
	const window = renewalWindow(row.expires_on, course);
	const renewal = await db.selectFrom('renewal').selectAll().where('certificate_id', '=', row.id).executeTakeFirst();
	const fresh = renewal?.new_certificate_id
		? await db.selectFrom('certificate').select(['number', 'expires_on']).where('id', '=', renewal.new_certificate_id).executeTakeFirst()
		: row.replaced_by_id
			? await db.selectFrom('certificate').select(['number', 'expires_on']).where('id', '=', row.replaced_by_id).executeTakeFirst()
			: undefined;
	const today = isoDay(now);
	const stage: RenewalStage = row.revoked_at
		? 'revoked'
		: renewal?.completed_at
			? 'completed'
			: row.replaced_by_id
				? 'replaced'
				: today > window.closesOn
					? 'closed'
					: renewal
						? 'started'
						: today < window.opensOn
							? 'too-early'
							: 'open';
	return {
		number: row.number,
		courseSlug: course.slug,
		courseTitle: course.title,
		courseCode: course.code,
		expiresOn: row.expires_on,
		opensOn: window.opensOn,
		closesOn: window.closesOn,
		stage,
		startedAt: renewal?.started_at ?? null,
		newNumber: fresh?.number ?? null,
		newExpiresOn: fresh?.expires_on ?? null,
		progress: renewal && !renewal.completed_at ? await checkRenewal(userId, course, renewal.started_at, db) : null,
		seatReady: stage === 'open' ? await seatReady(userId, course.slug, db) : false,
		renewalPriceCents: course.renewal.priceCents,
		currency: course.currency
	};
}

export type StartOutcome = { ok: true; started: boolean } | { ok: false; status: 404 | 409; message: string };

/**
 * Starts the renewal of the holder's certificate, in one transaction with its audit entry:
 * takes a renewal seat, records the renewal and voids the sign-offs of the renewal skills.
 * Starting twice is harmless (the second reports the first).
 */
export async function startRenewal(userId: string, number: string, { db = defaultDb, now = new Date() }: Options = {}): Promise<StartOutcome> {
	return inTransaction(db, async (trx) => {
		const row = await ownRow(userId, number, trx);
		const course = row && getCourse(row.course_slug);
		if (!row || !course) return { ok: false, status: 404, message: 'You hold no certificate with this number.' };
		const existing = await trx.selectFrom('renewal').select('id').where('certificate_id', '=', row.id).executeTakeFirst();
		if (existing) return { ok: true, started: false };
		if (row.revoked_at) return { ok: false, status: 409, message: 'A revoked certificate cannot be renewed.' };
		if (row.replaced_by_id || row.slot === null) return { ok: false, status: 409, message: 'This certificate was replaced; renew the one that replaced it.' };
		const window = renewalWindow(row.expires_on, course);
		const today = isoDay(now);
		if (today < window.opensOn) return { ok: false, status: 409, message: `The renewal opens on ${window.opensOn}, ${course.renewal.opensDaysBefore} days before the certificate expires.` };
		if (today > window.closesOn) {
			return { ok: false, status: 409, message: `The renewal closed on ${window.closesOn}, ${course.renewal.graceDays} days after the certificate expired. The full course is the way back.` };
		}
		if (await openRenewalOf(userId, course.slug, trx)) return { ok: false, status: 409, message: 'A renewal of this course is already under way.' };
		const seatId = await takeRenewalSeat(userId, course.slug, now, trx);
		if (!seatId) return { ok: false, status: 409, message: 'A renewal needs a renewal seat: ask your company admin for one, or buy one yourself.' };
		const at = now.toISOString();
		const id = crypto.randomUUID();
		await trx
			.insertInto('renewal')
			.values({ id, certificate_id: row.id, user_id: userId, course_slug: course.slug, seat_id: seatId, started_at: at, completed_at: null, new_certificate_id: null })
			.execute();
		const renewalSkills = course.practicalSkills.filter((s) => s.renewal).map((s) => s.id);
		const voided = await trx
			.updateTable('sign_off')
			.set({ voided_at: at, voided_by: userId, void_reason: `Due again for the renewal of certificate ${row.number}.` })
			.where('user_id', '=', userId)
			.where('course_slug', '=', course.slug)
			.where('skill_id', 'in', renewalSkills)
			.where('voided_at', 'is', null)
			.executeTakeFirst();
		await recordAudit(
			{
				actorId: userId,
				action: 'renewal.start',
				subjectType: 'certificate',
				subjectId: row.id,
				detail: { number: row.number, courseSlug: course.slug, seatId, skillsDueAgain: renewalSkills, signOffsVoided: Number(voided.numUpdatedRows) }
			},
			trx
		);
		return { ok: true, started: true };
	});
}

export interface ExpiringCertificate {
	number: string;
	courseSlug: string;
	courseCode: string;
	courseTitle: string;
	expiresOn: string;
	daysLeft: number;
	renewalStarted: boolean;
}

/** The person's current certificates that expire within `days` (or expired inside the grace period), soonest first. */
export async function expiringCertificatesOf(userId: string, { db = defaultDb, now = new Date(), days = 60 }: Options & { days?: number } = {}): Promise<ExpiringCertificate[]> {
	const today = isoDay(now);
	const rows = await db
		.selectFrom('certificate')
		.leftJoin('renewal', 'renewal.certificate_id', 'certificate.id')
		.select(['certificate.number', 'certificate.course_slug', 'certificate.course_code', 'certificate.course_title', 'certificate.expires_on', 'renewal.id as renewal_id'])
		.where('certificate.user_id', '=', userId)
		.where('certificate.slot', 'is not', null)
		.where('certificate.revoked_at', 'is', null)
		.where('certificate.expires_on', '<=', isoDay(new Date(now.getTime() + days * 86_400_000)))
		.orderBy('certificate.expires_on')
		.execute();
	return rows
		.map((r) => {
			const course = getCourse(r.course_slug);
			return {
				number: r.number,
				courseSlug: r.course_slug,
				courseCode: r.course_code,
				courseTitle: r.course_title,
				expiresOn: r.expires_on,
				daysLeft: Math.round((Date.parse(`${r.expires_on}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000),
				renewalStarted: !!r.renewal_id,
				closesOn: course ? renewalWindow(r.expires_on, course).closesOn : r.expires_on
			};
		})
		.filter((r) => r.closesOn >= today)
		.map(({ closesOn: _closesOn, ...r }) => r);
}

export interface CrewExpiry {
	userId: string;
	name: string | null;
	email: string;
	courseCode: string;
	courseTitle: string;
	number: string;
	expiresOn: string;
	daysLeft: number;
}

/** The company's crew whose current certificates expire within `days` (not yet expired), soonest first. */
export async function crewExpiringSoon(companyId: string, { db = defaultDb, now = new Date(), days = 60 }: Options & { days?: number } = {}): Promise<CrewExpiry[]> {
	const today = isoDay(now);
	const rows = await db
		.selectFrom('certificate')
		.innerJoin('membership', 'membership.user_id', 'certificate.user_id')
		.innerJoin('User', 'User.id', 'certificate.user_id')
		.select(['User.id as user_id', 'User.name', 'User.email', 'certificate.course_code', 'certificate.course_title', 'certificate.number', 'certificate.expires_on'])
		.where('membership.company_id', '=', companyId)
		.where('certificate.slot', 'is not', null)
		.where('certificate.revoked_at', 'is', null)
		.where('certificate.expires_on', '>=', today)
		.where('certificate.expires_on', '<=', isoDay(new Date(now.getTime() + days * 86_400_000)))
		.orderBy('certificate.expires_on')
		.execute();
	return rows.map((r) => ({
		userId: r.user_id,
		name: r.name,
		email: r.email,
		courseCode: r.course_code,
		courseTitle: r.course_title,
		number: r.number,
		expiresOn: r.expires_on,
		daysLeft: Math.round((Date.parse(`${r.expires_on}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000)
	}));
}
