/**
 * Course test attempts against a fresh database migrated with the real migrations: the
 * attempt rules, resuming, autosave, double and late submits, other people's attempts, and
 * that the runner never sees an answer. The clock is passed in, so waiting is real.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { listAudit } from '$lib/server/audit';
import {
	getAttempt,
	hasPassedTest,
	LATE_GRACE_MS,
	listAttemptsForStaff,
	reviewAttempt,
	reviewAttemptForStaff,
	saveAnswer,
	startAttempt,
	submitAttempt,
	testStatus,
	waiveWait,
	type RunnerView
} from '$lib/server/attempts';
import { enrol } from '$lib/server/enrolments';
import { grantRole } from '$lib/server/roles';
import { createUser } from '$lib/server/users';
import type { DrawnItem } from '$lib/practice/test-items';
import { rightAnswer, wrongAnswer } from '../helpers/answer-key';
import { createTestDb } from '../helpers/db';

const COURSE = 'packer-pressure-safety'; // 14 fixed + 6 computed, 40 minutes, 3 attempts, 24 h wait, pass mark 80
const T0 = new Date('2025-03-03T08:00:00.000Z');
const later = (ms: number) => new Date(T0.getTime() + ms);
const HOUR = 3_600_000;

describe('course test attempts', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let sam: string;
	let kit: string;
	let outsider: string;

	beforeEach(async () => {
		db = await createTestDb();
		sam = (await createUser({ email: 'sam@example.test', name: 'Sam' }, db)).id;
		kit = (await createUser({ email: 'kit@example.test', name: 'Kit' }, db)).id;
		outsider = (await createUser({ email: 'out@example.test', name: 'Out' }, db)).id;
		await enrol(null, sam, COURSE, 'registrar', db);
		await enrol(null, kit, COURSE, 'registrar', db);
	});
	afterEach(async () => db.destroy());

	async function start(userId = sam, now = T0, seed = 7): Promise<RunnerView> {
		const out = await startAttempt(userId, COURSE, { db, now, seed });
		if (!out.ok) throw new Error(`start refused: ${out.reason}`);
		return out.attempt;
	}

	async function drawnItems(attemptId: string): Promise<DrawnItem[]> {
		const row = await db.selectFrom('test_attempt').select('items').where('id', '=', attemptId).executeTakeFirstOrThrow();
		return JSON.parse(row.items);
	}

	async function answerAll(attempt: RunnerView, how: 'right' | 'wrong', now = T0) {
		const items = await drawnItems(attempt.id);
		for (let i = 0; i < items.length; i++) {
			const out = await saveAnswer(sam, attempt.id, i, how === 'right' ? rightAnswer(items[i]) : wrongAnswer(items[i]), { db, now });
			expect(out, `item ${i}`).toMatchObject({ ok: true });
		}
	}

	it('refuses an unknown course and a person who is not enrolled', async () => {
		expect(await startAttempt(sam, 'no-such-course', { db, now: T0 })).toMatchObject({ ok: false, status: 404 });
		expect(await startAttempt(outsider, COURSE, { db, now: T0 })).toMatchObject({ ok: false, status: 403, reason: 'not-enrolled' });
		expect((await testStatus(outsider, COURSE, { db, now: T0 }))?.blocked?.reason).toBe('not-enrolled');
	});

	it('draws the set number of items with a deadline, and the runner sees no answers, seeds or inputs', async () => {
		const attempt = await start();
		expect(attempt.items).toHaveLength(20);
		expect(attempt.deadlineAt).toBe(later(40 * 60_000).toISOString());
		const text = JSON.stringify(attempt);
		for (const secret of ['"answer"', '"explanation"', '"seed"', '"inputs"', '"given"', '"shown"', '"calculator"', '"tolerancePercent"']) {
			expect(text).not.toContain(secret);
		}
		const items = await drawnItems(attempt.id);
		for (const item of items) {
			if (item.source === 'bank') expect(text).not.toContain(item.question.explanation.slice(0, 40));
			else expect(text).not.toContain(String(item.seed));
		}
		const audit = await listAudit({ subjectId: attempt.id }, db);
		expect(audit.map((e) => e.action)).toContain('test.start');
	});

	it('resumes the open attempt instead of drawing again, with the saved answers', async () => {
		const first = await start();
		const items = await drawnItems(first.id);
		expect(await saveAnswer(sam, first.id, 0, rightAnswer(items[0]), { db, now: later(60_000) })).toMatchObject({ ok: true });
		const again = await startAttempt(sam, COURSE, { db, now: later(120_000), seed: 999 });
		expect(again).toMatchObject({ ok: true, resumed: true });
		if (!again.ok) return;
		expect(again.attempt.id).toBe(first.id);
		expect(again.attempt.items).toEqual(first.items);
		expect(again.attempt.answers[0]).toEqual(rightAnswer(items[0]));
		const fetched = await getAttempt(sam, first.id, { db, now: later(120_000) });
		expect(fetched).toMatchObject({ status: 'open', id: first.id });
	});

	it('opens only one attempt when two starts race', async () => {
		const [a, b] = await Promise.all([startAttempt(sam, COURSE, { db, now: T0 }), startAttempt(sam, COURSE, { db, now: T0 })]);
		expect(a.ok && b.ok && a.attempt.id === b.attempt.id).toBe(true);
		const rows = await db.selectFrom('test_attempt').select('id').where('user_id', '=', sam).execute();
		expect(rows).toHaveLength(1);
	});

	it('checks each saved answer against its item, with a message per field', async () => {
		const attempt = await start();
		const bad = await saveAnswer(sam, attempt.id, 0, { nonsense: true }, { db, now: T0 });
		expect(bad).toMatchObject({ ok: false, status: 400, reason: 'bad-answer' });
		expect(!bad.ok && Object.keys(bad.errors ?? {}).length).toBeGreaterThan(0);
		expect(await saveAnswer(sam, attempt.id, 20, { choice: 0 }, { db, now: T0 })).toMatchObject({ ok: false, status: 404 });
		expect(await saveAnswer(sam, attempt.id, -1, { choice: 0 }, { db, now: T0 })).toMatchObject({ ok: false, status: 404 });
	});

	it('treats another person’s attempt as not found, for every action', async () => {
		const attempt = await start();
		expect(await getAttempt(kit, attempt.id, { db, now: T0 })).toBeNull();
		expect(await saveAnswer(kit, attempt.id, 0, { choice: 0 }, { db, now: T0 })).toMatchObject({ ok: false, status: 404 });
		expect(await submitAttempt(kit, attempt.id, { db, now: T0 })).toMatchObject({ ok: false, status: 404 });
		await submitAttempt(sam, attempt.id, { db, now: T0 });
		expect(await reviewAttempt(kit, attempt.id, { db, now: T0 })).toBeNull();
		expect(await reviewAttempt(sam, attempt.id, { db, now: T0 })).not.toBeNull();
	});

	it('grades on submit, passes with every answer right, and refuses a second submit without change', async () => {
		const attempt = await start();
		expect(await reviewAttempt(sam, attempt.id, { db, now: T0 })).toBeNull();
		await answerAll(attempt, 'right');
		const done = await submitAttempt(sam, attempt.id, { db, now: later(10 * 60_000) });
		expect(done).toMatchObject({ ok: true, summary: { correctCount: 20, scorePercent: 100, passed: true, closedBy: 'person' } });
		const again = await submitAttempt(sam, attempt.id, { db, now: later(11 * 60_000) });
		expect(again).toMatchObject({ ok: false, status: 409, reason: 'already-submitted' });
		expect(!again.ok && again.summary).toEqual(done.ok && done.summary);
		expect(await saveAnswer(sam, attempt.id, 0, { choice: 0 }, { db, now: later(12 * 60_000) })).toMatchObject({ ok: false, status: 409, reason: 'submitted' });
		expect(await hasPassedTest(sam, COURSE, db)).toBe(true);
		expect((await listAudit({ subjectId: attempt.id }, db)).filter((e) => e.action === 'test.submit')).toHaveLength(1);
		// A passed test is not taken again.
		expect(await startAttempt(sam, COURSE, { db, now: later(48 * HOUR) })).toMatchObject({ ok: false, status: 409, reason: 'passed' });
	});

	it('reviews each item with the answer given, the right one and the explanation or steps', async () => {
		const attempt = await start();
		await answerAll(attempt, 'wrong');
		await submitAttempt(sam, attempt.id, { db, now: T0 });
		const review = await reviewAttempt(sam, attempt.id, { db, now: T0 });
		expect(review?.items).toHaveLength(20);
		expect(review?.passed).toBe(false);
		for (const item of review!.items) {
			expect(item.correct).toBe(false);
			expect(item.given.length).toBeGreaterThan(0);
			expect(item.expected.length).toBeGreaterThan(0);
			expect(item.explanation ?? item.steps).toBeTruthy();
		}
		const trainer = (await createUser({ email: 'trainer@example.test', name: 'Tess' }, db)).id;
		await grantRole(null, trainer, 'trainer', db);
		const staff = await reviewAttemptForStaff(trainer, attempt.id, { db });
		expect(staff?.person.email).toBe('sam@example.test');
	});

	it('makes a person wait after a failed attempt, and limits the attempts', async () => {
		let now = T0;
		for (let n = 1; n <= 3; n++) {
			const attempt = await start(sam, now, n);
			await submitAttempt(sam, attempt.id, { db, now });
			const waiting = await startAttempt(sam, COURSE, { db, now: later((n - 1) * 25 * HOUR + HOUR) });
			if (n < 3) {
				expect(waiting).toMatchObject({ ok: false, status: 409, reason: 'waiting', availableAt: new Date(now.getTime() + 24 * HOUR).toISOString() });
				const status = await testStatus(sam, COURSE, { db, now: later((n - 1) * 25 * HOUR + HOUR) });
				expect(status).toMatchObject({ attemptsUsed: n, attemptsLeft: 3 - n, blocked: { reason: 'waiting' } });
			} else {
				expect(waiting).toMatchObject({ ok: false, status: 409, reason: 'no-attempts-left' });
			}
			now = later(n * 25 * HOUR);
		}
		expect(await startAttempt(sam, COURSE, { db, now: later(500 * HOUR) })).toMatchObject({ ok: false, reason: 'no-attempts-left' });
	});

	it('starts the next attempt after the waiting time with a new draw', async () => {
		const first = await start(sam, T0, 1);
		await submitAttempt(sam, first.id, { db, now: T0 });
		expect(await startAttempt(sam, COURSE, { db, now: later(24 * HOUR - 1000) })).toMatchObject({ ok: false, reason: 'waiting' });
		const second = await startAttempt(sam, COURSE, { db, now: later(24 * HOUR + 1000), seed: 2 });
		expect(second).toMatchObject({ ok: true, resumed: false });
		expect(second.ok && second.attempt.id).not.toBe(first.id);
	});

	it('lets a trainer lift the wait, once, recorded in the audit log; attempts still count', async () => {
		const first = await start();
		await submitAttempt(sam, first.id, { db, now: T0 });
		const trainer = (await createUser({ email: 'trainer@example.test', name: 'Tess' }, db)).id;
		await grantRole(null, trainer, 'trainer', db);
		const rows = await listAttemptsForStaff(trainer, { db, now: later(HOUR), courseSlug: COURSE });
		expect(rows[0]).toMatchObject({ id: first.id, canWaiveWait: true, person: { email: 'sam@example.test' } });
		expect(await waiveWait(trainer, first.id, { db, now: later(HOUR) })).toEqual({ ok: true });
		expect(await waiveWait(trainer, first.id, { db, now: later(HOUR) })).toMatchObject({ ok: false, status: 409 });
		expect((await listAudit({ subjectId: first.id }, db)).map((e) => e.action)).toContain('test.wait-waived');
		const second = await startAttempt(sam, COURSE, { db, now: later(2 * HOUR) });
		expect(second).toMatchObject({ ok: true, resumed: false });
		expect((await testStatus(sam, COURSE, { db, now: later(2 * HOUR) }))?.attemptsUsed).toBe(1);
		expect(await waiveWait(trainer, 'no-such-attempt', { db })).toMatchObject({ ok: false, status: 404 });
	});

	it('refuses late answers and a late submit, grading what was saved in time', async () => {
		const attempt = await start();
		const items = await drawnItems(attempt.id);
		const deadline = Date.parse(attempt.deadlineAt!);
		expect(await saveAnswer(sam, attempt.id, 0, rightAnswer(items[0]), { db, now: new Date(deadline - 1000) })).toMatchObject({ ok: true });
		expect(await saveAnswer(sam, attempt.id, 1, rightAnswer(items[1]), { db, now: new Date(deadline + LATE_GRACE_MS - 1) })).toMatchObject({ ok: true });
		const late = await saveAnswer(sam, attempt.id, 2, rightAnswer(items[2]), { db, now: new Date(deadline + LATE_GRACE_MS + 1) });
		expect(late).toMatchObject({ ok: false, status: 409, reason: 'time-up', summary: { closedBy: 'time limit', correctCount: 2, submittedAt: attempt.deadlineAt } });
		expect(await submitAttempt(sam, attempt.id, { db, now: new Date(deadline + 60_000) })).toMatchObject({ ok: false, status: 409, reason: 'already-submitted' });
	});

	it('closes an attempt left open past its deadline on the next visit', async () => {
		const attempt = await start();
		const lateSubmit = await submitAttempt(sam, attempt.id, { db, now: later(41 * 60_000) });
		expect(lateSubmit).toMatchObject({ ok: false, status: 409, reason: 'time-up', summary: { closedBy: 'time limit' } });

		const other = await start(kit);
		expect(await getAttempt(kit, other.id, { db, now: later(2 * HOUR) })).toMatchObject({ status: 'submitted', summary: { closedBy: 'time limit', passed: false } });
		const status = await testStatus(kit, COURSE, { db, now: later(2 * HOUR) });
		expect(status).toMatchObject({ open: null, attemptsUsed: 1, blocked: { reason: 'waiting' } });
	});
});
