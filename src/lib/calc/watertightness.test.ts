import { describe, expect, it } from 'vitest';
import { calculators, runCalculation } from './index';
import { airTestSeconds, f1417K, manholeWettedAreaM2, minutesAndSeconds, waterTest } from './watertightness';

describe('air-test (ASTM F1417)', () => {
	it('4 in line, 0.5 psig drop: 1:53 (113 s) minimum, holding up to 597 ft (ASTM F1417 minimum-time table, 4 in row)', () => {
		expect(Math.floor(airTestSeconds({ diameterIn: 4, lengthFt: 100, dropPsig: 0.5 }))).toBe(113);
		expect(airTestSeconds({ diameterIn: 4, lengthFt: 596, dropPsig: 0.5 })).toBeCloseTo(113.3, 1);
		expect(Math.round(1 / (0.000419 * 4))).toBe(597);
		expect(f1417K(4, 596)).toBe(1);
		expect(f1417K(4, 598)).toBeGreaterThan(1);
	});

	it('longer 4 in lines need 0.190 s per foot for a 0.5 psig drop (same table)', () => {
		const perFoot = airTestSeconds({ diameterIn: 4, lengthFt: 1000, dropPsig: 0.5 }) / 1000;
		expect(perFoot).toBeCloseTo(0.19, 3);
	});

	it.each([
		[4, '1:53', 597, 0.19],
		[6, '2:50', 398, 0.427],
		[8, '3:47', 298, 0.76],
		[10, '4:43', 239, 1.187],
		[12, '5:40', 199, 1.709],
		[15, '7:05', 159, 2.671]
	])('%i in: minimum %s up to %i ft, then %f s/ft (ASTM F1417 minimum-time table for a 0.5 psig drop, rows from memory)', (d, shown, feet, perFoot) => {
		const out = runCalculation('air-test', { diameterIn: d, lengthFt: 10, dropPsig: 0.5 });
		expect(out.ok && out.steps.at(-1)).toMatch(new RegExp(`^Minimum time ${shown} `));
		expect(minutesAndSeconds(airTestSeconds({ diameterIn: d, lengthFt: 10, dropPsig: 0.5 }))).toBe(shown);
		expect(Math.round(1 / (0.000419 * d))).toBe(feet);
		expect(airTestSeconds({ diameterIn: d, lengthFt: 2000, dropPsig: 0.5 }) / 2000).toBeCloseTo(perFoot, 2);
	});

	it('shows 1:53, not 1:54, for the 4 in line, as the lesson and the table do', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 300, dropPsig: 0.5 });
		expect(out.ok && out.steps.at(-1)).toContain('1:53');
		expect(out.ok && out.steps.at(-1)).not.toContain('1:54');
	});

	it('names the standards for clay and concrete lines, and does not pin the 5 psig ceiling on F1417', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 300, dropPsig: 0.5 });
		expect(out.ok && out.sources.join(' ')).toMatch(/C828.*C924/);
		const cautions = JSON.stringify(calculators['air-test'].cautions);
		expect(cautions).toMatch(/common practice, not a figure from F1417/);
		expect(cautions).not.toMatch(/Never above 5 psig/);
	});

	it('a 1.0 psig drop takes twice as long as 0.5 psig', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 100, dropPsig: 1 });
		expect(out.ok && out.result.minimumSeconds).toBeCloseTo(226.67, 2);
		expect(out.ok && out.steps.at(-1)).toMatch(/^Minimum time 3:47 /);
	});

	it('accepts only the 0.5 and 1.0 psig drops', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 100, dropPsig: 0.75 });
		expect(out).toMatchObject({ ok: false, errors: { dropPsig: 'Must be one of 0.5, 1' } });
	});
});

describe('water-test (EN 1610, method W)', () => {
	it('DN150 x 30 m: 14.1 m² wetted, 2.1 L allowed at 0.15 L/m² (EN 1610 13.3)', () => {
		const r = waterTest({ diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.15, manholeAreaM2: 0 });
		expect(r.wettedAreaM2).toBeCloseTo(14.1, 1);
		expect(r.allowedL).toBeCloseTo(2.1, 1);
	});

	it('uses 0.15 L/m² and no manholes when left out (EN 1610 13.3)', () => {
		const dflt = runCalculation('water-test', { diameterMm: 150, lengthM: 30 });
		expect(dflt.ok && dflt.result.allowedL).toBeCloseTo(2.12, 2);
		expect(runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.3 }).ok).toBe(false);
	});

	it('with manholes, 0.20 L/m² applies to the whole wetted surface, manholes included (EN 1610 13.3)', () => {
		// Two 1.0 m manholes filled 1.5 m deep: each π × 1.0 × 1.5 + π × 1.0² / 4 = 5.50 m² (geometry).
		const oneManhole = manholeWettedAreaM2(1, 1.5);
		expect(oneManhole).toBeCloseTo(5.498, 3);
		const out = runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.2, manholeAreaM2: 11 });
		expect(out.ok && out.result.wettedAreaM2).toBeCloseTo(14.137 + 11, 3);
		expect(out.ok && out.result.allowedL).toBeCloseTo((14.137 + 11) * 0.2, 3);
		// The old reading, 0.20 × the pipe alone, under-allows by the manholes' share.
		expect(out.ok && out.result.allowedL).toBeGreaterThan(2.83 + 2);
	});

	it('refuses 0.20 L/m² without the manholes’ area, and manholes at the pipeline-only allowance', () => {
		expect(runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.2 })).toMatchObject({ ok: false, errors: { manholeAreaM2: expect.stringMatching(/wetted area/) } });
		expect(runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.15, manholeAreaM2: 8 })).toMatchObject({ ok: false, errors: { allowanceLPerM2: expect.stringMatching(/0.20/) } });
		expect(runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.4 }).ok).toBe(false);
	});
});
