/**
 * Course test attempts: start (or resume), autosave answers, submit, grade, review.
 *
 * Contracts:
 * - Only an enrolled person may start; one open attempt per person and course, which resumes
 *   rather than re-draws; attemptsAllowed and waitHours from the course definition apply,
 *   and a passed test is not retaken.
 * - Items are drawn on the server; the runner view carries no answers and no seeds.
 * - Answers are refused once the attempt is submitted or past its deadline (plus
 *   LATE_GRACE_MS for a request already in flight). An attempt past its deadline is closed
 *   and graded with the answers saved in time by the next state-changing call (start, save,
 *   submit, lifting a wait) or by `closeDueAttempts`; reads (page loads, GETs) show it as
 *   closed, graded in memory, and change nothing.
 * - Every state change is one transaction whose write is guarded by `submitted_at is null`:
 *   an answer is one upserted row per item (two saves never overwrite each other), and an
 *   attempt closes exactly once, with its per-item results in their own rows.
 * - Submitting twice changes nothing; grading happens here only.
 * - Every function that takes a person's id answers only for that person's attempts: another
 *   person's attempt is "not found".
 * - `now` is a parameter so that tests can move the clock (deadlines, waiting time).
 */
import { isUniqueViolation } from './db/errors';
import { lockingRows } from './db/engine';
import type { Selectable } from 'kysely';
import { getCourse, type Course } from '$lib/content';
import { lessonForGenerator } from '$lib/practice/course-lessons';
import { randomSeed } from '$lib/practice/random';
import {
	answerSchema,
	drawTest,
	gradeItem,
	reviewItem,
	runnerItem,
	type DrawnItem,
	type ItemAnswer,
	type ItemGrade,
	type ReviewItem,
	type RunnerView
} from '$lib/practice/test-items';
import { recordAudit } from './audit';
import { issueIfEarned } from './certificates';
import { countsSince } from './renewal-open';
import { db as defaultDb, inTransaction, type DB } from './db';
import type { TestAttemptTable } from './db/schema';
import { isEnrolled } from './enrolments';
import { fieldErrors } from './form';
import { questionsFor } from './question-bank';
import { inTrainerScope, trainerMaySee, trainerScope } from './trainer-scope';

export type { RunnerView } from '$lib/practice/test-items';

/** A save or submit that left the browser just before the deadline is still accepted. */
export const LATE_GRACE_MS = 5_000;

const HOUR_MS = 3_600_000;

interface Options {
	db?: DB;
	now?: Date;
}

type Row = Selectable<TestAttemptTable>;
type Answers = Record<number, ItemAnswer>;

export type Refusal = { ok: false; status: 400 | 403 | 404 | 409; reason: string; message: string; errors?: Record<string, string>; summary?: AttemptSummary; availableAt?: string };

export interface TestRules {
	itemCount: number;
	fixedItems: number;
	computedItems: number;
	timeLimitMinutes: number | null;
	attemptsAllowed: number;
	waitHours: number;
	passMark: number;
}

export interface AttemptSummary {
	id: string;
	courseSlug: string;
	startedAt: string;
	deadlineAt: string | null;
	submittedAt: string | null;
	closedBy: 'person' | 'time limit' | null;
	itemCount: number;
	correctCount: number | null;
	scorePercent: number | null;
	passMark: number;
	passed: boolean | null;
}

export interface AttemptReview extends AttemptSummary {
	course: { slug: string; title: string };
	items: ReviewItem[];
}

export function rulesOf(course: Course): TestRules {
	const t = course.test;
	return {
		itemCount: t.fixedItems + t.computedItems,
		fixedItems: t.fixedItems,
		computedItems: t.computedItems,
		timeLimitMinutes: t.timeLimitMinutes,
		attemptsAllowed: t.attemptsAllowed,
		waitHours: t.waitHours,
		passMark: course.passMark
	};
}

export function summarise(row: Row): AttemptSummary {
	return {
		id: row.id,
		courseSlug: row.course_slug,
		startedAt: row.started_at,
		deadlineAt: row.deadline_at,
		submittedAt: row.submitted_at,
		closedBy: row.closed_by,
		itemCount: row.item_count,
		correctCount: row.correct_count,
		scorePercent: row.score_percent,
		passMark: row.pass_mark,
		passed: row.passed === null ? null : row.passed === 1
	};
}

const items = (row: Row): DrawnItem[] => JSON.parse(row.items);

/** The answers saved to an attempt, by position. A stored answer that is not JSON counts as none. */
async function answersOf(db: DB, attemptId: string): Promise<Answers> {
	const rows = await db.selectFrom('test_answer').select(['position', 'answer']).where('attempt_id', '=', attemptId).execute();
	const answers: Answers = {};
	for (const r of rows) {
		try {
			answers[r.position] = JSON.parse(r.answer);
		} catch {
			// Unreadable: ungraded as unanswered rather than blocking the attempt.
		}
	}
	return answers;
}

async function resultsOf(db: DB, attemptId: string): Promise<ItemGrade[]> {
	const rows = await db.selectFrom('test_item_result').select(['position', 'correct', 'answered', 'hint']).where('attempt_id', '=', attemptId).orderBy('position').execute();
	return rows.map((r) => ({ correct: r.correct === 1, answered: r.answered === 1, ...(r.hint ? { hint: r.hint } : {}) }));
}

function isPastDeadline(row: Row, now: Date): boolean {
	return row.deadline_at !== null && now.getTime() > Date.parse(row.deadline_at) + LATE_GRACE_MS;
}

/**
 * `forChange`: the row stays locked until the transaction ends (PostgreSQL; SQLite's write
 * transaction holds the whole database), so saves and the close of one attempt take turns and a
 * close grades every answer whose save was acknowledged.
 */
async function ownAttempt(db: DB, userId: string, attemptId: string, forChange = false): Promise<Row | undefined> {
	const query = db.selectFrom('test_attempt').selectAll().where('id', '=', attemptId).where('user_id', '=', userId);
	return (forChange ? lockingRows(db, query) : query).executeTakeFirst();
}

// ---------------------------------------------------------------- grading

interface Graded {
	row: Row;
	results: ItemGrade[];
}

/** Pure: the attempt as it is once closed with these answers. */
function graded(row: Row, answers: Answers, closedBy: 'person' | 'time limit', at: Date): Graded {
	const drawn = items(row);
	const results: ItemGrade[] = drawn.map((item, i) => gradeItem(item, answers[i]));
	const correct = results.filter((r) => r.correct).length;
	const score = drawn.length === 0 ? 0 : (correct * 100) / drawn.length;
	const submittedAt = closedBy === 'time limit' && row.deadline_at ? row.deadline_at : at.toISOString();
	return {
		row: { ...row, submitted_at: submittedAt, closed_by: closedBy, correct_count: correct, score_percent: score, passed: score >= row.pass_mark ? 1 : 0 },
		results
	};
}

/**
 * Grades and closes an open attempt, once: the update is guarded by `submitted_at is null`, and
 * only the call that closed it writes the results and the audit entry. Returns the row as it
 * ends up. Runs in the caller's transaction, or its own.
 */
async function close(db: DB, row: Row, closedBy: 'person' | 'time limit', at: Date, actorId: string | null): Promise<Row> {
	return inTransaction(db, async (trx) => {
		// Answers are read under the attempt's row lock: no save can land between grading and closing.
		const current = await lockingRows(trx, trx.selectFrom('test_attempt').select('submitted_at').where('id', '=', row.id)).executeTakeFirst();
		if (!current || current.submitted_at !== null) return (await trx.selectFrom('test_attempt').selectAll().where('id', '=', row.id).executeTakeFirstOrThrow()) as Row;
		const done = graded(row, await answersOf(trx, row.id), closedBy, at);
		const { submitted_at, closed_by, correct_count, score_percent, passed } = done.row;
		const update = await trx
			.updateTable('test_attempt')
			.set({ submitted_at, closed_by, correct_count, score_percent, passed })
			.where('id', '=', row.id)
			.where('submitted_at', 'is', null)
			.executeTakeFirst();
		if (Number(update.numUpdatedRows) > 0) {
			if (done.results.length > 0) {
				await trx
					.insertInto('test_item_result')
					.values(done.results.map((r, position) => ({ attempt_id: row.id, position, correct: r.correct ? 1 : 0, answered: r.answered ? 1 : 0, hint: r.hint ?? null })))
					.execute();
			}
			await recordAudit(
				{
					actorId,
					action: 'test.submit',
					subjectType: 'test_attempt',
					subjectId: row.id,
					detail: { userId: row.user_id, courseSlug: row.course_slug, scorePercent: Math.round(score_percent! * 10) / 10, passed: passed === 1, closedBy }
				},
				trx
			);
			// passing can be the last requirement met: the certificate comes in the same transaction
			if (passed === 1) await issueIfEarned(row.user_id, row.course_slug, { db: trx, now: at, actorId });
		}
		return (await trx.selectFrom('test_attempt').selectAll().where('id', '=', row.id).executeTakeFirstOrThrow()) as Row;
	});
}

/** Closes any of the person's open attempts that ran past their deadline. For state-changing calls only. */
async function closeExpired(db: DB, userId: string, now: Date, courseSlug?: string): Promise<void> {
	let query = db.selectFrom('test_attempt').selectAll().where('user_id', '=', userId).where('submitted_at', 'is', null).where('deadline_at', 'is not', null);
	if (courseSlug) query = query.where('course_slug', '=', courseSlug);
	for (const row of await query.execute()) {
		if (isPastDeadline(row, now)) await close(db, row, 'time limit', now, null);
	}
}

/**
 * Closes every attempt past its deadline, for a scheduled sweep; returns how many it closed.
 * Each closes in its own transaction.
 */
export async function closeDueAttempts({ db = defaultDb, now = new Date() }: Options = {}): Promise<number> {
	const open = await db.selectFrom('test_attempt').selectAll().where('submitted_at', 'is', null).where('deadline_at', 'is not', null).execute();
	let closed = 0;
	for (const row of open) {
		if (!isPastDeadline(row, now)) continue;
		const after = await close(db, row, 'time limit', now, null);
		if (after.closed_by === 'time limit' && after.submitted_at === row.deadline_at) closed++;
	}
	return closed;
}

/**
 * For reads: the attempt as it stands at `now`, an open one past its deadline graded in memory
 * (exactly as `close` will store it) and nothing written.
 */
async function settled(db: DB, row: Row, now: Date): Promise<Graded | { row: Row; results: null }> {
	if (row.submitted_at === null && isPastDeadline(row, now)) return graded(row, await answersOf(db, row.id), 'time limit', now);
	return { row, results: null };
}

// ---------------------------------------------------------------- rules

/** The person's attempts that count: during a renewal the test is taken afresh, so only those since it started. */
async function countingAttempts(userId: string, courseSlug: string, db: DB): Promise<Row[]> {
	const since = await countsSince(userId, courseSlug, db);
	return (await db
		.selectFrom('test_attempt')
		.selectAll()
		.where('user_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.$if(since !== null, (q) => q.where('started_at', '>=', since!))
		.execute()) as Row[];
}

export interface TestStatus {
	course: { slug: string; title: string; code: string };
	rules: TestRules;
	enrolled: boolean;
	/** Newest first. */
	attempts: AttemptSummary[];
	open: AttemptSummary | null;
	attemptsUsed: number;
	attemptsLeft: number;
	passed: boolean;
	/** Set while the waiting time after a failed attempt runs. */
	nextStartAt: string | null;
	/** Why a new attempt cannot start now (an open one can always be resumed). */
	blocked: { reason: 'not-enrolled' | 'passed' | 'no-attempts-left' | 'waiting'; message: string } | null;
}

function evaluate(course: Course, rows: Row[], enrolled: boolean, now: Date): Omit<TestStatus, 'course' | 'rules' | 'enrolled'> {
	const rules = rulesOf(course);
	const newestFirst = [...rows].sort((a, b) => b.started_at.localeCompare(a.started_at));
	const closed = newestFirst.filter((r) => r.submitted_at !== null);
	const open = newestFirst.find((r) => r.submitted_at === null);
	const passedRow = closed.find((r) => r.passed === 1);
	const attemptsLeft = Math.max(0, rules.attemptsAllowed - closed.length);
	const last = closed[0];
	const waitEnds = last && last.wait_waived_at === null ? Date.parse(last.submitted_at!) + rules.waitHours * HOUR_MS : 0;
	const waiting = !passedRow && attemptsLeft > 0 && waitEnds > now.getTime();
	let blocked: TestStatus['blocked'] = null;
	if (!enrolled) blocked = { reason: 'not-enrolled', message: 'You need a place on this course to take its test.' };
	else if (passedRow) blocked = { reason: 'passed', message: 'You have passed this test.' };
	else if (attemptsLeft === 0) blocked = { reason: 'no-attempts-left', message: `All ${rules.attemptsAllowed} attempts are used. Ask your trainer or the registrar what comes next.` };
	else if (waiting) blocked = { reason: 'waiting', message: `After an attempt, the next may start ${rules.waitHours} hours later. Use the time to go over the lessons and practise.` };
	return {
		attempts: newestFirst.map(summarise),
		open: open ? summarise(open) : null,
		attemptsUsed: closed.length,
		attemptsLeft,
		passed: !!passedRow,
		nextStartAt: waiting ? new Date(waitEnds).toISOString() : null,
		blocked
	};
}

/** Where a person stands with a course test. Null for an unknown course. Reads only. */
export async function testStatus(userId: string, courseSlug: string, { db = defaultDb, now = new Date() }: Options = {}): Promise<TestStatus | null> {
	const course = getCourse(courseSlug);
	if (!course) return null;
	const stored = await countingAttempts(userId, courseSlug, db);
	const rows = await Promise.all(stored.map(async (r) => (await settled(db, r, now)).row));
	const enrolled = await isEnrolled(userId, courseSlug, db);
	return {
		course: { slug: course.slug, title: course.title, code: course.code },
		rules: rulesOf(course),
		enrolled,
		...evaluate(course, rows, enrolled, now)
	};
}

// ---------------------------------------------------------------- the runner

function runnerView(row: Row, answers: Answers, course: Course, now: Date): RunnerView {
	return {
		status: 'open',
		id: row.id,
		course: { slug: course.slug, title: course.title },
		startedAt: row.started_at,
		deadlineAt: row.deadline_at,
		serverNow: now.toISOString(),
		items: items(row).map((item, i) => runnerItem(item, i)),
		answers
	};
}

/**
 * Starts a test attempt, or resumes the open one. `seed` fixes the draw in tests; otherwise
 * it comes from the crypto source.
 */
export async function startAttempt(
	userId: string,
	courseSlug: string,
	{ db = defaultDb, now = new Date(), seed }: Options & { seed?: number } = {}
): Promise<{ ok: true; resumed: boolean; attempt: RunnerView } | Refusal> {
	const course = getCourse(courseSlug);
	if (!course) return { ok: false, status: 404, reason: 'not-found', message: 'No such course.' };
	if (!(await isEnrolled(userId, courseSlug, db))) {
		return { ok: false, status: 403, reason: 'not-enrolled', message: 'You need a place on this course to take its test.' };
	}
	const attempt = async (): Promise<{ ok: true; resumed: boolean; attempt: RunnerView } | Refusal> =>
		inTransaction(db, async (trx) => {
			await closeExpired(trx, userId, now, courseSlug);
			const rows = await countingAttempts(userId, courseSlug, trx);
			const open = rows.find((r) => r.submitted_at === null);
			if (open) return { ok: true, resumed: true, attempt: runnerView(open, await answersOf(trx, open.id), course, now) };
			const status = evaluate(course, rows, true, now);
			if (status.blocked) {
				return { ok: false, status: 409, reason: status.blocked.reason, message: status.blocked.message, ...(status.nextStartAt ? { availableAt: status.nextStartAt } : {}) };
			}
			const drawSeed = seed ?? randomSeed();
			const drawn = drawTest(
				{ lessons: course.lessons.map((l) => l.slug), ...course.test },
				questionsFor(courseSlug),
				drawSeed,
				(g) => lessonForGenerator(courseSlug, g)
			);
			const limit = course.test.timeLimitMinutes;
			const row = {
				id: crypto.randomUUID(),
				user_id: userId,
				course_slug: courseSlug,
				started_at: now.toISOString(),
				deadline_at: limit === null ? null : new Date(now.getTime() + limit * 60_000).toISOString(),
				submitted_at: null,
				closed_by: null,
				draw_seed: drawSeed,
				items: JSON.stringify(drawn),
				answers: '{}',
				item_count: drawn.length,
				pass_mark: course.passMark,
				correct_count: null,
				score_percent: null,
				passed: null,
				results: null,
				wait_waived_at: null,
				wait_waived_by: null
			} satisfies Row;
			await trx.insertInto('test_attempt').values(row).execute();
			await recordAudit({ actorId: userId, action: 'test.start', subjectType: 'test_attempt', subjectId: row.id, detail: { courseSlug, attempt: status.attemptsUsed + 1 } }, trx);
			return { ok: true, resumed: false, attempt: runnerView(row, {}, course, now) };
		});
	try {
		return await attempt();
	} catch (e) {
		// Two starts at once: the database let one through; the other resumes it.
		if (isUniqueViolation(e)) return attempt();
		throw e;
	}
}

/** The runner's view of an open attempt, or its summary once closed (or due). Null when not the person's. Reads only. */
export async function getAttempt(
	userId: string,
	attemptId: string,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<RunnerView | { status: 'submitted'; summary: AttemptSummary } | null> {
	const stored = await ownAttempt(db, userId, attemptId);
	if (!stored) return null;
	const { row } = await settled(db, stored, now);
	if (row.submitted_at !== null) return { status: 'submitted', summary: summarise(row) };
	const course = getCourse(row.course_slug);
	if (!course) return null;
	return runnerView(row, await answersOf(db, row.id), course, now);
}

/** Autosaves one answer. Refused after submission and after the deadline. */
export async function saveAnswer(
	userId: string,
	attemptId: string,
	position: number,
	raw: unknown,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<{ ok: true; savedAt: string } | Refusal> {
	return inTransaction(db, async (trx) => {
		const row = await ownAttempt(trx, userId, attemptId, true);
		if (!row) return { ok: false, status: 404, reason: 'not-found', message: 'No such attempt.' };
		if (row.submitted_at !== null) return { ok: false, status: 409, reason: 'submitted', message: 'This attempt is already submitted; answers can no longer change.' };
		if (isPastDeadline(row, now)) {
			const closed = await close(trx, row, 'time limit', now, null);
			return { ok: false, status: 409, reason: 'time-up', message: 'Time is up: this answer came after the time limit and was not saved.', summary: summarise(closed) };
		}
		const drawn = items(row);
		if (!Number.isInteger(position) || position < 0 || position >= drawn.length) {
			return { ok: false, status: 404, reason: 'no-such-item', message: 'No item at that position.' };
		}
		const parsed = answerSchema(runnerItem(drawn[position], position)).safeParse(raw);
		if (!parsed.success) return { ok: false, status: 400, reason: 'bad-answer', message: 'The answer does not fit this item.', errors: fieldErrors(parsed.error) };
		const savedAt = now.toISOString();
		const answer = JSON.stringify(parsed.data);
		// One row per item, written only while the attempt is open (the guard is in the same statement).
		const write = await trx
			.insertInto('test_answer')
			.columns(['attempt_id', 'position', 'answer', 'saved_at'])
			.expression((eb) =>
				eb
					.selectFrom('test_attempt')
					.select([eb.val(row.id).as('attempt_id'), eb.val(position).as('position'), eb.val(answer).as('answer'), eb.val(savedAt).as('saved_at')])
					.where('id', '=', row.id)
					.where('submitted_at', 'is', null)
			)
			.onConflict((oc) => oc.columns(['attempt_id', 'position']).doUpdateSet((eb) => ({ answer: eb.ref('excluded.answer'), saved_at: eb.ref('excluded.saved_at') })))
			.executeTakeFirst();
		if (Number(write.numInsertedOrUpdatedRows ?? 0) === 0) {
			return { ok: false, status: 409, reason: 'submitted', message: 'This attempt is already submitted; answers can no longer change.' };
		}
		return { ok: true, savedAt };
	});
}

/** Submits and grades. A second submit, or one after the deadline, is refused and changes nothing. */
export async function submitAttempt(
	userId: string,
	attemptId: string,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<{ ok: true; summary: AttemptSummary } | Refusal> {
	return inTransaction(db, async (trx) => {
		const row = await ownAttempt(trx, userId, attemptId, true);
		if (!row) return { ok: false, status: 404, reason: 'not-found', message: 'No such attempt.' };
		if (row.submitted_at !== null) {
			return { ok: false, status: 409, reason: 'already-submitted', message: 'This attempt was already submitted.', summary: summarise(row) };
		}
		if (isPastDeadline(row, now)) {
			const closed = await close(trx, row, 'time limit', now, null);
			return { ok: false, status: 409, reason: 'time-up', message: 'Time ran out before this submit: the attempt was graded with the answers saved in time.', summary: summarise(closed) };
		}
		return { ok: true, summary: summarise(await close(trx, row, 'person', now, userId)) };
	});
}

// ---------------------------------------------------------------- review

async function review(db: DB, stored: Row, now: Date): Promise<AttemptReview | null> {
	const course = getCourse(stored.course_slug);
	const settledNow = await settled(db, stored, now);
	const row = settledNow.row;
	if (!course || row.submitted_at === null) return null;
	const drawn = items(row);
	const answers = await answersOf(db, row.id);
	const results = settledNow.results ?? (await resultsOf(db, row.id));
	if (results.length !== drawn.length) return null;
	return {
		...summarise(row),
		course: { slug: course.slug, title: course.title },
		items: drawn.map((item, i) => reviewItem(item, i, answers[i], results[i]))
	};
}

/** The person's own graded attempt with answers and worked solutions; null before submission or when not theirs. Reads only. */
export async function reviewAttempt(userId: string, attemptId: string, { db = defaultDb, now = new Date() }: Options = {}): Promise<AttemptReview | null> {
	const row = await ownAttempt(db, userId, attemptId);
	return row ? review(db, row, now) : null;
}

/** An attempt with the person it belongs to, for a trainer or registrar whose scope holds that person; null otherwise. */
export async function reviewAttemptForStaff(viewerId: string, attemptId: string, { db = defaultDb, now = new Date() }: Options = {}) {
	const row = await db.selectFrom('test_attempt').selectAll().where('id', '=', attemptId).executeTakeFirst();
	if (!row || !(await trainerMaySee(viewerId, row.user_id, db))) return null;
	const person = await db.selectFrom('User').select(['id', 'name', 'email']).where('id', '=', row.user_id).executeTakeFirstOrThrow();
	return { person, summary: summarise((await settled(db, row, now)).row), review: await review(db, row, now) };
}

/**
 * Whether the person has passed the course test: what the certificate rules ask. An attempt
 * past its deadline but not yet closed counts as it will be graded.
 */
export async function hasPassedTest(userId: string, courseSlug: string, db: DB = defaultDb, now = new Date()): Promise<boolean> {
	const rows = (await db
		.selectFrom('test_attempt')
		.selectAll()
		.where('user_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where((eb) => eb.or([eb('passed', '=', 1), eb('submitted_at', 'is', null)]))
		.execute()) as Row[];
	for (const r of rows) if ((await settled(db, r, now)).row.passed === 1) return true;
	return false;
}

// ---------------------------------------------------------------- trainers and registrars

export interface StaffAttemptRow extends AttemptSummary {
	person: { id: string; name: string | null; email: string };
	/** The waiting time after this failed attempt can be lifted by staff now. */
	canWaiveWait: boolean;
	waitWaived: boolean;
}

/** Attempts of the trainees in the viewer's trainer scope, newest first, optionally for one course. */
export async function listAttemptsForStaff(
	viewerId: string,
	{ courseSlug, db = defaultDb, now = new Date() }: Options & { courseSlug?: string } = {}
): Promise<StaffAttemptRow[]> {
	const scope = await trainerScope(viewerId, db);
	let query = db
		.selectFrom('test_attempt')
		.innerJoin('User', 'User.id', 'test_attempt.user_id')
		.selectAll('test_attempt')
		.select(['User.name as person_name', 'User.email as person_email'])
		.where(inTrainerScope(scope, 'test_attempt.user_id'))
		.orderBy('test_attempt.started_at', 'desc')
		.limit(500);
	if (courseSlug) query = query.where('test_attempt.course_slug', '=', courseSlug);
	const rows = await Promise.all((await query.execute()).map(async (r) => ({ ...r, ...(await settled(db, r as Row, now)).row })));
	const latestClosed = new Map<string, string>();
	const hasOpen = new Set<string>();
	for (const r of rows) {
		const key = `${r.user_id}\u0000${r.course_slug}`;
		if (r.submitted_at === null) hasOpen.add(key);
		else if (!latestClosed.has(key)) latestClosed.set(key, r.id);
	}
	return rows.map((r) => {
		const key = `${r.user_id}\u0000${r.course_slug}`;
		const course = getCourse(r.course_slug);
		const all = rows.filter((x) => x.user_id === r.user_id && x.course_slug === r.course_slug) as Row[];
		const status = course ? evaluate(course, all, true, now) : null;
		const canWaiveWait = latestClosed.get(key) === r.id && !hasOpen.has(key) && status?.blocked?.reason === 'waiting';
		return {
			...summarise(r as Row),
			person: { id: r.user_id, name: r.person_name, email: r.person_email },
			canWaiveWait,
			waitWaived: r.wait_waived_at !== null
		};
	});
}

/**
 * Lets a trainee retake now instead of after the waiting time, recorded in the audit log with
 * the reason given. Only for the latest attempt of a trainee who is waiting and in the actor's
 * trainer scope; the attempts allowed still apply.
 */
export async function waiveWait(
	actorId: string,
	attemptId: string,
	reason: string,
	{ db = defaultDb, now = new Date() }: Options = {}
): Promise<{ ok: true; person: { name: string | null; email: string }; courseSlug: string } | Refusal> {
	return inTransaction(db, async (trx) => {
		const row = await trx.selectFrom('test_attempt').selectAll().where('id', '=', attemptId).executeTakeFirst();
		if (!row || !(await trainerMaySee(actorId, row.user_id, trx))) return { ok: false, status: 404, reason: 'not-found', message: 'No such attempt.' };
		await closeExpired(trx, row.user_id, now, row.course_slug);
		const course = getCourse(row.course_slug);
		const all = (await trx.selectFrom('test_attempt').selectAll().where('user_id', '=', row.user_id).where('course_slug', '=', row.course_slug).execute()) as Row[];
		const latest = all.filter((r) => r.submitted_at !== null).sort((a, b) => b.submitted_at!.localeCompare(a.submitted_at!))[0];
		const status = course ? evaluate(course, all, true, now) : null;
		if (!latest || latest.id !== row.id || status?.blocked?.reason !== 'waiting') {
			return { ok: false, status: 409, reason: 'not-waiting', message: 'This trainee is not waiting to retake this test.' };
		}
		const waived = await trx
			.updateTable('test_attempt')
			.set({ wait_waived_at: now.toISOString(), wait_waived_by: actorId })
			.where('id', '=', row.id)
			.where('wait_waived_at', 'is', null)
			.executeTakeFirst();
		if (Number(waived.numUpdatedRows) !== 1) return { ok: false, status: 409, reason: 'not-waiting', message: 'This trainee is not waiting to retake this test.' };
		await recordAudit(
			{ actorId, action: 'test.wait-waived', subjectType: 'test_attempt', subjectId: row.id, detail: { userId: row.user_id, courseSlug: row.course_slug, reason } },
			trx
		);
		const person = await trx.selectFrom('User').select(['name', 'email']).where('id', '=', row.user_id).executeTakeFirstOrThrow();
		return { ok: true, person, courseSlug: row.course_slug };
	});
}
