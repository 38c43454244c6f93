import { formatNumber, generateNumber, parseNumber } from '$lib/certificates/number';
import { courses, getCourse, type Course } from '$lib/content';
import { recordAudit } from './audit';
import { config } from './config';
import { signCredential } from './credential';
import { db as defaultDb, getDb, inTransaction, type DB } from './db';
import { isDatabaseBusy, isUniqueViolation } from './db/errors';
import type { CertificateTable } from './db/schema';
import { openRenewalOf } from './renewal-open';
import { signedOffSkills } from './sign-offs';
import { containsText, reusableQuery } from './db/engine';

/**
 * Certificates: issued the moment the last requirement is met, revoked with a reason,
 * replaced after a name correction, and answered for by number. Every issue, revocation and
 * replacement is written to the audit log in the same transaction.
 */

interface Options {
	db?: DB;
	now?: Date;
}

export type RequirementKey = 'enrolment' | 'test' | 'skills' | 'prerequisites';

export interface Requirement {
	key: RequirementKey;
	met: boolean;
	/** Plain words: what is met, or what is still missing. */
	detail: string;
}

export interface RequirementCheck {
	courseSlug: string;
	met: boolean;
	requirements: Requirement[];
	testOn: string | null;
	practicalOn: string | null;
	trainers: { id: string; name: string }[];
}

const isoDate = (d: Date | string) => (typeof d === 'string' ? d : d.toISOString()).slice(0, 10);

/** Adds calendar months, keeping the day where it exists (31 Jan + 1 month -> 28/29 Feb). */
export function addMonths(isoDay: string, months: number): string {
	const [y, m, d] = isoDay.split('-').map(Number);
	const target = new Date(Date.UTC(y, m - 1 + months, 1));
	const lastDay = new Date(Date.UTC(target.getUTCFullYear(), target.getUTCMonth() + 1, 0)).getUTCDate();
	target.setUTCDate(Math.min(d, lastDay));
	return isoDate(target);
}

const slotOf = (userId: string, courseSlug: string) => `${userId}|${courseSlug}`;

/** Whether the person holds a certificate for the course that is valid on `day` (YYYY-MM-DD). */
async function holdsValid(userId: string, courseSlug: string, day: string, db: DB): Promise<boolean> {
	const row = await db
		.selectFrom('certificate')
		.select('id')
		.where('slot', '=', slotOf(userId, courseSlug))
		.where('revoked_at', 'is', null)
		.where('issued_on', '<=', day)
		.where('expires_on', '>=', day)
		.executeTakeFirst();
	return !!row;
}

/** Each requirement of the course for this person, as it stands on `now`. */
export async function checkRequirements(userId: string, course: Course, { db = defaultDb, now = new Date() }: Options = {}): Promise<RequirementCheck> {
	const today = isoDate(now);
	const enrolment = await db
		.selectFrom('enrolment')
		.select('source')
		.where('user_id', '=', userId)
		.where('course_slug', '=', course.slug)
		.executeTakeFirst();
	const passed = await db
		.selectFrom('test_attempt')
		.select('submitted_at')
		.where('user_id', '=', userId)
		.where('course_slug', '=', course.slug)
		.where('passed', '=', 1)
		.orderBy('submitted_at', 'desc')
		.executeTakeFirst();
	const signOffs = await signedOffSkills(userId, course.slug, db);
	const signed = new Map(signOffs.map((s) => [s.skillId, s]));
	const missingSkills = course.practicalSkills.filter((skill) => !signed.has(skill.id));
	const missingPrerequisites: string[] = [];
	for (const slug of course.prerequisites) {
		if (!(await holdsValid(userId, slug, today, db))) missingPrerequisites.push(getCourse(slug)?.title ?? slug);
	}
	const counted = course.practicalSkills.map((skill) => signed.get(skill.id)).filter((s) => s !== undefined);
	const trainers = [...new Map(counted.map((s) => [s.trainerId, { id: s.trainerId, name: s.trainerName }])).values()];
	const practicalOn = counted.length ? isoDate(counted.map((s) => s.signedOffAt).sort().at(-1)!) : null;

	const requirements: Requirement[] = [
		{ key: 'enrolment', met: !!enrolment, detail: enrolment ? 'Enrolled.' : 'Not enrolled: needs a seat or a registrar\u2019s enrolment.' },
		{ key: 'test', met: !!passed, detail: passed ? `Course test passed on ${isoDate(passed.submitted_at!)}.` : 'Course test not passed yet.' },
		{
			key: 'skills',
			met: missingSkills.length === 0,
			detail: missingSkills.length === 0
				? `All ${course.practicalSkills.length} practical skills signed off.`
				: `Practical skills not signed off: ${missingSkills.map((s) => s.title).join(', ')}.`
		},
		{
			key: 'prerequisites',
			met: missingPrerequisites.length === 0,
			detail: course.prerequisites.length === 0
				? 'No prerequisite course.'
				: missingPrerequisites.length === 0
					? 'Prerequisite certificates valid.'
					: `No valid certificate today for: ${missingPrerequisites.join(', ')}.`
		}
	];
	return {
		courseSlug: course.slug,
		met: requirements.every((r) => r.met),
		requirements,
		testOn: passed ? isoDate(passed.submitted_at!) : null,
		practicalOn,
		trainers
	};
}

export type CertificateRow = CertificateTable;

/**
 * Inserts a certificate unless its slot is taken (then null). `ON CONFLICT (slot) DO NOTHING`
 * keeps the transaction usable on PostgreSQL too, where a failed statement would abort it.
 */
async function insertCertificate(
	values: Omit<CertificateTable, 'id' | 'number' | 'credential_jwt' | 'issued_at' | 'issued_on' | 'revoked_at' | 'revoked_by' | 'revocation_reason' | 'replaced_by_id'> & { replaces_id: string | null },
	now: Date,
	db: DB
): Promise<CertificateRow | null> {
	const issuedAt = now.toISOString();
	for (let tries = 0; ; tries++) {
		const number = formatNumber(generateNumber());
		const credential_jwt = await signCredential({
			number,
			holderName: values.holder_name,
			courseSlug: values.course_slug,
			courseCode: values.course_code,
			courseTitle: values.course_title,
			scope: values.scope,
			diameterMinMm: values.diameter_min_mm,
			diameterMaxMm: values.diameter_max_mm,
			issuedAt,
			expiresOn: values.expires_on,
			issuerName: values.issuer_name
		});
		const row: CertificateRow = {
			...values,
			id: crypto.randomUUID(),
			number,
			credential_jwt,
			issued_at: issuedAt,
			issued_on: isoDate(now),
			revoked_at: null,
			revoked_by: null,
			revocation_reason: null,
			replaced_by_id: null
		};
		try {
			const result = await db.insertInto('certificate').values(row).onConflict((oc) => oc.column('slot').doNothing()).executeTakeFirst();
			return Number(result.numInsertedOrUpdatedRows ?? 0) > 0 ? row : null;
		} catch (e) {
			// a number collision (2^-75 per pair) draws again
			if (!isUniqueViolation(e) || tries > 3) throw e;
		}
	}
}

export type IssueOutcome =
	| { issued: true; certificate: CertificateRow }
	| { issued: false; reason: 'unknown-course' | 'already-held' | 'requirements'; certificate?: CertificateRow; check?: RequirementCheck };

/**
 * Issues the course's certificate when every requirement is met, in one transaction: the
 * check, the row (with its signed credential) and the audit entry. The unique `slot` makes a
 * racing second request fail to insert; it then reports the certificate the first one made.
 * A revoked certificate keeps its slot, so nothing is re-issued behind a registrar's back.
 */
export async function issueIfEarned(
	userId: string,
	courseSlug: string,
	{ db = defaultDb, now = new Date(), actorId = null }: Options & { actorId?: string | null } = {}
): Promise<IssueOutcome> {
	const course = getCourse(courseSlug);
	if (!course) return { issued: false, reason: 'unknown-course' };
	const slot = slotOf(userId, courseSlug);
	const attempt = () => inTransaction(db, async (trx): Promise<IssueOutcome> => {
		const held = await trx.selectFrom('certificate').selectAll().where('slot', '=', slot).executeTakeFirst();
		if (held) return (await renewIfEarned(held, course, now, actorId, trx)) ?? { issued: false, reason: 'already-held', certificate: held };
		const check = await checkRequirements(userId, course, { db: trx, now });
		if (!check.met) return { issued: false, reason: 'requirements', check };
		const person = await trx.selectFrom('User').select(['name', 'email']).where('id', '=', userId).executeTakeFirstOrThrow();
		const issuedOn = isoDate(now);
		const certificate = await insertCertificate(
			{
				slot,
				user_id: userId,
				course_slug: course.slug,
				holder_name: person.name?.trim() || person.email,
				course_code: course.code,
				course_title: course.title,
				scope: course.certificateScope,
				diameter_min_mm: course.diameterRangeMm[0],
				diameter_max_mm: course.diameterRangeMm[1],
				practical_on: check.practicalOn!,
				test_on: check.testOn!,
				expires_on: addMonths(issuedOn, course.validityMonths),
				trainers: JSON.stringify(check.trainers),
				issuer_name: config.issuerName,
				replaces_id: null
			},
			now,
			trx
		);
		if (!certificate) {
			const winner = await trx.selectFrom('certificate').selectAll().where('slot', '=', slot).executeTakeFirstOrThrow();
			return { issued: false, reason: 'already-held', certificate: winner };
		}
		await recordAudit(
			{ actorId, action: 'certificate.issue', subjectType: 'certificate', subjectId: certificate.id, detail: { number: certificate.number, userId, courseSlug, expiresOn: certificate.expires_on } },
			trx
		);
		return { issued: true, certificate };
	});
	let outcome: IssueOutcome | undefined;
	for (let tries = 0; !outcome; tries++) {
		try {
			outcome = await attempt();
		} catch (e) {
			// another process holds the write lock or issued meanwhile: wait a moment and look again
			if (db.isTransaction || !isDatabaseBusy(e) || tries >= 8) throw e;
			await new Promise((r) => setTimeout(r, 25 * (tries + 1)));
		}
	}
	if (outcome.issued) {
		// a new certificate can complete the prerequisites of another course the person is enrolled in
		for (const next of courses.filter((c) => c.prerequisites.includes(courseSlug))) {
			await issueIfEarned(userId, next.slug, { db, now, actorId });
		}
	}
	return outcome;
}

/** Runs `issueIfEarned` for every course the person is enrolled in; returns what was issued. */
export async function issueAllEarned(userId: string, options: Options & { actorId?: string | null } = {}): Promise<CertificateRow[]> {
	const db = options.db ?? defaultDb;
	const enrolled = await db.selectFrom('enrolment').select('course_slug').where('user_id', '=', userId).execute();
	// prerequisites first, so that a course waiting on one is reached after it
	const order = (slug: string) => courses.findIndex((c) => c.slug === slug);
	const issued: CertificateRow[] = [];
	for (const { course_slug } of enrolled.sort((a, b) => order(a.course_slug) - order(b.course_slug))) {
		const outcome = await issueIfEarned(userId, course_slug, options);
		if (outcome.issued) issued.push(outcome.certificate);
	}
	return issued;
}

// ---------------------------------------------------------------- renewal

const addDays = (isoDay: string, days: number) => isoDate(new Date(Date.parse(`${isoDay}T00:00:00Z`) + days * 86_400_000));

/** The days a renewal of a certificate expiring on `expiresOn` may start and finish (inclusive). */
export function renewalWindow(expiresOn: string, course: Pick<Course, 'renewal'>): { opensOn: string; closesOn: string } {
	return { opensOn: addDays(expiresOn, -course.renewal.opensDaysBefore), closesOn: addDays(expiresOn, course.renewal.graceDays) };
}

export interface RenewalCheck {
	met: boolean;
	testOn: string | null;
	practicalOn: string | null;
	/** The skills the course marks for renewal, each signed off again since the renewal started or not. */
	skills: { id: string; title: string; met: boolean }[];
	trainers: { id: string; name: string }[];
}

/** What a renewal started at `since` still needs: a test passed and each renewal skill signed off since then. */
export async function checkRenewal(userId: string, course: Course, since: string, db: DB = defaultDb): Promise<RenewalCheck> {
	const passed = await db
		.selectFrom('test_attempt')
		.select('submitted_at')
		.where('user_id', '=', userId)
		.where('course_slug', '=', course.slug)
		.where('passed', '=', 1)
		.where('started_at', '>=', since)
		.orderBy('submitted_at', 'desc')
		.executeTakeFirst();
	const signed = new Map((await signedOffSkills(userId, course.slug, db)).filter((s) => s.signedOffAt >= since).map((s) => [s.skillId, s]));
	const renewalSkills = course.practicalSkills.filter((skill) => skill.renewal);
	const counted = renewalSkills.map((skill) => signed.get(skill.id)).filter((s) => s !== undefined);
	const skills = renewalSkills.map((skill) => ({ id: skill.id, title: skill.title, met: signed.has(skill.id) }));
	return {
		met: !!passed && skills.every((k) => k.met),
		testOn: passed ? isoDate(passed.submitted_at!) : null,
		practicalOn: counted.length ? isoDate(counted.map((k) => k.signedOffAt).sort().at(-1)!) : null,
		skills,
		trainers: [...new Map(counted.map((k) => [k.trainerId, { id: k.trainerId, name: k.trainerName }])).values()]
	};
}

/**
 * Completes the holder's renewal of `held` when its requirements are met inside the window:
 * a new certificate takes the slot, valid from the old expiry date for the course's validity
 * (not from today, so renewing early loses nothing); the old one answers "replaced by" it.
 * Null when there is no renewal to complete. Runs inside issueIfEarned's transaction.
 */
async function renewIfEarned(held: CertificateRow, course: Course, now: Date, actorId: string | null, trx: DB): Promise<IssueOutcome | null> {
	if (held.revoked_at || !held.user_id) return null;
	const renewal = await openRenewalOf(held.user_id, course.slug, trx);
	if (!renewal || renewal.certificate_id !== held.id) return null;
	if (isoDate(now) > renewalWindow(held.expires_on, course).closesOn) return null;
	const check = await checkRenewal(held.user_id, course, renewal.started_at, trx);
	if (!check.met) return { issued: false, reason: 'requirements', certificate: held };
	await trx.updateTable('certificate').set({ slot: null }).where('id', '=', held.id).execute();
	const person = await trx.selectFrom('User').select(['name', 'email']).where('id', '=', held.user_id).executeTakeFirstOrThrow();
	const fresh = await insertCertificate(
		{
			slot: held.slot,
			user_id: held.user_id,
			course_slug: course.slug,
			holder_name: person.name?.trim() || person.email,
			course_code: course.code,
			course_title: course.title,
			scope: course.certificateScope,
			diameter_min_mm: course.diameterRangeMm[0],
			diameter_max_mm: course.diameterRangeMm[1],
			practical_on: check.practicalOn!,
			test_on: check.testOn!,
			expires_on: addMonths(held.expires_on, course.validityMonths),
			trainers: JSON.stringify(check.trainers),
			issuer_name: config.issuerName,
			replaces_id: held.id
		},
		now,
		trx
	);
	if (!fresh) throw new Error('The renewed certificate could not take its slot.');
	await trx.updateTable('certificate').set({ replaced_by_id: fresh.id }).where('id', '=', held.id).execute();
	const done = await trx
		.updateTable('renewal')
		.set({ completed_at: now.toISOString(), new_certificate_id: fresh.id })
		.where('id', '=', renewal.id)
		.where('completed_at', 'is', null)
		.executeTakeFirst();
	if (Number(done.numUpdatedRows) !== 1) throw new Error('The renewal changed meanwhile.');
	await recordAudit(
		{ actorId, action: 'renewal.complete', subjectType: 'certificate', subjectId: held.id, detail: { number: held.number, replacedBy: fresh.number, courseSlug: course.slug, userId: held.user_id, expiresOn: fresh.expires_on } },
		trx
	);
	await recordAudit(
		{ actorId, action: 'certificate.issue', subjectType: 'certificate', subjectId: fresh.id, detail: { number: fresh.number, userId: held.user_id, courseSlug: course.slug, expiresOn: fresh.expires_on, renews: held.number } },
		trx
	);
	return { issued: true, certificate: fresh };
}

// ---------------------------------------------------------------- status

export type CertificateStatus = 'valid' | 'expired' | 'revoked' | 'replaced';

export interface PublicCertificate {
	number: string;
	status: CertificateStatus;
	holder: string;
	course: { code: string; title: string };
	scope: string;
	diameterRangeMm: [number, number];
	issuedOn: string;
	expiresOn: string;
	practicalOn: string;
	testOn: string;
	issuer: string;
	revokedOn?: string;
	replacedBy?: string;
}

const publicColumns = [
	'certificate.id',
	'certificate.number',
	'certificate.holder_name',
	'certificate.course_code',
	'certificate.course_title',
	'certificate.scope',
	'certificate.diameter_min_mm',
	'certificate.diameter_max_mm',
	'certificate.issued_on',
	'certificate.expires_on',
	'certificate.practical_on',
	'certificate.test_on',
	'certificate.issuer_name',
	'certificate.revoked_at',
	'replacement.number as replaced_by_number'
] as const;

type PublicRow = {
	number: string;
	holder_name: string;
	course_code: string;
	course_title: string;
	scope: string;
	diameter_min_mm: number;
	diameter_max_mm: number;
	issued_on: string;
	expires_on: string;
	practical_on: string;
	test_on: string;
	issuer_name: string;
	revoked_at: string | null;
	replaced_by_number: string | null;
};

/** What anyone may see about a certificate: the holder's name, course, scope and dates, never contact details. */
export function publicView(row: PublicRow, now = new Date()): PublicCertificate {
	const today = isoDate(now);
	const status: CertificateStatus = row.revoked_at ? 'revoked' : row.replaced_by_number ? 'replaced' : row.expires_on < today ? 'expired' : 'valid';
	return {
		number: row.number,
		status,
		holder: row.holder_name,
		course: { code: row.course_code, title: row.course_title },
		scope: row.scope,
		diameterRangeMm: [row.diameter_min_mm, row.diameter_max_mm],
		issuedOn: row.issued_on,
		expiresOn: row.expires_on,
		practicalOn: row.practical_on,
		testOn: row.test_on,
		issuer: row.issuer_name,
		...(row.revoked_at ? { revokedOn: isoDate(row.revoked_at) } : {}),
		...(row.replaced_by_number ? { replacedBy: row.replaced_by_number } : {})
	};
}

function publicQuery(db: DB) {
	return db.selectFrom('certificate').leftJoin('certificate as replacement', 'replacement.id', 'certificate.replaced_by_id').select(publicColumns);
}

/** Looks a number up as typed (forgiving form). Null when it is malformed or unknown. */
export async function findCertificate(input: string, { db = getDb(), now = new Date() }: Options = {}): Promise<PublicCertificate | null> {
	const parsed = parseNumber(input);
	if (!parsed.ok) return null;
	const [row] = await byNumber(db, [parsed.formatted]);
	return row ? publicView(row, now) : null;
}

/** The public API's look-up by number, built once (the verification API's hottest query). */
const byNumber = reusableQuery((db) => publicQuery(db).where('certificate.number', '=', 'stand-in'));

export interface CrewRow {
	input: string;
	number: string | null;
	result: PublicCertificate | null;
	/** Why there is no result: a typing mistake or no such certificate. */
	problem: string | null;
}

export const CREW_CHECK_LIMIT = 200;

/** Splits pasted text or a CSV into candidate numbers: one per line or cell, blanks and a header left out. */
export function splitNumbers(text: string): string[] {
	return text
		.split(/[\r\n,;\t]+/)
		.map((s) => s.replace(/^["']|["']$/g, '').trim())
		.filter((s) => s && !/^(certificate[ _-]?)?(number|no\.?)$/i.test(s));
}

/** Statuses for a list of numbers (up to CREW_CHECK_LIMIT), in the order given, in one query. */
export async function checkNumbers(inputs: string[], { db = defaultDb, now = new Date() }: Options = {}): Promise<CrewRow[]> {
	const parsed = inputs.slice(0, CREW_CHECK_LIMIT).map((input) => ({ input, parsed: parseNumber(input) }));
	const numbers = [...new Set(parsed.flatMap((p) => (p.parsed.ok ? [p.parsed.formatted] : [])))];
	const rows = numbers.length ? await publicQuery(db).where('certificate.number', 'in', numbers).execute() : [];
	const byNumber = new Map(rows.map((r) => [r.number, publicView(r, now)]));
	return parsed.map(({ input, parsed: p }) => {
		if (!p.ok) return { input, number: null, result: null, problem: p.message };
		const result = byNumber.get(p.formatted) ?? null;
		return { input, number: p.formatted, result, problem: result ? null : 'No certificate has this number.' };
	});
}

// ---------------------------------------------------------------- registrar

export const revocationReasons = {
	'issued-in-error': 'Issued in error',
	misconduct: 'Misconduct or unsafe work',
	'requirement-withdrawn': 'A requirement was withdrawn (test result or sign-off)',
	other: 'Other'
} as const;
export type RevocationReason = keyof typeof revocationReasons;

export type RegistrarOutcome = { ok: true; certificate: CertificateRow } | { ok: false; status: 404 | 409; message: string };

async function rowByNumber(input: string, db: DB) {
	const parsed = parseNumber(input);
	if (!parsed.ok) return undefined;
	return db.selectFrom('certificate').selectAll().where('number', '=', parsed.formatted).executeTakeFirst();
}

/** Withdraws a certificate. The reason is kept for the registrar and the audit log; the public sees only "revoked". */
export async function revokeCertificate(
	actorId: string,
	number: string,
	reason: RevocationReason,
	note: string,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<RegistrarOutcome> {
	return inTransaction(db, async (trx) => {
		const row = await rowByNumber(number, trx);
		if (!row) return { ok: false, status: 404, message: 'No certificate has this number.' };
		if (row.revoked_at) return { ok: false, status: 409, message: 'This certificate is already revoked.' };
		if (row.replaced_by_id) return { ok: false, status: 409, message: 'This certificate was replaced; revoke the one that replaced it.' };
		const text = note.trim() ? `${revocationReasons[reason]}: ${note.trim()}` : revocationReasons[reason];
		const revokedAt = now.toISOString();
		const revoked = await trx
			.updateTable('certificate')
			.set({ revoked_at: revokedAt, revoked_by: actorId, revocation_reason: text })
			.where('id', '=', row.id)
			.where('revoked_at', 'is', null)
			.where('replaced_by_id', 'is', null)
			.executeTakeFirst();
		// another registrar revoked or replaced it between the read and this write
		if (Number(revoked.numUpdatedRows) !== 1) return { ok: false, status: 409, message: 'This certificate changed meanwhile; reload it.' };
		await recordAudit({ actorId, action: 'certificate.revoke', subjectType: 'certificate', subjectId: row.id, detail: { number: row.number, reason, note: note.trim() } }, trx);
		return { ok: true, certificate: { ...row, revoked_at: revokedAt, revoked_by: actorId, revocation_reason: text } };
	});
}

/**
 * Corrects the holder's name and re-issues: a new number with the same course, dates and
 * expiry; the old number then answers "replaced by" the new one. The person's account name is
 * corrected in the same transaction.
 */
export async function reissueWithName(
	actorId: string,
	number: string,
	newName: string,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<RegistrarOutcome> {
	const name = newName.trim();
	return inTransaction(db, async (trx) => {
		const old = await rowByNumber(number, trx);
		if (!old) return { ok: false, status: 404, message: 'No certificate has this number.' };
		if (old.revoked_at) return { ok: false, status: 409, message: 'A revoked certificate cannot be re-issued.' };
		if (old.replaced_by_id) return { ok: false, status: 409, message: 'This certificate was already replaced.' };
		if (name === old.holder_name) return { ok: false, status: 409, message: 'The name is unchanged.' };
		const released = await trx
			.updateTable('certificate')
			.set({ slot: null })
			.where('id', '=', old.id)
			.where('slot', 'is not', null)
			.where('revoked_at', 'is', null)
			.where('replaced_by_id', 'is', null)
			.executeTakeFirst();
		// another registrar revoked or re-issued it between the read and this write
		if (Number(released.numUpdatedRows) !== 1) return { ok: false, status: 409, message: 'This certificate changed meanwhile; reload it.' };
		const fresh = (await insertCertificate(
			{
				slot: old.slot,
				user_id: old.user_id,
				course_slug: old.course_slug,
				holder_name: name,
				course_code: old.course_code,
				course_title: old.course_title,
				scope: old.scope,
				diameter_min_mm: old.diameter_min_mm,
				diameter_max_mm: old.diameter_max_mm,
				practical_on: old.practical_on,
				test_on: old.test_on,
				expires_on: old.expires_on,
				trainers: old.trainers,
				issuer_name: old.issuer_name,
				replaces_id: old.id
			},
			now,
			trx
		))!;
		await trx.updateTable('certificate').set({ replaced_by_id: fresh.id }).where('id', '=', old.id).execute();
		await trx.updateTable('User').set({ name }).where('id', '=', old.user_id).execute();
		await recordAudit(
			{ actorId, action: 'certificate.replace', subjectType: 'certificate', subjectId: old.id, detail: { number: old.number, replacedBy: fresh.number, oldName: old.holder_name, newName: name } },
			trx
		);
		await recordAudit(
			{ actorId, action: 'certificate.issue', subjectType: 'certificate', subjectId: fresh.id, detail: { number: fresh.number, userId: old.user_id, courseSlug: old.course_slug, replaces: old.number } },
			trx
		);
		return { ok: true, certificate: fresh };
	});
}

export interface WaitingPerson {
	userId: string;
	name: string | null;
	email: string;
	courseSlug: string;
	courseTitle: string;
	missing: Requirement;
}

/** Enrolled people without a certificate who lack exactly one requirement, with what it is. */
export async function listWaitingForOne({ db = defaultDb, now = new Date() }: Options = {}): Promise<WaitingPerson[]> {
	const rows = await db
		.selectFrom('enrolment')
		.innerJoin('User', 'User.id', 'enrolment.user_id')
		.leftJoin('certificate', (join) => join.onRef('certificate.user_id', '=', 'enrolment.user_id').onRef('certificate.course_slug', '=', 'enrolment.course_slug').on('certificate.slot', 'is not', null))
		.where('certificate.id', 'is', null)
		.select(['enrolment.user_id', 'enrolment.course_slug', 'User.name', 'User.email'])
		.orderBy('User.name')
		.execute();
	const waiting: WaitingPerson[] = [];
	for (const row of rows) {
		const course = getCourse(row.course_slug);
		if (!course) continue;
		const check = await checkRequirements(row.user_id, course, { db, now });
		const unmet = check.requirements.filter((r) => !r.met);
		if (unmet.length === 1) waiting.push({ userId: row.user_id, name: row.name, email: row.email, courseSlug: course.slug, courseTitle: course.title, missing: unmet[0] });
	}
	return waiting;
}

/** Full rows for the registrar's certificate list, newest first (`query` matches number or holder). */
export async function listCertificatesForRegistrar(query = '', { db = defaultDb, now = new Date(), limit = 100 }: Options & { limit?: number } = {}) {
	let q = publicQuery(db)
		.select(['certificate.revocation_reason', 'certificate.issued_at'])
		.orderBy('certificate.issued_at', 'desc')
		.limit(limit);
	const parsed = parseNumber(query);
	if (parsed.ok) q = q.where('certificate.number', '=', parsed.formatted);
	else if (query.trim()) q = q.where((eb) => containsText(eb, eb.ref('certificate.holder_name'), query.trim()));
	const rows = await q.execute();
	return rows.map((r) => ({ ...publicView(r, now), revocationReason: r.revocation_reason }));
}

/** A person's own certificates (current and past), newest first. */
export async function listCertificatesOf(userId: string, { db = defaultDb, now = new Date() }: Options = {}) {
	const rows = await publicQuery(db).where('certificate.user_id', '=', userId).orderBy('certificate.issued_at', 'desc').execute();
	return rows.map((r) => publicView(r, now));
}

/** The current certificates of a company's members, for its admins. */
export async function listCertificatesOfCompany(companyId: string, { db = defaultDb, now = new Date() }: Options = {}) {
	const rows = await publicQuery(db)
		.innerJoin('membership', 'membership.user_id', 'certificate.user_id')
		.where('membership.company_id', '=', companyId)
		.where('certificate.slot', 'is not', null)
		.orderBy('certificate.holder_name')
		.orderBy('certificate.course_code')
		.execute();
	return rows.map((r) => publicView(r, now));
}

/** The certificate row behind a number, for its holder's downloads; null when not theirs. */
export async function ownCertificate(userId: string, number: string, db: DB = defaultDb) {
	const row = await rowByNumber(number, db);
	return row && row.user_id === userId ? row : null;
}

export async function certificateByNumber(number: string, db: DB = defaultDb) {
	return (await rowByNumber(number, db)) ?? null;
}
