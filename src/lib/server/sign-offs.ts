import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { getCourse } from '$lib/content';
import { checkReadings, type Reading, type TypedReadings } from '$lib/practicals/readings';
import type { AssessmentView, CriterionResult, EvidenceFileView, SkillState } from '$lib/practicals/states';
export type { AssessmentView, EvidenceFileView } from '$lib/practicals/states';
import { recordAudit } from './audit';
import { issueIfEarned } from './certificates';
import { db as defaultDb, inTransaction, type DB } from './db';
import { isUniqueViolation } from './db/errors';
import { isEnrolled } from './enrolments';
import { inTrainerScope, trainerMaySee, trainerScope, type TrainerScope } from './trainer-scope';
import type { ProcessedFile } from './uploads';

/**
 * Practical sign-offs: trainees send evidence for a course's practical skills, trainers in
 * whose scope the trainee is grade each criterion and sign the skill off or return it, a
 * registrar can void a sign-off. Every change writes the audit log in the same transaction;
 * submissions and sign-offs are never deleted.
 */

export class SignOffError extends Error {
	/** The submitted text fields, when a form should show them again. */
	values: Record<string, string> = {};
	constructor(
		readonly status: 400 | 403 | 404 | 409,
		message: string,
		readonly fields: Record<string, string> = {}
	) {
		super(message);
	}
}

export interface CurrentSignOff {
	skillId: string;
	signedOffAt: string;
	trainerId: string;
	trainerName: string;
}

/**
 * The person's current sign-offs in a course (voided ones left out), oldest first.
 * `trainerName` is the name the trainer typed as their signature.
 */
export async function signedOffSkills(userId: string, courseSlug: string, db: DB = defaultDb): Promise<CurrentSignOff[]> {
	return db
		.selectFrom('sign_off')
		.innerJoin('practical_assessment', 'practical_assessment.id', 'sign_off.assessment_id')
		.select([
			'sign_off.skill_id as skillId',
			'sign_off.signed_off_at as signedOffAt',
			'sign_off.trainer_id as trainerId',
			'practical_assessment.signature_name as trainerName'
		])
		.where('sign_off.user_id', '=', userId)
		.where('sign_off.course_slug', '=', courseSlug)
		.where('sign_off.voided_at', 'is', null)
		.orderBy('sign_off.signed_off_at')
		.execute();
}

export function findSkill(courseSlug: string, skillId: string) {
	const course = getCourse(courseSlug);
	const skill = course?.practicalSkills.find((s) => s.id === skillId);
	return course && skill ? { course, skill } : null;
}

function requireSkill(courseSlug: string, skillId: string) {
	const found = findSkill(courseSlug, skillId);
	if (!found) throw new SignOffError(404, 'No such practical skill.');
	return found;
}

// ---------------------------------------------------------------------------------------------
// What a trainee sees
// ---------------------------------------------------------------------------------------------

export interface SubmissionView {
	id: string;
	traineeId: string;
	courseSlug: string;
	skillId: string;
	inPerson: boolean;
	submittedBy: string;
	note: string;
	readings: Reading[];
	status: 'waiting' | 'withdrawn' | 'returned' | 'signed off';
	submittedAt: string;
	closedAt: string | null;
	files: EvidenceFileView[];
	assessment: AssessmentView | null;
}

export interface SignOffRecord {
	id: string;
	skillId: string;
	signedOffAt: string;
	trainerId: string;
	trainerName: string;
	voidedAt: string | null;
	voidReason: string | null;
}

export interface SkillOverview {
	id: string;
	title: string;
	criteria: string[];
	state: SkillState;
	signOff: SignOffRecord | null;
	/** Newest first. */
	history: SubmissionView[];
	/** Voided sign-offs, newest first. */
	voided: SignOffRecord[];
}

async function loadSubmissions(where: { traineeId?: string; courseSlug?: string; ids?: string[] }, db: DB): Promise<SubmissionView[]> {
	let query = db
		.selectFrom('practical_submission as s')
		.leftJoin('practical_assessment as a', 'a.submission_id', 's.id')
		.select([
			's.id',
			's.trainee_id',
			's.course_slug',
			's.skill_id',
			's.in_person',
			's.submitted_by',
			's.note',
			's.readings',
			's.status',
			's.submitted_at',
			's.closed_at',
			'a.trainer_id',
			'a.signature_name',
			'a.outcome',
			'a.criteria',
			'a.reasons',
			'a.place',
			'a.practical_date',
			'a.assessed_at'
		])
		.orderBy('s.submitted_at', 'desc');
	if (where.traineeId) query = query.where('s.trainee_id', '=', where.traineeId);
	if (where.courseSlug) query = query.where('s.course_slug', '=', where.courseSlug);
	if (where.ids) {
		if (where.ids.length === 0) return [];
		query = query.where('s.id', 'in', where.ids);
	}
	const rows = await query.execute();
	const files = rows.length
		? await db
				.selectFrom('evidence_file')
				.select(['id', 'submission_id', 'original_name', 'media_type', 'size_bytes', 'thumbnail_key'])
				.where('submission_id', 'in', rows.map((r) => r.id))
				.orderBy('position')
				.execute()
		: [];
	return rows.map((r) => ({
		id: r.id,
		traineeId: r.trainee_id,
		courseSlug: r.course_slug,
		skillId: r.skill_id,
		inPerson: r.in_person === 1,
		submittedBy: r.submitted_by,
		note: r.note,
		readings: JSON.parse(r.readings) as Reading[],
		status: r.status,
		submittedAt: r.submitted_at,
		closedAt: r.closed_at,
		files: files
			.filter((f) => f.submission_id === r.id)
			.map((f) => ({ id: f.id, originalName: f.original_name, mediaType: f.media_type, sizeBytes: f.size_bytes, hasThumbnail: !!f.thumbnail_key })),
		assessment: r.outcome
			? {
					trainerId: r.trainer_id!,
					signatureName: r.signature_name!,
					outcome: r.outcome,
					criteria: JSON.parse(r.criteria!) as CriterionResult[],
					reasons: r.reasons!,
					place: r.place!,
					practicalDate: r.practical_date!,
					assessedAt: r.assessed_at!
				}
			: null
	}));
}

async function loadSignOffs(userId: string, courseSlug: string, db: DB): Promise<SignOffRecord[]> {
	const rows = await db
		.selectFrom('sign_off')
		.innerJoin('practical_assessment', 'practical_assessment.id', 'sign_off.assessment_id')
		.select([
			'sign_off.id',
			'sign_off.skill_id',
			'sign_off.signed_off_at',
			'sign_off.trainer_id',
			'practical_assessment.signature_name',
			'sign_off.voided_at',
			'sign_off.void_reason'
		])
		.where('sign_off.user_id', '=', userId)
		.where('sign_off.course_slug', '=', courseSlug)
		.orderBy('sign_off.signed_off_at', 'desc')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		skillId: r.skill_id,
		signedOffAt: r.signed_off_at,
		trainerId: r.trainer_id,
		trainerName: r.signature_name,
		voidedAt: r.voided_at,
		voidReason: r.void_reason
	}));
}

/** Every practical skill of the course with its state for the person, the sign-off and the history. */
export async function practicalOverview(userId: string, courseSlug: string, db: DB = defaultDb): Promise<SkillOverview[]> {
	const course = getCourse(courseSlug);
	if (!course) throw new SignOffError(404, 'No such course.');
	const [submissions, signOffs] = await Promise.all([loadSubmissions({ traineeId: userId, courseSlug }, db), loadSignOffs(userId, courseSlug, db)]);
	return course.practicalSkills.map((skill) => {
		const history = submissions.filter((s) => s.skillId === skill.id);
		const signOff = signOffs.find((s) => s.skillId === skill.id && !s.voidedAt) ?? null;
		const latest = history.find((s) => s.status !== 'withdrawn');
		const state: SkillState = signOff
			? 'signed off'
			: latest?.status === 'waiting'
				? 'waiting'
				: latest?.status === 'returned'
					? 'returned'
					: 'not started';
		return {
			id: skill.id,
			title: skill.title,
			criteria: skill.criteria,
			state,
			signOff,
			history,
			voided: signOffs.filter((s) => s.skillId === skill.id && s.voidedAt)
		};
	});
}

export async function getSubmission(id: string, db: DB = defaultDb): Promise<SubmissionView | null> {
	return (await loadSubmissions({ ids: [id] }, db))[0] ?? null;
}

// ---------------------------------------------------------------------------------------------
// Evidence
// ---------------------------------------------------------------------------------------------

export const noteSchema = z.string().trim().max(2000, 'Keep the note under 2,000 characters.');

export interface EvidenceInput {
	traineeId: string;
	courseSlug: string;
	skillId: string;
	note: string;
	readings: TypedReadings;
}

/** Parses the note and readings; throws a 400 with a message per field. Pure apart from the catalogue. */
export function checkEvidence(input: EvidenceInput): { note: string; readings: Reading[] } {
	requireSkill(input.courseSlug, input.skillId);
	const note = noteSchema.safeParse(input.note ?? '');
	const readings = checkReadings(input.courseSlug, input.skillId, input.readings);
	const fields: Record<string, string> = {};
	if (!note.success) fields.note = note.error.issues[0].message;
	if (!readings.ok) Object.assign(fields, readings.errors);
	if (Object.keys(fields).length || !note.success || !readings.ok) throw new SignOffError(400, 'Please correct the marked fields.', fields);
	return { note: note.data, readings: readings.readings };
}

/** The checks that do not need the files: run them before any upload is stored. */
export async function assertMaySubmit(traineeId: string, courseSlug: string, skillId: string, db: DB = defaultDb): Promise<void> {
	requireSkill(courseSlug, skillId);
	if (!(await isEnrolled(traineeId, courseSlug, db))) throw new SignOffError(403, 'You are not enrolled in this course.');
	const current = await signedOffSkills(traineeId, courseSlug, db);
	if (current.some((s) => s.skillId === skillId)) throw new SignOffError(409, 'This skill is already signed off.');
	const waiting = await db
		.selectFrom('practical_submission')
		.select('id')
		.where('trainee_id', '=', traineeId)
		.where('course_slug', '=', courseSlug)
		.where('skill_id', '=', skillId)
		.where('status', '=', 'waiting')
		.executeTakeFirst();
	if (waiting) throw new SignOffError(409, 'Evidence for this skill is already waiting for a trainer. Withdraw it first to send new evidence.');
}

async function insertSubmission(
	input: EvidenceInput & { submittedBy: string; inPerson: boolean; files: ProcessedFile[] },
	checked: { note: string; readings: Reading[] },
	now: string,
	trx: DB
): Promise<string> {
	const id = randomUUID();
	try {
		await trx
			.insertInto('practical_submission')
			.values({
				id,
				trainee_id: input.traineeId,
				course_slug: input.courseSlug,
				skill_id: input.skillId,
				submitted_by: input.submittedBy,
				in_person: input.inPerson ? 1 : 0,
				note: checked.note,
				readings: JSON.stringify(checked.readings),
				status: 'waiting',
				submitted_at: now,
				closed_at: null
			})
			.execute();
	} catch (err) {
		if (isUniqueViolation(err)) throw new SignOffError(409, 'Evidence for this skill is already waiting for a trainer.');
		throw err;
	}
	let position = 0;
	for (const f of input.files) {
		await trx
			.insertInto('evidence_file')
			.values({
				id: randomUUID(),
				submission_id: id,
				position: position++,
				storage_key: f.storageKey,
				thumbnail_key: f.thumbnailKey,
				original_name: f.originalName,
				media_type: f.mediaType,
				size_bytes: f.sizeBytes,
				sha256: f.sha256,
				width_px: f.widthPx,
				height_px: f.heightPx,
				uploaded_by: input.submittedBy,
				created_at: now
			})
			.execute();
	}
	return id;
}

/**
 * Records a trainee's evidence for a skill. Files must already be stored (see uploads.ts); the
 * caller removes them again when this throws.
 */
export async function submitEvidence(input: EvidenceInput & { files: ProcessedFile[] }, db: DB = defaultDb): Promise<string> {
	const checked = checkEvidence(input);
	if (input.files.length === 0 && checked.note === '' && checked.readings.length === 0) {
		throw new SignOffError(400, 'Add at least one photo, a note or a reading.', { files: 'Add at least one photo, a note or a reading.' });
	}
	return inTransaction(db, async (trx) => {
		await assertMaySubmit(input.traineeId, input.courseSlug, input.skillId, trx);
		const now = new Date().toISOString();
		const id = await insertSubmission({ ...input, submittedBy: input.traineeId, inPerson: false }, checked, now, trx);
		await recordAudit(
			{
				actorId: input.traineeId,
				action: 'evidence.submit',
				subjectType: 'practical_submission',
				subjectId: id,
				detail: { courseSlug: input.courseSlug, skillId: input.skillId, files: input.files.map((f) => f.sha256) }
			},
			trx
		);
		return id;
	});
}

/** The trainee takes back evidence no trainer has assessed yet. Kept in the history as withdrawn. */
export async function withdrawEvidence(submissionId: string, traineeId: string, db: DB = defaultDb): Promise<void> {
	await inTransaction(db, async (trx) => {
		const row = await trx.selectFrom('practical_submission').select(['trainee_id', 'status', 'in_person']).where('id', '=', submissionId).executeTakeFirst();
		if (!row || row.trainee_id !== traineeId || row.in_person === 1) throw new SignOffError(404, 'No such evidence.');
		if (row.status !== 'waiting') throw new SignOffError(409, 'Only evidence still waiting for a trainer can be withdrawn.');
		const withdrawn = await trx
			.updateTable('practical_submission')
			.set({ status: 'withdrawn', closed_at: new Date().toISOString() })
			.where('id', '=', submissionId)
			.where('status', '=', 'waiting')
			.executeTakeFirst();
		if (Number(withdrawn.numUpdatedRows) !== 1) throw new SignOffError(409, 'Only evidence still waiting for a trainer can be withdrawn.');
		await recordAudit({ actorId: traineeId, action: 'evidence.withdraw', subjectType: 'practical_submission', subjectId: submissionId }, trx);
	});
}

// ---------------------------------------------------------------------------------------------
// Assessment
// ---------------------------------------------------------------------------------------------

const isoDate = /^\d{4}-\d{2}-\d{2}$/;
const oneLine = (max: number, label: string) =>
	z
		.string()
		.trim()
		// eslint-disable-next-line no-control-regex
		.refine((v) => !/[\u0000-\u001f\u007f]/.test(v), `${label} must be one line of plain text.`)
		.pipe(z.string().min(1, `${label} is required.`).max(max, `${label} must be at most ${max} characters.`));

export const assessmentSchema = z
	.object({
		criteria: z
			.array(
				z.object({
					result: z.enum(['met', 'not met', 'not observed'], { error: 'Choose met, not met or not observed.' }),
					remark: z.string().trim().max(500, 'Keep a remark under 500 characters.').default('')
				})
			)
			.min(1),
		outcome: z.enum(['signed off', 'returned'], { error: 'Choose sign off or return.' }),
		reasons: z.string().trim().max(2000, 'Keep the reasons under 2,000 characters.').default(''),
		place: oneLine(200, 'The place of the practical'),
		practicalDate: z
			.string()
			.regex(isoDate, 'Give the date as YYYY-MM-DD.')
			.refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), 'Give a real date.')
			.refine((d) => d <= new Date(Date.now() + 36 * 3600_000).toISOString().slice(0, 10), 'The practical cannot be in the future.'),
		signatureName: oneLine(120, 'Your name as signature')
	})
	.superRefine((a, ctx) => {
		if (a.outcome === 'signed off' && a.criteria.some((c) => c.result !== 'met')) {
			ctx.addIssue({ code: 'custom', path: ['outcome'], message: 'A skill can be signed off only when every criterion is met. Return it with reasons instead.' });
		}
		if (a.outcome === 'returned' && a.reasons === '') {
			ctx.addIssue({ code: 'custom', path: ['reasons'], message: 'Say why the evidence goes back, so the trainee knows what to practise.' });
		}
		a.criteria.forEach((c, i) => {
			if (c.result === 'not met' && c.remark === '' && a.reasons === '') {
				ctx.addIssue({ code: 'custom', path: ['criteria', i, 'remark'], message: 'Say what was missing for a criterion not met.' });
			}
		});
	});

export type AssessmentInput = z.input<typeof assessmentSchema>;

function parseAssessment(raw: unknown, criteria: string[]) {
	const parsed = assessmentSchema.safeParse(raw);
	if (!parsed.success) {
		const fields: Record<string, string> = {};
		for (const issue of parsed.error.issues) fields[issue.path.join('.')] ??= issue.message;
		throw new SignOffError(400, 'Please correct the marked fields.', fields);
	}
	if (parsed.data.criteria.length !== criteria.length) {
		throw new SignOffError(400, `Grade every criterion: this skill has ${criteria.length}.`, { criteria: `Grade all ${criteria.length} criteria.` });
	}
	return parsed.data;
}

export interface AssessmentResult {
	submissionId: string;
	outcome: 'signed off' | 'returned';
	signOffId: string | null;
	traineeId: string;
	courseSlug: string;
	skillId: string;
}

async function assertTrainerFor(trainerId: string, traineeId: string, db: DB): Promise<void> {
	if (trainerId === traineeId) throw new SignOffError(403, 'You cannot assess your own practical.');
	if (!(await trainerMaySee(trainerId, traineeId, db))) throw new SignOffError(404, 'No such evidence.');
}

async function recordAssessment(
	submission: { id: string; traineeId: string; courseSlug: string; skillId: string },
	criteriaText: string[],
	trainerId: string,
	input: ReturnType<typeof parseAssessment>,
	trx: DB
): Promise<AssessmentResult> {
	const now = new Date().toISOString();
	const assessmentId = randomUUID();
	const criteria: CriterionResult[] = input.criteria.map((c, i) => ({ criterion: criteriaText[i], result: c.result, remark: c.remark }));
	const updated = await trx
		.updateTable('practical_submission')
		.set({ status: input.outcome, closed_at: now })
		.where('id', '=', submission.id)
		.where('status', '=', 'waiting')
		.executeTakeFirst();
	if (Number(updated.numUpdatedRows) !== 1) throw new SignOffError(409, 'This evidence was withdrawn or assessed meanwhile.');
	await trx
		.insertInto('practical_assessment')
		.values({
			id: assessmentId,
			submission_id: submission.id,
			trainer_id: trainerId,
			outcome: input.outcome,
			criteria: JSON.stringify(criteria),
			reasons: input.reasons,
			place: input.place,
			practical_date: input.practicalDate,
			signature_name: input.signatureName,
			assessed_at: now
		})
		.execute();
	let signOffId: string | null = null;
	if (input.outcome === 'signed off') {
		signOffId = randomUUID();
		try {
			await trx
				.insertInto('sign_off')
				.values({
					id: signOffId,
					user_id: submission.traineeId,
					course_slug: submission.courseSlug,
					skill_id: submission.skillId,
					assessment_id: assessmentId,
					trainer_id: trainerId,
					signed_off_at: now,
					voided_at: null,
					voided_by: null,
					void_reason: null
				})
				.execute();
		} catch (err) {
			if (isUniqueViolation(err)) throw new SignOffError(409, 'This skill is already signed off for this person.');
			throw err;
		}
	}
	await recordAudit(
		{
			actorId: trainerId,
			action: input.outcome === 'signed off' ? 'practical.sign_off' : 'practical.return',
			subjectType: 'practical_submission',
			subjectId: submission.id,
			detail: {
				traineeId: submission.traineeId,
				courseSlug: submission.courseSlug,
				skillId: submission.skillId,
				signOffId,
				criteria: criteria.map((c) => c.result),
				place: input.place,
				practicalDate: input.practicalDate,
				signatureName: input.signatureName
			}
		},
		trx
	);
	// the last sign-off can complete the course: the certificate comes in the same transaction
	if (signOffId) await issueIfEarned(submission.traineeId, submission.courseSlug, { db: trx, actorId: trainerId });
	return { submissionId: submission.id, outcome: input.outcome, signOffId, ...submission };
}

/** A trainer grades waiting evidence. Out-of-scope trainees and unknown ids are a 404. */
export async function assessSubmission(submissionId: string, trainerId: string, raw: unknown, db: DB = defaultDb): Promise<AssessmentResult> {
	return inTransaction(db, async (trx) => {
		const row = await trx
			.selectFrom('practical_submission')
			.select(['id', 'trainee_id', 'course_slug', 'skill_id', 'status'])
			.where('id', '=', submissionId)
			.executeTakeFirst();
		if (!row) throw new SignOffError(404, 'No such evidence.');
		await assertTrainerFor(trainerId, row.trainee_id, trx);
		const { skill } = requireSkill(row.course_slug, row.skill_id);
		const input = parseAssessment(raw, skill.criteria);
		if (row.status !== 'waiting') throw new SignOffError(409, 'This evidence has already been assessed or withdrawn.');
		return recordAssessment({ id: row.id, traineeId: row.trainee_id, courseSlug: row.course_slug, skillId: row.skill_id }, skill.criteria, trainerId, input, trx);
	});
}

/** Checks before an in-person assessment stores any photo. */
export async function assertMayAssessInPerson(trainerId: string, traineeId: string, courseSlug: string, skillId: string, db: DB = defaultDb): Promise<void> {
	requireSkill(courseSlug, skillId);
	const trainee = await db.selectFrom('User').select('id').where('id', '=', traineeId).executeTakeFirst();
	if (!trainee) throw new SignOffError(404, 'No such person.');
	await assertTrainerFor(trainerId, traineeId, db);
	await assertMaySubmit(traineeId, courseSlug, skillId, db);
}

/**
 * An assessment on the training day without prior evidence: the trainer records the readings,
 * photos and grades in one go. Evidence already waiting must be assessed instead.
 */
export async function assessInPerson(
	input: EvidenceInput & { trainerId: string; files: ProcessedFile[] },
	raw: unknown,
	db: DB = defaultDb
): Promise<AssessmentResult> {
	const checked = checkEvidence(input);
	const { skill } = requireSkill(input.courseSlug, input.skillId);
	const assessment = parseAssessment(raw, skill.criteria);
	return inTransaction(db, async (trx) => {
		await assertMayAssessInPerson(input.trainerId, input.traineeId, input.courseSlug, input.skillId, trx);
		const now = new Date().toISOString();
		const id = await insertSubmission({ ...input, submittedBy: input.trainerId, inPerson: true }, checked, now, trx);
		await recordAudit(
			{ actorId: input.trainerId, action: 'evidence.in_person', subjectType: 'practical_submission', subjectId: id, detail: { traineeId: input.traineeId, courseSlug: input.courseSlug, skillId: input.skillId } },
			trx
		);
		return recordAssessment({ id, traineeId: input.traineeId, courseSlug: input.courseSlug, skillId: input.skillId }, skill.criteria, input.trainerId, assessment, trx);
	});
}

export const voidReasonSchema = z.string().trim().min(5, 'Give the reason for voiding (at least 5 characters).').max(1000, 'Keep the reason under 1,000 characters.');

/** A registrar voids a sign-off: it stays, marked voided, and the skill is open again. */
export async function voidSignOff(signOffId: string, registrarId: string, reason: string, db: DB = defaultDb): Promise<void> {
	const parsed = voidReasonSchema.safeParse(reason);
	if (!parsed.success) throw new SignOffError(400, parsed.error.issues[0].message, { reason: parsed.error.issues[0].message });
	await inTransaction(db, async (trx) => {
		const row = await trx.selectFrom('sign_off').select(['id', 'user_id', 'course_slug', 'skill_id', 'voided_at']).where('id', '=', signOffId).executeTakeFirst();
		if (!row) throw new SignOffError(404, 'No such sign-off.');
		if (row.voided_at) throw new SignOffError(409, 'This sign-off is already voided.');
		const voided = await trx
			.updateTable('sign_off')
			.set({ voided_at: new Date().toISOString(), voided_by: registrarId, void_reason: parsed.data })
			.where('id', '=', signOffId)
			.where('voided_at', 'is', null)
			.executeTakeFirst();
		if (Number(voided.numUpdatedRows) !== 1) throw new SignOffError(409, 'This sign-off is already voided.');
		await recordAudit(
			{ actorId: registrarId, action: 'practical.void', subjectType: 'sign_off', subjectId: signOffId, detail: { userId: row.user_id, courseSlug: row.course_slug, skillId: row.skill_id, reason: parsed.data } },
			trx
		);
	});
}

// ---------------------------------------------------------------------------------------------
// Trainer queue, company counts, file access
// ---------------------------------------------------------------------------------------------

export const queueFilterSchema = z.object({
	course: z.string().max(100).optional().catch(undefined),
	company: z.string().max(100).optional().catch(undefined),
	/** Only evidence waiting at least this many days. */
	olderThanDays: z.coerce.number().int().min(0).max(365).optional().catch(undefined)
});
export type QueueFilter = z.infer<typeof queueFilterSchema>;

export interface QueueEntry {
	submissionId: string;
	traineeId: string;
	traineeName: string;
	traineeEmail: string;
	companies: string;
	courseSlug: string;
	courseTitle: string;
	skillId: string;
	skillTitle: string;
	submittedAt: string;
	fileCount: number;
}

function queueQuery(trainerId: string, scope: TrainerScope, filter: QueueFilter, db: DB) {
	let query = db
		.selectFrom('practical_submission as s')
		.innerJoin('User as u', 'u.id', 's.trainee_id')
		.where('s.status', '=', 'waiting')
		.where('s.trainee_id', '!=', trainerId)
		.where(inTrainerScope(scope, 's.trainee_id'));
	if (filter.course) query = query.where('s.course_slug', '=', filter.course);
	if (filter.company) query = query.where('s.trainee_id', 'in', db.selectFrom('membership').select('user_id').where('company_id', '=', filter.company));
	if (filter.olderThanDays) query = query.where('s.submitted_at', '<=', new Date(Date.now() - filter.olderThanDays * 86_400_000).toISOString());
	return query;
}

/** Evidence waiting for this trainer, oldest first, within the trainer's scope and never their own. */
export async function assessmentQueue(trainerId: string, filter: QueueFilter = {}, db: DB = defaultDb): Promise<QueueEntry[]> {
	const rows = await queueQuery(trainerId, await trainerScope(trainerId, db), filter, db)
		.select((eb) => [
			's.id',
			's.trainee_id',
			'u.name',
			'u.email',
			's.course_slug',
			's.skill_id',
			's.submitted_at',
			eb.selectFrom('evidence_file').select((e) => e.fn.countAll<number>().as('n')).whereRef('evidence_file.submission_id', '=', 's.id').as('file_count')
		])
		.orderBy('s.submitted_at')
		.limit(500)
		.execute();
	const memberships = rows.length
		? await db
				.selectFrom('membership')
				.innerJoin('company', 'company.id', 'membership.company_id')
				.select(['membership.user_id', 'company.name'])
				.where('membership.user_id', 'in', [...new Set(rows.map((r) => r.trainee_id))])
				.execute()
		: [];
	return rows.map((r) => {
		const found = findSkill(r.course_slug, r.skill_id);
		return {
			submissionId: r.id,
			traineeId: r.trainee_id,
			traineeName: r.name ?? r.email,
			traineeEmail: r.email,
			companies: memberships.filter((m) => m.user_id === r.trainee_id).map((m) => m.name).join(', '),
			courseSlug: r.course_slug,
			courseTitle: found?.course.title ?? r.course_slug,
			skillId: r.skill_id,
			skillTitle: found?.skill.title ?? r.skill_id,
			submittedAt: r.submitted_at,
			fileCount: Number(r.file_count ?? 0)
		};
	});
}

export async function queueCount(trainerId: string, db: DB = defaultDb): Promise<number> {
	const row = await queueQuery(trainerId, await trainerScope(trainerId, db), {}, db).select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirst();
	return Number(row?.n ?? 0);
}

/** The companies a trainer's queue can be filtered by. */
export async function queueCompanies(trainerId: string, db: DB = defaultDb) {
	const scope = await trainerScope(trainerId, db);
	if (scope.kind === 'nobody') return [];
	let query = db.selectFrom('company').select(['id', 'name']).orderBy('name');
	if (scope.kind === 'companies') query = query.where('id', 'in', scope.companyIds);
	return query.execute();
}

/** The people a trainer may assess in person (never themselves), for the picker. */
export async function assessablePeople(trainerId: string, db: DB = defaultDb) {
	const scope = await trainerScope(trainerId, db);
	return db
		.selectFrom('User')
		.select(['id', 'name', 'email'])
		.where('id', '!=', trainerId)
		.where(inTrainerScope(scope, 'User.id'))
		.orderBy('name')
		.limit(1000)
		.execute();
}

export interface CrewSignOffCount {
	userId: string;
	courseSlug: string;
	signedOff: number;
	total: number;
}

/** For a company admin: per crew member and enrolled course, how many skills are signed off. */
export async function crewSignOffCounts(companyId: string, db: DB = defaultDb): Promise<CrewSignOffCount[]> {
	const enrolments = await db
		.selectFrom('membership')
		.innerJoin('enrolment', 'enrolment.user_id', 'membership.user_id')
		.select(['membership.user_id', 'enrolment.course_slug'])
		.where('membership.company_id', '=', companyId)
		.execute();
	if (enrolments.length === 0) return [];
	const counts = await db
		.selectFrom('sign_off')
		.select((eb) => ['user_id', 'course_slug', eb.fn.countAll<number>().as('n')])
		.where('voided_at', 'is', null)
		.where('user_id', 'in', [...new Set(enrolments.map((e) => e.user_id))])
		.groupBy(['user_id', 'course_slug'])
		.execute();
	return enrolments.map((e) => ({
		userId: e.user_id,
		courseSlug: e.course_slug,
		signedOff: Number(counts.find((c) => c.user_id === e.user_id && c.course_slug === e.course_slug)?.n ?? 0),
		total: getCourse(e.course_slug)?.practicalSkills.length ?? 0
	}));
}

export interface Viewer {
	id: string;
	roles: string[];
	companies: { id: string; role: string }[];
}

/**
 * Whether the viewer may see a trainee's evidence: the trainee, the registrar, trainers in
 * whose scope the trainee is, and the admins of the trainee's company.
 */
export async function mayViewEvidenceOf(viewer: Viewer, traineeId: string, db: DB = defaultDb): Promise<boolean> {
	if (viewer.id === traineeId || viewer.roles.includes('registrar')) return true;
	if (viewer.roles.includes('trainer') && (await trainerMaySee(viewer.id, traineeId, db))) return true;
	const adminOf = viewer.companies.filter((c) => c.role === 'admin').map((c) => c.id);
	if (adminOf.length === 0) return false;
	const row = await db.selectFrom('membership').select('user_id').where('user_id', '=', traineeId).where('company_id', 'in', adminOf).executeTakeFirst();
	return !!row;
}

/** A stored evidence file for a viewer who may see it, else null (the route answers 404 either way). */
export async function evidenceFileFor(fileId: string, viewer: Viewer, db: DB = defaultDb) {
	const row = await db
		.selectFrom('evidence_file')
		.innerJoin('practical_submission', 'practical_submission.id', 'evidence_file.submission_id')
		.select([
			'evidence_file.storage_key',
			'evidence_file.thumbnail_key',
			'evidence_file.media_type',
			'evidence_file.original_name',
			'evidence_file.size_bytes',
			'practical_submission.trainee_id'
		])
		.where('evidence_file.id', '=', fileId)
		.executeTakeFirst();
	if (!row || !(await mayViewEvidenceOf(viewer, row.trainee_id, db))) return null;
	return {
		storageKey: row.storage_key,
		thumbnailKey: row.thumbnail_key,
		mediaType: row.media_type,
		originalName: row.original_name,
		sizeBytes: row.size_bytes
	};
}

/** For a registrar: a person's sign-offs in every course, voided ones included. */
export async function signOffsOfPerson(userId: string, db: DB = defaultDb): Promise<(SignOffRecord & { courseSlug: string })[]> {
	const rows = await db
		.selectFrom('sign_off')
		.innerJoin('practical_assessment', 'practical_assessment.id', 'sign_off.assessment_id')
		.select([
			'sign_off.id',
			'sign_off.course_slug',
			'sign_off.skill_id',
			'sign_off.signed_off_at',
			'sign_off.trainer_id',
			'practical_assessment.signature_name',
			'sign_off.voided_at',
			'sign_off.void_reason'
		])
		.where('sign_off.user_id', '=', userId)
		.orderBy('sign_off.signed_off_at', 'desc')
		.execute();
	return rows.map((r) => ({
		id: r.id,
		courseSlug: r.course_slug,
		skillId: r.skill_id,
		signedOffAt: r.signed_off_at,
		trainerId: r.trainer_id,
		trainerName: r.signature_name,
		voidedAt: r.voided_at,
		voidReason: r.void_reason
	}));
}

/**
 * Tells the trainee by e-mail that a skill was signed off or sent back. Sent after the
 * transaction; a mail failure is logged, never undoes the assessment.
 */
export async function mailAssessment(result: AssessmentResult, origin: string, db: DB = defaultDb): Promise<void> {
	const trainee = await db.selectFrom('User').select(['email', 'name']).where('id', '=', result.traineeId).executeTakeFirst();
	const found = findSkill(result.courseSlug, result.skillId);
	const assessment = await db.selectFrom('practical_assessment').select(['signature_name', 'reasons', 'place', 'practical_date']).where('submission_id', '=', result.submissionId).executeTakeFirst();
	if (!trainee || !found || !assessment) return;
	const signed = result.outcome === 'signed off';
	const paragraphs = signed
		? [
				`Hello ${trainee.name ?? ''},`.replace(' ,', ','),
				`${assessment.signature_name} signed off your practical skill "${found.skill.title}" in ${found.course.title}, assessed at ${assessment.place} on ${assessment.practical_date}.`
			]
		: [
				`Hello ${trainee.name ?? ''},`.replace(' ,', ','),
				`${assessment.signature_name} sent your evidence for "${found.skill.title}" in ${found.course.title} back to you. The reasons:`,
				assessment.reasons,
				'Practise the points named, then send new evidence from the same page.'
			];
	try {
		const { sendMail } = await import('./mail');
		await sendMail({
			to: trainee.email,
			subject: signed ? `Signed off: ${found.skill.title}` : `Sent back: ${found.skill.title}`,
			paragraphs,
			action: { label: 'Open the skill', url: `${origin}/courses/${result.courseSlug}/practicals/${result.skillId}` }
		});
	} catch (err) {
		console.error('Assessment e-mail failed', err);
	}
}
