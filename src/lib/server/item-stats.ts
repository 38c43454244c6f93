/**
 * Item statistics for a course test, from submitted attempts: how often each question is
 * drawn and answered right, and how well it separates strong candidates from weak ones.
 *
 * Discrimination is given two ways (classical test theory):
 * - the item-rest point-biserial correlation: Pearson's r between the item's score (0/1) and
 *   the rest of the test's score, so an item is not correlated with itself;
 * - the upper-lower index D: the share right among the top 27 % of attempts by score minus the
 *   share right among the bottom 27 % (Kelley's 27 % groups).
 * Reading D (Ebel's guide, from memory): 0.40 and up very good, 0.30-0.39 good, 0.20-0.29
 * marginal, below 0.20 poor: check the question and its key. A negative value means weak
 * candidates do better than strong ones, which usually means a wrong key or a trick.
 */
import type { Selectable } from 'kysely';
import { getCourse } from '$lib/content';
import { itemKey, itemLabel, type DrawnItem } from '$lib/practice/test-items';
import { db as defaultDb, type DB } from './db';
import type { TestAttemptTable } from './db/schema';
import { inTrainerScope, trainerScope } from './trainer-scope';

/** One submitted attempt, reduced to what the statistics need. */
export interface ScoredAttempt {
	/** Items right in the whole attempt. */
	total: number;
	items: { key: string; correct: boolean; answered: boolean }[];
}

export interface ItemNumbers {
	key: string;
	/** Times drawn in submitted attempts. */
	drawn: number;
	answered: number;
	/** Percent of draws answered right (unanswered counts as wrong). */
	correctPercent: number;
	/** Item-rest point-biserial r; null when it cannot be computed (too few attempts, or no spread). */
	pointBiserial: number | null;
	/** Upper-lower 27 % index D; null with fewer than MIN_ATTEMPTS attempts. */
	upperLower: number | null;
	verdict: 'very good' | 'good' | 'marginal' | 'poor' | 'too few attempts';
}

/** Below this many attempts the discrimination figures mean little; they are not shown. */
export const MIN_ATTEMPTS = 5;

function pearson(xs: number[], ys: number[]): number | null {
	const n = xs.length;
	if (n < 2) return null;
	const mx = xs.reduce((s, v) => s + v, 0) / n;
	const my = ys.reduce((s, v) => s + v, 0) / n;
	let sxy = 0;
	let sxx = 0;
	let syy = 0;
	for (let i = 0; i < n; i++) {
		sxy += (xs[i] - mx) * (ys[i] - my);
		sxx += (xs[i] - mx) ** 2;
		syy += (ys[i] - my) ** 2;
	}
	return sxx === 0 || syy === 0 ? null : sxy / Math.sqrt(sxx * syy);
}

function verdictOf(d: number | null): ItemNumbers['verdict'] {
	if (d === null) return 'too few attempts';
	if (d >= 0.4) return 'very good';
	if (d >= 0.3) return 'good';
	if (d >= 0.2) return 'marginal';
	return 'poor';
}

/** Pure: the numbers per item key over a set of attempts. */
export function computeItemStats(attempts: ScoredAttempt[]): Map<string, ItemNumbers> {
	const keys = new Set(attempts.flatMap((a) => a.items.map((i) => i.key)));
	const out = new Map<string, ItemNumbers>();
	for (const key of keys) {
		// Per attempt holding the item: its score on the item (a share, when drawn twice) and the total.
		const cases: { x: number; total: number }[] = [];
		let drawn = 0;
		let answered = 0;
		let right = 0;
		for (const a of attempts) {
			const mine = a.items.filter((i) => i.key === key);
			if (mine.length === 0) continue;
			const rightHere = mine.filter((i) => i.correct).length;
			drawn += mine.length;
			answered += mine.filter((i) => i.answered).length;
			right += rightHere;
			cases.push({ x: rightHere / mine.length, total: a.total });
		}
		const enough = cases.length >= MIN_ATTEMPTS;
		const pointBiserial = enough ? pearson(cases.map((c) => c.x), cases.map((c) => c.total - c.x)) : null;
		let upperLower: number | null = null;
		if (enough) {
			const sorted = [...cases].sort((a, b) => b.total - a.total);
			const group = Math.max(1, Math.round(sorted.length * 0.27));
			const share = (g: typeof cases) => g.reduce((s, c) => s + c.x, 0) / g.length;
			upperLower = share(sorted.slice(0, group)) - share(sorted.slice(-group));
		}
		out.set(key, {
			key,
			drawn,
			answered,
			correctPercent: drawn === 0 ? 0 : (right * 100) / drawn,
			pointBiserial,
			upperLower,
			verdict: verdictOf(upperLower)
		});
	}
	return out;
}

export interface ItemStatistic extends ItemNumbers {
	label: string;
	lesson: string | null;
	source: 'bank' | 'computed';
}

/**
 * Statistics for every item drawn in a course's submitted attempts of the trainees in the
 * viewer's trainer scope, worst discrimination first.
 */
export async function itemStatistics(viewerId: string, courseSlug: string, db: DB = defaultDb): Promise<{ attemptCount: number; items: ItemStatistic[] } | null> {
	const course = getCourse(courseSlug);
	if (!course) return null;
	const scope = await trainerScope(viewerId, db);
	const rows = (await db
		.selectFrom('test_attempt')
		.selectAll()
		.where(inTrainerScope(scope, 'test_attempt.user_id'))
		.where('course_slug', '=', courseSlug)
		.where('submitted_at', 'is not', null)
		.execute()) as Selectable<TestAttemptTable>[];
	const labels = new Map<string, { label: string; lesson: string | null; source: 'bank' | 'computed' }>();
	const attempts: ScoredAttempt[] = rows
		.filter((r) => r.results !== null)
		.map((r) => {
			const drawn: DrawnItem[] = JSON.parse(r.items);
			const results: { correct: boolean; answered: boolean }[] = JSON.parse(r.results!);
			drawn.forEach((item) => labels.set(itemKey(item), { label: itemLabel(item), lesson: item.lesson, source: item.source }));
			return { total: r.correct_count ?? 0, items: drawn.map((item, i) => ({ key: itemKey(item), correct: results[i].correct, answered: results[i].answered })) };
		});
	const items = [...computeItemStats(attempts).values()].map((n) => ({ ...n, ...labels.get(n.key)! }));
	items.sort((a, b) => (a.upperLower ?? Infinity) - (b.upperLower ?? Infinity) || a.key.localeCompare(b.key));
	return { attemptCount: attempts.length, items };
}
