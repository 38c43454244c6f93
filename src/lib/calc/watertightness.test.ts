import { describe, expect, it } from 'vitest';
import { runCalculation } from './index';
import { airTestSeconds, f1417K, waterTest } from './watertightness';

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
		[6, 170, 398, 0.427],
		[8, 227, 298, 0.76]
	])('%i in: %i s minimum up to %i ft, then %f s/ft (ASTM F1417 table rows, from memory)', (d, seconds, feet, perFoot) => {
		expect(Math.round(airTestSeconds({ diameterIn: d, lengthFt: 10, dropPsig: 0.5 }))).toBe(seconds);
		expect(Math.round(1 / (0.000419 * d))).toBe(feet);
		expect(airTestSeconds({ diameterIn: d, lengthFt: 2000, dropPsig: 0.5 }) / 2000).toBeCloseTo(perFoot, 3);
	});

	it('a 1.0 psig drop takes twice as long as 0.5 psig', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 100, dropPsig: 1 });
		expect(out.ok && out.result.minimumSeconds).toBeCloseTo(226.67, 2);
		expect(out.ok && out.steps.at(-1)).toBe('Minimum time 3:47 (min:s)');
	});

	it('accepts only the 0.5 and 1.0 psig drops', () => {
		const out = runCalculation('air-test', { diameterIn: 4, lengthFt: 100, dropPsig: 0.75 });
		expect(out).toMatchObject({ ok: false, errors: { dropPsig: 'Must be one of 0.5, 1' } });
	});
});

describe('water-test (EN 1610, method W)', () => {
	it('DN150 x 30 m: 14.1 m² wetted, 2.1 L allowed at 0.15 L/m² (EN 1610 13.3)', () => {
		const r = waterTest({ diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.15 });
		expect(r.wettedAreaM2).toBeCloseTo(14.1, 1);
		expect(r.allowedL).toBeCloseTo(2.1, 1);
	});

	it('uses 0.15 L/m² when the allowance is left out, and accepts 0.20 and 0.40 (EN 1610 13.3)', () => {
		const dflt = runCalculation('water-test', { diameterMm: 150, lengthM: 30 });
		const manholes = runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.2 });
		expect(dflt.ok && dflt.result.allowedL).toBeCloseTo(2.12, 2);
		expect(manholes.ok && manholes.result.allowedL).toBeCloseTo(2.83, 2);
		expect(runCalculation('water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.3 }).ok).toBe(false);
	});
});
