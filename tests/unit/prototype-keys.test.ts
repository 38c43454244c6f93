/**
 * Look-ups keyed by a person's text never read the object prototype (issue 8, item 3): a unit
 * typed as "constructor" or "__proto__" is an unknown unit everywhere, and grading never
 * throws on a stored answer. Before the fix, `"constructor" in UNITS` was true and grading
 * threw, a 500 on the practice check and an attempt that could no longer close.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { convert, displayUnit, quantityOf, resolveUnit, unitLabel } from '$lib/calc/units';
import { parseInputs } from '$lib/calc/validate';
import { getCalculator } from '$lib/calc';
import { gradeNumeric } from '$lib/practice/grading';
import { lessonForGenerator } from '$lib/practice/course-lessons';
import { getAttempt, reviewAttempt, saveAnswer, startAttempt, submitAttempt } from '$lib/server/attempts';
import { enrol } from '$lib/server/enrolments';
import { createUser } from '$lib/server/users';
import { resetAll } from '$lib/server/rate-limit';
import type { DrawnItem } from '$lib/practice/test-items';
import { POST as check } from '../../src/routes/api/v1/practice/[generator]/check/+server';
import { POST as calculate } from '../../src/routes/api/v1/calculations/[id]/+server';
import { createTestDb } from '../helpers/db';

const PROTOTYPE_KEYS = ['constructor', '__proto__', 'toString', 'hasOwnProperty', 'valueOf', 'isPrototypeOf', '__defineGetter__', ' constructor ', 'CONSTRUCTOR'];

describe('units', () => {
	it.each(PROTOTYPE_KEYS)('"%s" is not a unit', (key) => {
		expect(resolveUnit(key)).toBeUndefined();
		expect(quantityOf(key)).toBeUndefined();
		expect(unitLabel(key)).toBe(key);
		expect(displayUnit(key, 'metric')).toBe(key);
		expect(() => convert(1, key, 'kg')).toThrow(/Unknown unit/);
	});

	it('still knows its own units and spellings', () => {
		expect(resolveUnit('kg')).toBe('kg');
		expect(resolveUnit(' KPA ')).toBe('kPa');
	});
});

describe('grading', () => {
	it.each(PROTOTYPE_KEYS)('answers "unknown unit" for "%s"', (unit) => {
		expect(gradeNumeric({ value: 1.17, unit: 'kg' }, { value: '1.17', unit }, 2)).toMatchObject({ correct: false, outcome: 'unknown-unit' });
	});

	it('finds no lesson for prototype names', () => {
		expect(lessonForGenerator('constructor', 'x')).toBeNull();
		expect(lessonForGenerator('point-repair-installer', '__proto__')).toBeNull();
	});
});

describe('calculator inputs', () => {
	it('names a "__proto__" or "constructor" input as unknown instead of losing it', () => {
		const def = getCalculator('end-thrust')!;
		const out = parseInputs(def, JSON.parse('{"diameterMm": 100, "pressureBar": 1, "__proto__": 1, "constructor": 2}'));
		expect(out.ok).toBe(false);
		if (!out.ok) expect(Object.keys(out.errors).sort()).toEqual(['__proto__', 'constructor']);
	});
});

function post(path: string, params: Record<string, string>, body: string) {
	return {
		params,
		url: new URL(`http://localhost${path}`),
		route: { id: null },
		request: new Request(`http://localhost${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body }),
		getClientAddress: () => '198.51.100.9'
	} as unknown as RequestEvent<never, never>;
}

describe('the public APIs', () => {
	beforeEach(() => resetAll());

	it.each(PROTOTYPE_KEYS)('the practice check answers 200 "unknown unit" for "%s"', async (unit) => {
		const response = await check(post('/api/v1/practice/end-thrust/check', { generator: 'end-thrust' }, JSON.stringify({ seed: 3, answer: { value: '5', unit } })) as never);
		expect(response.status).toBe(200);
		expect(await response.json()).toMatchObject({ correct: false, outcome: 'unknown-unit' });
	});

	it('the practice check and the calculator treat "constructor" ids as unknown', async () => {
		const body = JSON.stringify({ seed: 3, answer: { value: '5', unit: 'kN' } });
		expect((await check(post('/api/v1/practice/constructor/check', { generator: 'constructor' }, body) as never)).status).toBe(404);
		expect((await calculate(post('/api/v1/calculations/__proto__', { id: '__proto__' }, '{"inputs": {}}') as never)).status).toBe(404);
	});
});

describe('a test attempt with a prototype-named unit saved', () => {
	const COURSE = 'packer-pressure-safety';
	const T0 = new Date('2025-03-03T08:00:00.000Z');
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let sam: string;
	beforeEach(async () => {
		db = await createTestDb();
		sam = (await createUser({ email: 'sam@example.test', name: 'Sam' }, db)).id;
		await enrol(null, sam, COURSE, 'registrar', db);
	});
	afterEach(async () => db.destroy());

	async function startWithBadUnits() {
		const started = await startAttempt(sam, COURSE, { db, now: T0, seed: 5 });
		if (!started.ok) throw new Error(started.reason);
		const row = await db.selectFrom('test_attempt').select('items').where('id', '=', started.attempt.id).executeTakeFirstOrThrow();
		const items: DrawnItem[] = JSON.parse(row.items);
		const numeric = started.attempt.items.filter((i) => i.kind === 'numeric').map((i) => i.position);
		expect(numeric.length).toBeGreaterThan(1);
		for (const [n, position] of numeric.entries()) {
			const saved = await saveAnswer(sam, started.attempt.id, position, { value: '1', unit: n % 2 ? '__proto__' : 'constructor' }, { db, now: T0 });
			expect(saved, JSON.stringify(items[position]).slice(0, 80)).toMatchObject({ ok: true });
		}
		return started.attempt.id;
	}

	it('submits and is graded, the odd units counting as wrong', async () => {
		const id = await startWithBadUnits();
		const out = await submitAttempt(sam, id, { db, now: T0 });
		expect(out).toMatchObject({ ok: true });
		const review = await reviewAttempt(sam, id, { db, now: T0 });
		expect(review?.items.filter((i) => i.kind === 'numeric').every((i) => !i.correct)).toBe(true);
	});

	it('closes by the time limit on the next visit, without an error', async () => {
		const id = await startWithBadUnits();
		const late = new Date(T0.getTime() + 2 * 3_600_000);
		const submitted = await submitAttempt(sam, id, { db, now: late });
		expect(submitted).toMatchObject({ ok: false, status: 409, reason: 'time-up' });
		expect(await getAttempt(sam, id, { db, now: late })).toMatchObject({ status: 'submitted' });
	});
});
