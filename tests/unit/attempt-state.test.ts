/**
 * Attempt state changes (issue 8, reliability): one transaction each, guarded by
 * `submitted_at is null`; answers and per-item results in their own rows; reads change
 * nothing; existing attempts migrate forward without loss.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Migrator, type Kysely, type Migration } from 'kysely';
import { listAudit } from '$lib/server/audit';
import { closeDueAttempts, getAttempt, hasPassedTest, reviewAttempt, saveAnswer, startAttempt, submitAttempt, testStatus } from '$lib/server/attempts';
import { openDatabase } from '$lib/server/db/engine';
import { enrol } from '$lib/server/enrolments';
import { createUser } from '$lib/server/users';
import type { DrawnItem } from '$lib/practice/test-items';
import { rightAnswer } from '../helpers/answer-key';
import { createTestDb, testEngine } from '../helpers/db';

const COURSE = 'packer-pressure-safety'; // 20 items, 40 minutes
const T0 = new Date('2025-03-03T08:00:00.000Z');
const LATE = new Date(T0.getTime() + 2 * 3_600_000);

describe('attempt state', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let sam: string;
	beforeEach(async () => {
		db = await createTestDb();
		sam = (await createUser({ email: 'sam@example.test', name: 'Sam' }, db)).id;
		await enrol(null, sam, COURSE, 'registrar', db);
	});
	afterEach(async () => db.destroy());

	async function begin() {
		const out = await startAttempt(sam, COURSE, { db, now: T0, seed: 11 });
		if (!out.ok) throw new Error(out.reason);
		const row = await db.selectFrom('test_attempt').select('items').where('id', '=', out.attempt.id).executeTakeFirstOrThrow();
		return { id: out.attempt.id, items: JSON.parse(row.items) as DrawnItem[] };
	}

	it('keeps every answer of many concurrent saves, and a submit racing them closes once with exactly the saves it saw', async () => {
		// On SQLite these run one after another in the order asked; on a PostgreSQL server they
		// interleave (the pool has several connections), so what holds is checked, not an order.
		const { id, items } = await begin();
		const save = (position: number) => saveAnswer(sam, id, position, rightAnswer(items[position]), { db, now: T0 });
		const [early, ...more] = await Promise.all([
			Promise.all(items.map((_, position) => save(position))),
			submitAttempt(sam, id, { db, now: T0 }),
			submitAttempt(sam, id, { db, now: T0 }),
			...items.map((_, position) => save(position))
		]);
		const submits = more.slice(0, 2) as Awaited<ReturnType<typeof submitAttempt>>[];
		expect(submits.filter((s) => s.ok)).toHaveLength(1);
		const saves = [...early, ...(more.slice(2) as Awaited<ReturnType<typeof saveAnswer>>[])];
		expect(saves.every((s) => s.ok || s.status === 409)).toBe(true);
		const acknowledged = new Set(saves.map((s, i) => (s.ok ? i % items.length : -1)).filter((p) => p >= 0));
		if (testEngine !== 'postgres') expect(acknowledged.size).toBe(20);
		// every acknowledged save was graded, and nothing else was stored
		const stored = (await db.selectFrom('test_answer').select('position').where('attempt_id', '=', id).orderBy('position').execute()).map((r) => r.position);
		expect(stored).toEqual([...acknowledged].sort((x, y) => x - y));
		expect(await db.selectFrom('test_item_result').select('position').where('attempt_id', '=', id).execute()).toHaveLength(20);
		const review = await reviewAttempt(sam, id, { db, now: T0 });
		expect(review).toMatchObject({ correctCount: acknowledged.size });
		expect((await listAudit({ subjectId: id }, db)).filter((e) => e.action === 'test.submit')).toHaveLength(1);
	});

	it('writes nothing when a due attempt is only read, and closes it on the next state change', async () => {
		const { id, items } = await begin();
		for (let p = 0; p < 20; p++) await saveAnswer(sam, id, p, rightAnswer(items[p]), { db, now: T0 });
		const status = await testStatus(sam, COURSE, { db, now: LATE });
		expect(status?.attempts[0]).toMatchObject({ id, closedBy: 'time limit', passed: true });
		expect(await getAttempt(sam, id, { db, now: LATE })).toMatchObject({ status: 'submitted', summary: { correctCount: 20 } });
		expect(await reviewAttempt(sam, id, { db, now: LATE })).toMatchObject({ passed: true, correctCount: 20 });
		expect(await hasPassedTest(sam, COURSE, db, LATE)).toBe(true);
		const stored = await db.selectFrom('test_attempt').select(['submitted_at', 'passed']).where('id', '=', id).executeTakeFirstOrThrow();
		expect(stored).toEqual({ submitted_at: null, passed: null });
		expect((await listAudit({ subjectId: id }, db)).map((e) => e.action)).not.toContain('test.submit');

		expect(await saveAnswer(sam, id, 0, rightAnswer(items[0]), { db, now: LATE })).toMatchObject({ ok: false, reason: 'time-up' });
		const closed = await db.selectFrom('test_attempt').select(['submitted_at', 'passed', 'closed_by']).where('id', '=', id).executeTakeFirstOrThrow();
		expect(closed).toEqual({ submitted_at: new Date(T0.getTime() + 40 * 60_000).toISOString(), passed: 1, closed_by: 'time limit' });
		expect((await listAudit({ subjectId: id }, db)).filter((e) => e.action === 'test.submit')).toHaveLength(1);
	});

	it('the sweep closes due attempts once', async () => {
		const { id } = await begin();
		expect(await closeDueAttempts({ db, now: T0 })).toBe(0);
		expect(await closeDueAttempts({ db, now: LATE })).toBe(1);
		expect(await closeDueAttempts({ db, now: LATE })).toBe(0);
		expect((await db.selectFrom('test_attempt').select('closed_by').where('id', '=', id).executeTakeFirstOrThrow()).closed_by).toBe('time limit');
	});
});

describe('migration 011 moves JSON answers and results into rows', () => {
	it('keeps every answer and result of existing attempts', async () => {
		const modules = import.meta.glob<Migration>('/migrations/*.ts', { eager: true });
		const all = Object.fromEntries(Object.entries(modules).map(([path, m]) => [path.split('/').pop()!.replace(/\.ts$/, ''), m]));
		const db = openDatabase(':memory:') as Kysely<any>;
		const migrate = (migrations: Record<string, Migration>) =>
			new Migrator({ db, provider: { getMigrations: async () => migrations }, allowUnorderedMigrations: true }).migrateToLatest();
		expect((await migrate(Object.fromEntries(Object.entries(all).filter(([name]) => name < '011')))).error).toBeUndefined();
		await db.insertInto('User').values({ id: 'u', email: 'u@example.test' }).execute();
		const base = { user_id: 'u', course_slug: COURSE, deadline_at: null, draw_seed: 1, items: '[]', item_count: 2, pass_mark: 80 };
		await db
			.insertInto('test_attempt')
			.values([
				{ ...base, id: 'open', started_at: '2025-01-01T00:00:00.000Z', answers: '{"0":{"choice":1},"1":{"value":"1.2","unit":"kg"}}' },
				{ ...base, id: 'done', course_slug: 'transition-patches', started_at: '2025-01-02T00:00:00.000Z', submitted_at: '2025-01-02T00:30:00.000Z', closed_by: 'person', answers: '{"1":{"value":true}}', results: '[{"correct":false,"answered":false},{"correct":true,"answered":true,"hint":"h"}]', correct_count: 1, score_percent: 50, passed: 0 }
			])
			.execute();
		expect((await migrate(all)).error).toBeUndefined();
		const answers = await db.selectFrom('test_answer').selectAll().orderBy('attempt_id').orderBy('position').execute();
		expect(answers).toEqual([
			{ attempt_id: 'done', position: 1, answer: '{"value":true}', saved_at: '2025-01-02T00:30:00.000Z' },
			{ attempt_id: 'open', position: 0, answer: '{"choice":1}', saved_at: '2025-01-01T00:00:00.000Z' },
			{ attempt_id: 'open', position: 1, answer: '{"value":"1.2","unit":"kg"}', saved_at: '2025-01-01T00:00:00.000Z' }
		]);
		expect(await db.selectFrom('test_item_result').selectAll().orderBy('position').execute()).toEqual([
			{ attempt_id: 'done', position: 0, correct: 0, answered: 0, hint: null },
			{ attempt_id: 'done', position: 1, correct: 1, answered: 1, hint: 'h' }
		]);
		await db.destroy();
	});
});
