import { corr } from 'mathjs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { saveAnswer, startAttempt, submitAttempt } from '$lib/server/attempts';
import { enrol } from '$lib/server/enrolments';
import { grantRole } from '$lib/server/roles';
import { computeItemStats, itemStatistics, MIN_ATTEMPTS, type ScoredAttempt } from '$lib/server/item-stats';
import { createUser } from '$lib/server/users';
import type { DrawnItem } from '$lib/practice/test-items';
import { rightAnswer, wrongAnswer } from '../helpers/answer-key';
import { createTestDb } from '../helpers/db';

/** Ten attempts at a six-item test: q1 tracks the total, q2 runs against it, q3 everyone gets right. */
const attempts: ScoredAttempt[] = [
	[1, 0, 1, 1, 1, 1],
	[1, 0, 1, 1, 1, 0],
	[1, 0, 1, 1, 0, 1],
	[1, 1, 1, 0, 1, 0],
	[1, 1, 1, 1, 0, 0],
	[0, 1, 1, 0, 1, 0],
	[0, 1, 1, 0, 0, 1],
	[0, 1, 1, 0, 0, 0],
	[0, 0, 1, 1, 0, 0],
	[0, 1, 1, 0, 0, 0]
].map((row) => ({
	total: row.reduce((s, v) => s + v, 0),
	items: row.map((v, i) => ({ key: `q${i + 1}`, correct: v === 1, answered: true }))
}));

describe('item statistics (pure)', () => {
	const stats = computeItemStats(attempts);

	it('counts draws and the share answered right', () => {
		expect(stats.get('q1')).toMatchObject({ drawn: 10, answered: 10, correctPercent: 50 });
		expect(stats.get('q3')?.correctPercent).toBe(100);
	});

	it('gives the item-rest point-biserial r as Pearson’s r computed by mathjs', () => {
		for (const key of ['q1', 'q2', 'q4', 'q5', 'q6']) {
			const x = attempts.map((a) => (a.items.find((i) => i.key === key)!.correct ? 1 : 0));
			const rest = attempts.map((a, n) => a.total - x[n]);
			expect(stats.get(key)!.pointBiserial).toBeCloseTo(corr(x, rest) as number, 10);
		}
		expect(stats.get('q1')!.pointBiserial!).toBeGreaterThan(0.3);
		expect(stats.get('q2')!.pointBiserial!).toBeLessThan(0);
		// Everyone right: no spread, no correlation.
		expect(stats.get('q3')!.pointBiserial).toBeNull();
	});

	it('gives the upper-lower 27 % index, worked by hand', () => {
		// 27 % of 10 rounds to 3. By total (5, 4, 4, 4, 4, 3, 3, 2, 2, 2), the top three are attempts 1-3, the bottom three 8-10.
		expect(stats.get('q1')!.upperLower).toBeCloseTo(1 - 0, 10);
		expect(stats.get('q2')!.upperLower).toBeCloseTo(0 - 2 / 3, 10);
		expect(stats.get('q1')!.verdict).toBe('very good');
		expect(stats.get('q2')!.verdict).toBe('poor');
	});

	it('shows no discrimination below the minimum number of attempts', () => {
		const few = computeItemStats(attempts.slice(0, MIN_ATTEMPTS - 1));
		expect(few.get('q1')).toMatchObject({ pointBiserial: null, upperLower: null, verdict: 'too few attempts' });
	});
});

describe('item statistics from submitted attempts', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	beforeEach(async () => (db = await createTestDb()));
	afterEach(async () => db.destroy());

	it('cover every item drawn, with strong candidates answering right more often', async () => {
		const now = new Date('2025-03-03T08:00:00Z');
		for (let n = 0; n < 6; n++) {
			const user = (await createUser({ email: `t${n}@example.test`, name: `T${n}` }, db)).id;
			await enrol(null, user, 'transition-patches', 'registrar', db);
			const started = await startAttempt(user, 'transition-patches', { db, now, seed: 42 });
			if (!started.ok) throw new Error(started.reason);
			const row = await db.selectFrom('test_attempt').select('items').where('id', '=', started.attempt.id).executeTakeFirstOrThrow();
			const items: DrawnItem[] = JSON.parse(row.items);
			// Candidate n answers the first 4n items right and the rest wrong.
			for (let i = 0; i < items.length; i++) await saveAnswer(user, started.attempt.id, i, i < 4 * n ? rightAnswer(items[i]) : wrongAnswer(items[i]), { db, now });
			await submitAttempt(user, started.attempt.id, { db, now });
		}
		const registrar = (await createUser({ email: 'registrar@example.test', name: 'R' }, db)).id;
		await grantRole(null, registrar, 'registrar', db);
		const stats = await itemStatistics(registrar, 'transition-patches', db);
		expect(stats?.attemptCount).toBe(6);
		expect(stats!.items).toHaveLength(22);
		for (const item of stats!.items) {
			expect(item.drawn).toBe(6);
			expect(item.label.length).toBeGreaterThan(5);
			if (item.correctPercent > 0 && item.correctPercent < 100) expect(item.upperLower!).toBeGreaterThan(0);
		}
		expect(stats!.items.some((i) => i.source === 'computed')).toBe(true);
		expect(await itemStatistics(registrar, 'no-such-course', db)).toBeNull();
	});
});
