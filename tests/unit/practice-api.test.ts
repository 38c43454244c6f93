import { beforeEach, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { answerCheck, answerListing, answerProblem, PRACTICE_API_LIMIT } from '$lib/practice/api';
import { expectedAmount, expectedChoice, generateProblem } from '$lib/practice';
import { convert } from '$lib/calc/units';
import { resetAll } from '$lib/server/rate-limit';
import { GET as list } from '../../src/routes/api/v1/practice/+server';
import { GET as problem } from '../../src/routes/api/v1/practice/[generator]/+server';
import { POST as check } from '../../src/routes/api/v1/practice/[generator]/check/+server';

function event(path: string, params: Record<string, string>, init?: RequestInit, ip = '203.0.113.9') {
	return { params, url: new URL(`http://localhost${path}`), request: new Request(`http://localhost${path}`, init), getClientAddress: () => ip } as unknown as RequestEvent;
}

const post = (generator: string, body: unknown) =>
	check(event(`/api/v1/practice/${generator}/check`, { generator }, { method: 'POST', headers: { 'content-type': 'application/json' }, body: typeof body === 'string' ? body : JSON.stringify(body) }) as never);

beforeEach(() => resetAll());

describe('GET /api/v1/practice', () => {
	it('lists the generators with their calculator, topic and tolerance', async () => {
		const response = await list(event('/api/v1/practice', {}) as never);
		expect(response.status).toBe(200);
		const body = await response.json();
		expect(body.generators.length).toBeGreaterThanOrEqual(12);
		expect(body.generators).toContainEqual(expect.objectContaining({ id: 'resin-quantity', calculator: 'resin-quantity', tolerancePercent: 2 }));
		expect(body).toEqual(answerListing().body);
	});
});

describe('GET /api/v1/practice/{generator}?seed=N', () => {
	it('returns the same problem for the same seed, without its answer', async () => {
		const a = await (await problem(event('/api/v1/practice/resin-quantity?seed=42', { generator: 'resin-quantity' }) as never)).json();
		const b = answerProblem('resin-quantity', '42').body;
		expect(a).toEqual(b);
		expect(a).toMatchObject({ generator: 'resin-quantity', seed: 42, calculator: 'resin-quantity', asks: 'resinWithWasteKg', kind: 'numeric' });
		expect(Object.keys(a.inputs).sort()).toEqual(['diameterMm', 'lengthMm', 'matWeightGm2', 'plies', 'resinGlassRatio', 'wastePercent']);
		expect(a.units[0]).toBe(a.unit);
		const text = JSON.stringify(a);
		expect(text).not.toContain(String(expectedAmount(generateProblem('resin-quantity', 42)).value));
		expect(text).not.toMatch(/"(expected|steps|given)"/);
	});

	it('picks a seed when none is given, and refuses a bad one with a field message', () => {
		expect(answerProblem('cure-time', null)).toMatchObject({ status: 200, body: { generator: 'cure-time', seed: expect.any(Number) } });
		expect(answerProblem('cure-time', 'abc')).toMatchObject({ status: 400, body: { error: { fields: { seed: expect.any(String) } } } });
		expect(answerProblem('cure-time', '-1')).toMatchObject({ status: 400 });
		expect(answerProblem('cure-time', '4294967296')).toMatchObject({ status: 400, body: { error: { fields: { seed: expect.stringMatching(/between/) } } } });
		expect(answerProblem('cure-time', '1.5')).toMatchObject({ status: 400 });
	});

	it('is 404 for an unknown generator', async () => {
		const response = await problem(event('/api/v1/practice/no-such?seed=1', { generator: 'no-such' }) as never);
		expect(response.status).toBe(404);
		expect(answerProblem('__proto__', '1').status).toBe(404);
	});
});

describe('POST /api/v1/practice/{generator}/check', () => {
	it('says right or wrong with the expected answer, the worked steps and a hint', async () => {
		const p = generateProblem('resin-quantity', 7);
		const e = expectedAmount(p);
		const other = e.unit === 'g' ? 'kg' : 'g';
		const right = await (await post('resin-quantity', { seed: 7, answer: { value: convert(e.value, e.unit, other), unit: other } })).json();
		expect(right).toMatchObject({ correct: true, expected: { value: e.value, unit: e.unit } });
		expect(right.steps.length).toBeGreaterThan(2);
		const noWaste = { ...p, inputs: { ...p.inputs, wastePercent: 0 } };
		const wrong = await (await post('resin-quantity', { seed: 7, answer: { value: expectedAmount(noWaste).value, unit: p.unit } })).json();
		expect(wrong).toMatchObject({ correct: false, hint: expect.stringMatching(/waste/) });
	});

	it('checks decisions by choice', () => {
		let seed = 0;
		while (generateProblem('pressure-window', seed).kind !== 'choice') seed++;
		const right = expectedChoice(generateProblem('pressure-window', seed)).value;
		expect(answerCheck('pressure-window', JSON.stringify({ seed, answer: { choice: right } }))).toMatchObject({ status: 200, body: { correct: true } });
		expect(answerCheck('pressure-window', JSON.stringify({ seed, answer: { value: 2, unit: 'bar' } }))).toMatchObject({ status: 400, body: { error: { fields: { 'answer.choice': 'Required' } } } });
	});

	it('answers 400 with field messages for bad bodies, and 404 for an unknown generator', async () => {
		expect((await post('resin-quantity', 'not json')).status).toBe(400);
		const cases: [unknown, string][] = [
			[{}, 'seed'],
			[{ seed: 'x', answer: { value: 1, unit: 'kg' } }, 'seed'],
			[{ seed: 1 }, 'answer'],
			[{ seed: 1, answer: 5 }, 'answer'],
			[{ seed: 1, answer: { value: 1, unit: 'kg' }, extra: true }, 'extra'],
			[[1, 2], 'body']
		];
		for (const [body, field] of cases) {
			const response = await post('resin-quantity', body);
			expect(response.status, JSON.stringify(body)).toBe(400);
			expect(Object.keys((await response.json()).error.fields), JSON.stringify(body)).toContain(field);
		}
		expect((await post('no-such', { seed: 1, answer: { value: 1, unit: 'kg' } })).status).toBe(404);
	});

	it('grades empty and unit-less answers as wrong with a reason, not as errors', async () => {
		const empty = await (await post('end-thrust', { seed: 3, answer: { value: '', unit: 'kN' } })).json();
		expect(empty).toMatchObject({ correct: false, outcome: 'empty' });
		const unitless = await (await post('end-thrust', { seed: 3, answer: { value: 3 } })).json();
		expect(unitless).toMatchObject({ correct: false, outcome: 'missing-unit' });
	});

	it('is limited per client address', async () => {
		let last: Response | undefined;
		for (let i = 0; i <= PRACTICE_API_LIMIT.limit; i++) last = await list(event('/api/v1/practice', {}, undefined, '198.51.100.1') as never);
		expect(last!.status).toBe(429);
		expect(last!.headers.get('Retry-After')).toMatch(/^\d+$/);
		expect((await list(event('/api/v1/practice', {}, undefined, '198.51.100.2') as never)).status).toBe(200);
	});
});
