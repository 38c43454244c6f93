import { recordAudit } from './audit';
import { config } from './config';
import { db as defaultDb, inTransaction, type DB } from './db';
import { sendMail, type MailContent } from './mail';

/**
 * Expiry reminders: e-mails 60, 30 and 7 days before a certificate expires, to its holder and
 * to the admins of the holder's companies. Revoked and replaced certificates get none.
 *
 * Exactly once, as near as e-mail allows. Each reminder is CLAIMED before it is sent: a row in
 * `certificate_reminder`, unique on (certificate, threshold, address), inserted with
 * ON CONFLICT DO NOTHING, so a second run or a second process finds it taken and sends nothing.
 * After the mail server accepts the message the row is marked sent. A claim that is never
 * marked (the process died between claim and send) is taken again once its lease
 * (CLAIM_LEASE_MS) has run out, so a crash does not lose a reminder. The one moment left
 * uncovered is between the mail server accepting a message and the row being marked: a crash
 * exactly there sends that reminder a second time after the lease. We prefer that rare late
 * repeat to a lost expiry warning; the Message-ID is the reminder's id, so a mail system that
 * drops repeated ids drops it.
 *
 * Late runs send only the NEAREST threshold already reached: after a week of downtime from 61
 * days to 25 days before expiry, the 30-day reminder goes out (once) and the 60-day one never.
 *
 * This module imports no course content, so `scripts/reminders.ts` can run it outside Vite.
 */

/** Days before expiry, largest first. */
export const REMINDER_THRESHOLDS = [60, 30, 7] as const;
export type Threshold = (typeof REMINDER_THRESHOLDS)[number];

/** How long a claim without a send blocks others; past it, the reminder is taken again. */
export const CLAIM_LEASE_MS = 10 * 60_000;

const DAY_MS = 86_400_000;
const isoDay = (d: Date) => d.toISOString().slice(0, 10);

/** Whole days from `today` to `expiresOn` (both YYYY-MM-DD, UTC). */
export function daysUntil(expiresOn: string, today: string): number {
	return Math.round((Date.parse(`${expiresOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / DAY_MS);
}

/** The nearest threshold already reached, or null (more than 60 days left, or already expired). */
export function dueThreshold(daysLeft: number): Threshold | null {
	if (daysLeft < 0) return null;
	const reached = REMINDER_THRESHOLDS.filter((t) => daysLeft <= t);
	return reached.length ? reached[reached.length - 1] : null;
}

export interface ReminderRecipient {
	email: string;
	userId: string;
	name: string | null;
	role: 'holder' | 'company admin';
}

export interface DueReminder {
	certificateId: string;
	number: string;
	holderName: string;
	courseCode: string;
	courseTitle: string;
	expiresOn: string;
	daysLeft: number;
	threshold: Threshold;
	recipient: ReminderRecipient;
}

/** Certificates that can still be reminded of: current (not revoked, not replaced), expiring within the largest threshold. */
function remindable(db: DB, today: string) {
	return db
		.selectFrom('certificate')
		.where('certificate.revoked_at', 'is', null)
		.where('certificate.replaced_by_id', 'is', null)
		.where('certificate.slot', 'is not', null)
		.where('certificate.expires_on', '>=', today)
		.where('certificate.expires_on', '<=', isoDay(new Date(Date.parse(`${today}T00:00:00Z`) + REMINDER_THRESHOLDS[0] * DAY_MS)));
}

/** Every reminder due on `now`'s day, whether or not it was sent already. Three queries in all. */
export async function listDueReminders({ db = defaultDb, now = new Date() }: { db?: DB; now?: Date } = {}): Promise<DueReminder[]> {
	const today = isoDay(now);
	const certificates = await remindable(db, today)
		.innerJoin('User', 'User.id', 'certificate.user_id')
		.select([
			'certificate.id',
			'certificate.number',
			'certificate.user_id',
			'certificate.holder_name',
			'certificate.course_code',
			'certificate.course_title',
			'certificate.expires_on',
			'User.email',
			'User.name'
		])
		.orderBy('certificate.expires_on')
		.orderBy('certificate.number')
		.execute();
	if (!certificates.length) return [];
	const holderIds = [...new Set(certificates.map((c) => c.user_id))];
	const admins = await db
		.selectFrom('membership as member')
		.innerJoin('membership as admin', (join) => join.onRef('admin.company_id', '=', 'member.company_id').on('admin.role', '=', 'admin'))
		.innerJoin('User', 'User.id', 'admin.user_id')
		.select(['member.user_id as holder_id', 'User.id as admin_id', 'User.email', 'User.name'])
		.where('member.user_id', 'in', holderIds)
		.orderBy('User.email')
		.execute();
	const due: DueReminder[] = [];
	for (const c of certificates) {
		const daysLeft = daysUntil(c.expires_on, today);
		const threshold = dueThreshold(daysLeft);
		if (threshold === null) continue;
		const recipients = new Map<string, ReminderRecipient>();
		recipients.set(c.email.toLowerCase(), { email: c.email, userId: c.user_id, name: c.name, role: 'holder' });
		for (const a of admins) {
			if (a.holder_id !== c.user_id || recipients.has(a.email.toLowerCase())) continue;
			recipients.set(a.email.toLowerCase(), { email: a.email, userId: a.admin_id, name: a.name, role: 'company admin' });
		}
		for (const recipient of recipients.values()) {
			due.push({
				certificateId: c.id,
				number: c.number,
				holderName: c.holder_name,
				courseCode: c.course_code,
				courseTitle: c.course_title,
				expiresOn: c.expires_on,
				daysLeft,
				threshold,
				recipient
			});
		}
	}
	return due;
}

/**
 * Claims one reminder for this process. Returns the claim's id, or null when it is taken (sent,
 * or claimed by a run whose lease has not run out) or the certificate stopped being current.
 */
export async function claimReminder(reminder: DueReminder, now: Date, db: DB = defaultDb): Promise<string | null> {
	return inTransaction(db, async (trx) => {
		const current = await remindable(trx, isoDay(now)).select('certificate.id').where('certificate.id', '=', reminder.certificateId).executeTakeFirst();
		if (!current) return null;
		const id = crypto.randomUUID();
		const at = now.toISOString();
		const email = reminder.recipient.email.toLowerCase();
		const inserted = await trx
			.insertInto('certificate_reminder')
			.values({
				id,
				certificate_id: reminder.certificateId,
				threshold_days: reminder.threshold,
				recipient_email: email,
				recipient_id: reminder.recipient.userId,
				recipient_role: reminder.recipient.role,
				claimed_at: at,
				sent_at: null,
				attempts: 1
			})
			.onConflict((oc) => oc.columns(['certificate_id', 'threshold_days', 'recipient_email']).doNothing())
			.executeTakeFirst();
		if (Number(inserted.numInsertedOrUpdatedRows ?? 0) > 0) return id;
		const stale = await trx
			.selectFrom('certificate_reminder')
			.select(['id', 'claimed_at'])
			.where('certificate_id', '=', reminder.certificateId)
			.where('threshold_days', '=', reminder.threshold)
			.where('recipient_email', '=', email)
			.where('sent_at', 'is', null)
			.where('claimed_at', '<', new Date(now.getTime() - CLAIM_LEASE_MS).toISOString())
			.executeTakeFirst();
		if (!stale) return null;
		// The guard on the old claimed_at lets only one of two racing runs take it over.
		const taken = await trx
			.updateTable('certificate_reminder')
			.set((eb) => ({ claimed_at: at, attempts: eb('attempts', '+', 1) }))
			.where('id', '=', stale.id)
			.where('claimed_at', '=', stale.claimed_at)
			.where('sent_at', 'is', null)
			.executeTakeFirst();
		return Number(taken.numUpdatedRows) === 1 ? stale.id : null;
	});
}

/** Marks a claimed reminder sent, with its audit entry, in one transaction. */
async function markSent(claimId: string, reminder: DueReminder, now: Date, db: DB): Promise<void> {
	await inTransaction(db, async (trx) => {
		await trx.updateTable('certificate_reminder').set({ sent_at: now.toISOString() }).where('id', '=', claimId).execute();
		await recordAudit(
			{
				actorId: null,
				action: 'certificate.reminder',
				subjectType: 'certificate',
				subjectId: reminder.certificateId,
				detail: { number: reminder.number, thresholdDays: reminder.threshold, daysLeft: reminder.daysLeft, to: reminder.recipient.email, recipientRole: reminder.recipient.role }
			},
			trx
		);
	});
}

/** The link in a reminder: the holder's renewal page, or the company page for an admin. */
export function renewalPath(number: string): string {
	return `/certificates/${number}/renew`;
}

function daysWords(n: number): string {
	return n === 0 ? 'today' : n === 1 ? 'tomorrow' : `in ${n} days`;
}

/** The e-mail for one reminder. */
export function reminderMail(r: DueReminder, origin: string): MailContent {
	const when = `${daysWords(r.daysLeft)} (on ${r.expiresOn})`;
	if (r.recipient.role === 'holder') {
		return {
			to: r.recipient.email,
			subject: `Your ${r.courseCode} certificate expires ${daysWords(r.daysLeft)}`,
			paragraphs: [
				`Hello ${r.recipient.name ?? r.holderName},`,
				`Your certificate ${r.number} for ${r.courseTitle} (${r.courseCode}) expires ${when}.`,
				'You can renew it now by the shorter renewal path: the course test again and the practical skills the course marks for renewal, shown to a trainer. The new certificate runs on from the day this one expires, so renewing early loses nothing.'
			],
			action: { label: 'Start your renewal', url: `${origin}${renewalPath(r.number)}` },
			footnote: `You get this reminder ${REMINDER_THRESHOLDS.join(', ')} days before a certificate expires.`
		};
	}
	return {
		to: r.recipient.email,
		subject: `${r.holderName}: ${r.courseCode} certificate expires ${daysWords(r.daysLeft)}`,
		paragraphs: [
			`Hello ${r.recipient.name ?? ''},`.replace(' ,', ','),
			`${r.holderName}'s certificate ${r.number} for ${r.courseTitle} (${r.courseCode}) expires ${when}.`,
			'They can renew it by the shorter renewal path; a renewal seat is bought on the company page, the same way as course seats.'
		],
		action: { label: 'Open the company page', url: `${origin}/company` },
		footnote: `Company admins get this reminder ${REMINDER_THRESHOLDS.join(', ')} days before a crew member's certificate expires.`
	};
}

export interface ReminderRun {
	sent: number;
	/** Due but already sent or claimed by another run. */
	skipped: number;
	failed: number;
}

export interface ReminderOptions {
	db?: DB;
	now?: Date;
	origin?: string;
	/** The mail sender (tests pass their own to stop a run half way). */
	send?: (content: MailContent) => Promise<void>;
}

/**
 * Sends every reminder due on `now`'s day that no run has sent. Safe to run twice, or in two
 * processes at once. A message the mail server refuses releases its claim for the next run.
 */
export async function sendDueReminders({ db = defaultDb, now = new Date(), origin = config.origin, send = sendMail }: ReminderOptions = {}): Promise<ReminderRun> {
	const run: ReminderRun = { sent: 0, skipped: 0, failed: 0 };
	for (const reminder of await listDueReminders({ db, now })) {
		const claimId = await claimReminder(reminder, now, db);
		if (!claimId) {
			run.skipped++;
			continue;
		}
		try {
			await send({ ...reminderMail(reminder, origin), messageId: `<reminder-${claimId}@patchwright.invalid>` });
		} catch (e) {
			console.error(`Reminder for certificate ${reminder.number} to ${reminder.recipient.email} not sent (retried next run): ${e instanceof Error ? e.message : String(e)}`);
			await db.deleteFrom('certificate_reminder').where('id', '=', claimId).where('sent_at', 'is', null).execute();
			run.failed++;
			continue;
		}
		await markSent(claimId, reminder, now, db);
		run.sent++;
	}
	return run;
}
