import { createHash, randomBytes } from 'node:crypto';
import { courses, getCourse } from '$lib/content';
import { findCourse, type RosterRow } from '$lib/roster';
import { recordAudit } from './audit';
import { addMember } from './companies';
import { db as defaultDb, inTransaction, type DB } from './db';
import { enrol } from './enrolments';
import { sendMail } from './mail';
import { claimSeat, seatLedger } from './seats';
import { normaliseEmail } from './users';

/**
 * Invitations hand a company's seats to its crew. Each carries a single-use link (only the
 * token's SHA-256 is stored) that expires after 14 days. Accepting claims a free seat, makes the
 * person crew of the company and enrols them with source `seat`, all in one transaction.
 */

export const INVITATION_DAYS = 14;
const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
export const courseRefs = courses.map(({ slug, code, title }) => ({ slug, code, title }));

export interface InvitationInput {
	name: string;
	email: string;
	course: string;
	/** Line in an uploaded roster, for messages. */
	line?: number;
}

export type CheckedRow = RosterRow;

/**
 * Checks people to invite against the company's seats: unknown courses, the same person twice,
 * people who already hold a seat or an open invitation, and rows beyond the free seats.
 * Rows keep their order; errors already present (from parsing) are kept.
 */
export async function checkInvitations(companyId: string, rows: CheckedRow[], db: DB = defaultDb): Promise<CheckedRow[]> {
	const ledger = await seatLedger(companyId, db);
	const free = new Map(ledger.map((l) => [l.courseSlug, l.free]));
	const emails = [...new Set(rows.map((r) => r.email).filter(Boolean))];
	const taken = new Set<string>();
	for (let i = 0; i < emails.length; i += 500) {
		const chunk = emails.slice(i, i + 500);
		const holders = await db
			.selectFrom('seat')
			.innerJoin('User', 'User.id', 'seat.holder_id')
			.select(['User.email', 'seat.course_slug'])
			.where('seat.company_id', '=', companyId)
			.where('seat.refunded_at', 'is', null)
			.where('User.email', 'in', chunk)
			.execute();
		for (const h of holders) taken.add(`${h.email} ${h.course_slug}`);
		const open = await db
			.selectFrom('invitation')
			.select(['email', 'course_slug'])
			.where('company_id', '=', companyId)
			.where('accepted_at', 'is', null)
			.where('withdrawn_at', 'is', null)
			.where('expires_at', '>', new Date().toISOString())
			.where('email', 'in', chunk)
			.execute();
		for (const o of open) taken.add(`${o.email} ${o.course_slug}#open`);
	}
	const seen = new Map<string, number>();
	return rows.map((row) => {
		const errors = [...row.errors];
		if (row.courseSlug && row.email && errors.length === 0) {
			const key = `${row.email} ${row.courseSlug}`;
			if (seen.has(key)) errors.push(`Same person and course as line ${seen.get(key)}.`);
			else if (taken.has(key)) errors.push('Already holds a seat on this course.');
			else if (taken.has(`${key}#open`)) errors.push('Already invited to this course.');
			else {
				const left = free.get(row.courseSlug) ?? 0;
				if (left <= 0) errors.push(`Not enough free seats on ${getCourse(row.courseSlug)?.title ?? row.courseSlug}.`);
				else free.set(row.courseSlug, left - 1);
			}
			seen.set(key, row.line);
		}
		return { ...row, errors };
	});
}

/** Turns JSON input (API) into rows like a parsed roster's, so one check serves both. */
export function rowsFromInput(input: InvitationInput[]): CheckedRow[] {
	return input.map((p, i) => {
		const course = findCourse(p.course, courseRefs);
		return {
			line: p.line ?? i + 1,
			name: p.name.trim(),
			email: normaliseEmail(p.email),
			course: p.course,
			courseSlug: course?.slug ?? null,
			errors: course ? [] : [`No course called "${p.course.slice(0, 80)}".`]
		};
	});
}

export type InviteResult =
	| { ok: true; sent: { email: string; courseSlug: string }[] }
	| { ok: false; rows: CheckedRow[] };

/**
 * Invites every row, or nobody when any row has an error (so a half-sent roster never needs
 * untangling). The checks run again inside the transaction; mail goes out after it commits.
 */
export async function inviteCrew(actorId: string, companyId: string, rows: CheckedRow[], origin: string, db: DB = defaultDb): Promise<InviteResult> {
	const company = await db.selectFrom('company').select(['id', 'name']).where('id', '=', companyId).executeTakeFirst();
	if (!company) throw new Error('No such company');
	const created = await inTransaction(db, async (trx) => {
		const checked = await checkInvitations(companyId, rows, trx);
		if (checked.length === 0 || checked.some((r) => r.errors.length)) return { ok: false as const, rows: checked };
		const now = new Date();
		const expires = new Date(now.getTime() + INVITATION_DAYS * 24 * 3600 * 1000).toISOString();
		const out: { token: string; id: string; name: string; email: string; courseSlug: string }[] = [];
		for (const row of checked) {
			const token = randomBytes(32).toString('base64url');
			const id = crypto.randomUUID();
			await trx
				.insertInto('invitation')
				.values({ id, token_hash: hashToken(token), company_id: companyId, course_slug: row.courseSlug!, email: row.email, name: row.name, invited_by: actorId, created_at: now.toISOString(), expires_at: expires, accepted_at: null, accepted_by: null, withdrawn_at: null })
				.execute();
			await recordAudit({ actorId, action: 'invitation.create', subjectType: 'company', subjectId: companyId, detail: { invitationId: id, email: row.email, courseSlug: row.courseSlug } }, trx);
			out.push({ token, id, name: row.name, email: row.email, courseSlug: row.courseSlug! });
		}
		return { ok: true as const, out };
	});
	if (!created.ok) return created;
	// Ten at a time: a long roster should not wait for each message in turn.
	for (let i = 0; i < created.out.length; i += 10) await Promise.all(created.out.slice(i, i + 10).map((inv) => sendInvitationMail(inv, company.name, origin)));
	return { ok: true, sent: created.out.map((i) => ({ email: i.email, courseSlug: i.courseSlug })) };
}

async function sendInvitationMail(inv: { token: string; name: string; email: string; courseSlug: string }, companyName: string, origin: string) {
	const course = getCourse(inv.courseSlug)!;
	await sendMail({
		to: inv.email,
		subject: `${companyName} has a seat for you on ${course.title}`,
		paragraphs: [
			`Hello ${inv.name},`,
			`${companyName} has reserved a seat for you on the Patchwright course "${course.title}" (${course.code}). The seat opens every lesson, the course test and the practical sign-offs.`,
			`Accept with the link below. It works once and expires in ${INVITATION_DAYS} days. If you have no Patchwright account yet, you create one on the way, and this link confirms your e-mail address.`
		],
		action: { label: 'Accept the seat', url: `${origin}/invitations/${inv.token}` },
		footnote: 'If you did not expect this, ignore this message: nothing happens unless you accept.'
	}).catch((e) => console.error(`invitation mail to ${inv.email} failed`, e));
}

/** The invitation behind a link, with why it can no longer be used (or null when it can). */
export async function findInvitation(token: string, db: DB = defaultDb) {
	if (!/^[\w-]{20,100}$/.test(token)) return null;
	const row = await db
		.selectFrom('invitation')
		.innerJoin('company', 'company.id', 'invitation.company_id')
		.select(['invitation.id', 'invitation.email', 'invitation.name', 'invitation.course_slug', 'invitation.company_id', 'invitation.expires_at', 'invitation.accepted_at', 'invitation.withdrawn_at', 'company.name as company_name'])
		.where('invitation.token_hash', '=', hashToken(token))
		.executeTakeFirst();
	if (!row) return null;
	const unusable = row.accepted_at
		? 'This invitation has already been accepted.'
		: row.withdrawn_at
			? 'This invitation was withdrawn by the company.'
			: row.expires_at <= new Date().toISOString()
				? 'This invitation has expired. Ask your company admin for a new one.'
				: null;
	return { ...row, unusable };
}

export type AcceptResult = { ok: true; courseSlug: string; companyId: string } | { ok: false; message: string };

/**
 * Accepts an invitation for the signed-in (or just signed-up) person whose address it was sent
 * to. Exactly one acceptance wins a link, and never more people than free seats get one.
 */
export async function acceptInvitation(token: string, userId: string, db: DB = defaultDb): Promise<AcceptResult> {
	return inTransaction(db, async (trx): Promise<AcceptResult> => {
		const invitation = await findInvitation(token, trx);
		if (!invitation) return { ok: false, message: 'This invitation link is not valid.' };
		if (invitation.unusable) return { ok: false, message: invitation.unusable };
		const user = await trx.selectFrom('User').select(['id', 'email', 'emailVerified']).where('id', '=', userId).executeTakeFirst();
		if (!user || user.email !== invitation.email) return { ok: false, message: `This invitation was sent to ${invitation.email}.` };
		const spent = await trx
			.updateTable('invitation')
			.set({ accepted_at: new Date().toISOString(), accepted_by: userId })
			.where('id', '=', invitation.id)
			.where('accepted_at', 'is', null)
			.executeTakeFirst();
		if (Number(spent.numUpdatedRows) !== 1) return { ok: false, message: 'This invitation has already been accepted.' };
		const seatId = await claimSeat(invitation.company_id, invitation.course_slug, userId, trx);
		if (!seatId) {
			// Undo the acceptance: the transaction rolls back when the work throws.
			throw new NoFreeSeat();
		}
		// The link reached this address, which confirms it.
		if (!user.emailVerified) await trx.updateTable('User').set({ emailVerified: new Date().toISOString() }).where('id', '=', userId).execute();
		const membership = await trx.selectFrom('membership').select('role').where('company_id', '=', invitation.company_id).where('user_id', '=', userId).executeTakeFirst();
		if (!membership) await addMember(userId, invitation.company_id, userId, 'member', trx);
		await enrol(userId, userId, invitation.course_slug, 'seat', trx);
		await recordAudit({ actorId: userId, action: 'invitation.accept', subjectType: 'company', subjectId: invitation.company_id, detail: { invitationId: invitation.id, seatId, courseSlug: invitation.course_slug } }, trx);
		await recordAudit({ actorId: userId, action: 'seat.assign', subjectType: 'seat', subjectId: seatId, detail: { holderId: userId, companyId: invitation.company_id, courseSlug: invitation.course_slug } }, trx);
		return { ok: true, courseSlug: invitation.course_slug, companyId: invitation.company_id };
	}).catch((e) => {
		if (e instanceof NoFreeSeat) return { ok: false, message: 'Every seat your company bought for this course is taken. Ask your company admin for another.' } as const;
		throw e;
	});
}

class NoFreeSeat extends Error {}

/** Withdraws an open invitation, which frees the seat it was holding. */
export async function withdrawInvitation(actorId: string, companyId: string, invitationId: string, db: DB = defaultDb): Promise<boolean> {
	return inTransaction(db, async (trx) => {
		const result = await trx
			.updateTable('invitation')
			.set({ withdrawn_at: new Date().toISOString() })
			.where('id', '=', invitationId)
			.where('company_id', '=', companyId)
			.where('accepted_at', 'is', null)
			.where('withdrawn_at', 'is', null)
			.executeTakeFirst();
		if (Number(result.numUpdatedRows) !== 1) return false;
		await recordAudit({ actorId, action: 'invitation.withdraw', subjectType: 'company', subjectId: companyId, detail: { invitationId } }, trx);
		return true;
	});
}

export function listOpenInvitations(companyId: string, db: DB = defaultDb) {
	return db
		.selectFrom('invitation')
		.select(['id', 'email', 'name', 'course_slug', 'created_at', 'expires_at'])
		.where('company_id', '=', companyId)
		.where('accepted_at', 'is', null)
		.where('withdrawn_at', 'is', null)
		.where('expires_at', '>', new Date().toISOString())
		.orderBy('created_at', 'desc')
		.execute();
}
