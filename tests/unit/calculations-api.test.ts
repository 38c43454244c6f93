import { beforeEach, describe, expect, it } from 'vitest';
import type { RequestEvent } from '@sveltejs/kit';
import { answerCalculation, answerListing, CALCULATION_API_LIMIT } from '$lib/calc/api';
import { resetAll } from '$lib/server/rate-limit';
import { GET } from '../../src/routes/api/v1/calculations/+server';
import { POST } from '../../src/routes/api/v1/calculations/[id]/+server';

const resin = { diameterMm: 150, lengthMm: 600, plies: 3, matWeightGm2: 1000, resinGlassRatio: 1.2, wastePercent: 15 };

function event(id: string, body: string, ip = '203.0.113.7') {
	return {
		params: { id },
		request: new Request(`http://localhost/api/v1/calculations/${id}`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body
		}),
		getClientAddress: () => ip
	} as unknown as RequestEvent<{ id: string }, '/api/v1/calculations/[id]'>;
}

function listingEvent(ip = '203.0.113.8') {
	return {
		params: {},
		request: new Request('http://localhost/api/v1/calculations'),
		getClientAddress: () => ip
	} as unknown as RequestEvent<Record<string, never>, '/api/v1/calculations'>;
}

beforeEach(() => resetAll());

describe('GET /api/v1/calculations', () => {
	it('lists every calculator with its inputs (name, unit, default, range) and results', async () => {
		const response = await GET(listingEvent());
		expect(response.status).toBe(200);
		const body = await response.json();
		expect(body.calculators).toHaveLength(13);
		expect(body.calculators[0]).toMatchObject({
			id: 'resin-quantity',
			inputs: expect.arrayContaining([
				expect.objectContaining({ name: 'diameterMm', unit: 'mm', default: 150, min: 50, max: 1600 })
			]),
			results: expect.arrayContaining([expect.objectContaining({ name: 'resinWithWasteKg', unit: 'kg' })])
		});
		expect(body).toEqual(answerListing().body);
	});
});

describe('POST /api/v1/calculations/[id]', () => {
	it('answers 200 with result, steps, sources and warnings', async () => {
		const response = await POST(event('resin-quantity', JSON.stringify({ inputs: resin })));
		expect(response.status).toBe(200);
		const body = await response.json();
		expect(Object.keys(body).sort()).toEqual(['result', 'sources', 'steps', 'warnings']);
		expect(body.result.resinWithWasteKg).toBeCloseTo(1.17, 2);
		expect(body.steps[0]).toContain('0.848 m²');
	});

	it('answers 404 for an unknown calculator', async () => {
		const response = await POST(event('resin', JSON.stringify({ inputs: resin })));
		expect(response.status).toBe(404);
		expect((await response.json()).error.message).toMatch(/Unknown calculator "resin"/);
	});

	it('answers 400 with a message for a body that is not JSON', async () => {
		for (const bad of ['', '{inputs:', 'diameterMm=150']) {
			const response = await POST(event('resin-quantity', bad));
			expect(response.status, bad).toBe(400);
			expect((await response.json()).error.message).toMatch(/must be JSON/);
		}
	});

	it.each([
		['an array', '[1, 2]'],
		['a number', '42'],
		['null', 'null'],
		['an object without inputs', '{"diameterMm": 150}']
	])('answers 400 when the body is %s', async (_, body) => {
		const response = await POST(event('resin-quantity', body));
		expect(response.status).toBe(400);
		expect((await response.json()).error.fields).toEqual({ inputs: 'Required' });
	});

	it('answers 400 when inputs is not an object', async () => {
		const answer = answerCalculation('resin-quantity', '{"inputs": [150, 600]}');
		expect(answer).toEqual({
			status: 400,
			body: { error: { code: 'bad_request', message: expect.any(String), fields: { inputs: 'Must be an object of named numbers' } } }
		});
	});

	it('answers 400 naming every missing input', async () => {
		const answer = answerCalculation('resin-quantity', '{"inputs": {"diameterMm": 150}}');
		expect(answer.status).toBe(400);
		expect((answer.body.error as { fields: unknown }).fields).toEqual({
			lengthMm: 'Required',
			plies: 'Required',
			matWeightGm2: 'Required',
			resinGlassRatio: 'Required'
		});
	});

	it('answers 400 for non-numeric inputs', async () => {
		const answer = answerCalculation('groundwater-head', '{"inputs": {"headM": "three"}}');
		expect(answer).toMatchObject({ status: 400, body: { error: { fields: { headM: 'Must be a number' } } } });
	});

	it('answers 400 with the allowed range for out-of-range inputs', async () => {
		const answer = answerCalculation('end-thrust', '{"inputs": {"diameterMm": 100, "pressureBar": 50}}');
		expect(answer).toMatchObject({ status: 400, body: { error: { fields: { pressureBar: 'Must be between 0.01 and 10 bar' } } } });
	});

	it('answers 400 for a fractional count, a value off the list, an unknown name and an inconsistent pair', () => {
		expect((answerCalculation('mat-size', '{"inputs": {"diameterMm": 150, "plies": 2.5, "overlapMm": 50, "patchLengthMm": 600}}').body.error as { fields: unknown }).fields).toEqual({
			plies: 'Must be a whole number'
		});
		expect((answerCalculation('air-test', '{"inputs": {"diameterIn": 4, "lengthFt": 100, "dropPsig": 2}}').body.error as { fields: unknown }).fields).toMatchObject({
			dropPsig: expect.stringMatching(/^(Must be one of 0.5, 1|Must be between)/)
		});
		expect((answerCalculation('groundwater-head', '{"inputs": {"headM": 3, "depthM": 2}}').body.error as { fields: unknown }).fields).toMatchObject({
			depthM: expect.stringContaining('Unknown input')
		});
		expect((answerCalculation('transition-area', '{"inputs": {"smallDiameterMm": 150, "largeDiameterMm": 100, "taperLengthMm": 100}}').body.error as { fields: unknown }).fields).toEqual({
			largeDiameterMm: 'Must be larger than the smaller pipe diameter'
		});
	});

	it('never answers 500 for strange but valid JSON', async () => {
		for (const body of ['{"inputs": {"headM": {"$gt": 1}}}', '{"inputs": {"__proto__": {"headM": 3}}}', '{"inputs": {"headM": 1e400}}']) {
			const response = await POST(event('groundwater-head', body));
			expect(response.status, body).toBe(400);
		}
	});

	it('limits each address and answers 429 with Retry-After, leaving other addresses alone', async () => {
		const body = JSON.stringify({ inputs: { headM: 3 } });
		for (let n = 0; n < CALCULATION_API_LIMIT.limit; n++) {
			expect((await POST(event('groundwater-head', body, '198.51.100.1'))).status).toBe(200);
		}
		const limited = await POST(event('groundwater-head', body, '198.51.100.1'));
		expect(limited.status).toBe(429);
		expect(Number(limited.headers.get('Retry-After'))).toBeGreaterThan(0);
		expect((await limited.json()).error).toEqual({ code: 'rate_limited', message: expect.stringMatching(/Too many requests/) });
		expect((await GET(listingEvent('198.51.100.1'))).status).toBe(429);
		expect((await POST(event('groundwater-head', body, '198.51.100.2'))).status).toBe(200);
	});
});
