import { describe, expect, it } from 'vitest';
import { bendingDr, bucklingDr, f1216Full, f1216Partial, ovalityFactor } from './f1216';
import { runCalculation } from './index';

const partial = {
	diameterIn: 6,
	pressurePsi: 4.33,
	ovalityPercent: 2,
	longTermModulusPsi: 125000,
	enhancementK: 7,
	poisson: 0.3,
	safetyFactor: 2,
	flexuralStrengthPsi: 2250
};

describe('ovality reduction factor, ASTM F1216 X1.1', () => {
	it.each([
		[0, 1.0],
		[2, 0.84],
		[5, 0.64],
		[10, 0.41]
	])('q = %i %% gives C = %f (handbook table of the F1216 ovality factor)', (q, c) => {
		expect(ovalityFactor(q)).toBeCloseTo(c, 2);
	});
});

describe('f1216-partial (ASTM F1216 Appendix X1, Eq. X1.1 and X1.2)', () => {
	it('6 in pipe, 10 ft of water (4.33 psi), q = 2 %, E_L = 125,000 psi, N = 2: DR = 58.0, t = 2.63 mm (computed from Eq. X1.1)', () => {
		const r = f1216Partial(partial);
		expect(r.dr).toBeCloseTo(58.0, 1);
		expect(r.thicknessMm).toBeCloseTo(2.63, 2);
		expect(r.governs).toBe('X1.1');
	});

	it('the DR found satisfies Eq. X1.1 when put back in', () => {
		const C = ovalityFactor(2);
		const dr = bucklingDr({ ...partial, ovalityFactorC: C });
		const P = ((2 * 7 * 125000) / (1 - 0.3 ** 2)) * (1 / (dr - 1) ** 3) * (C / 2);
		expect(P).toBeCloseTo(4.33, 10);
	});

	it('the DR found satisfies Eq. X1.2 when put back in', () => {
		const dr = bendingDr(partial);
		const q = 0.02;
		const lhs = 1.5 * q * (1 + q) * dr ** 2 - 0.5 * (1 + q) * dr;
		expect(lhs).toBeCloseTo(2250 / (4.33 * 2), 8);
	});

	it('lets the oval-pipe bending check govern when the pipe is very oval and the strength low', () => {
		const r = f1216Partial({ ...partial, ovalityPercent: 10, flexuralStrengthPsi: 800 });
		expect(r.governs).toBe('X1.2');
		expect(r.thicknessIn).toBeCloseTo(r.thicknessBendingIn, 12);
	});

	it('skips the bending check for a round pipe', () => {
		expect(f1216Partial({ ...partial, ovalityPercent: 0 }).thicknessBendingIn).toBe(0);
	});

	it('with no groundwater uses the DR 100 limit (ASTM F1216 X1, from memory)', () => {
		const out = runCalculation('f1216-partial', { ...partial, pressurePsi: 0 });
		expect(out.ok && out.result).toMatchObject({ dr: 100, thicknessIn: 0.06, governs: 'DR 100' });
	});

	it('never lets DR exceed 100, even under a very small head', () => {
		const r = f1216Partial({ ...partial, pressurePsi: 0.05 });
		expect(r.dr).toBe(100);
		expect(r.governs).toBe('DR 100');
	});

	it('takes K = 7, ν = 0.3, N = 2 when they are left out', () => {
		const out = runCalculation('f1216-partial', {
			diameterIn: 6,
			pressurePsi: 4.33,
			ovalityPercent: 2,
			longTermModulusPsi: 125000
		});
		expect(out.ok && out.result.dr).toBeCloseTo(58.0, 1);
	});
});

describe('f1216-full (ASTM F1216 Appendix X1, Eq. X1.3 and X1.4)', () => {
	const full = {
		diameterIn: 12,
		groundwaterHeightFt: 5,
		soilHeightFt: 10,
		soilUnitWeightPcf: 120,
		liveLoadPsi: 0,
		soilModulusPsi: 700,
		ovalityPercent: 2,
		longTermModulusPsi: 125000,
		shortTermModulusPsi: 250000,
		safetyFactor: 2
	};

	it('12 in pipe, 5 ft water, 10 ft soil at 120 pcf, E\'s 700 psi: hand-worked R_w = 0.835, B\' = 0.3238, q_t = 9.123 psi, t(X1.3) = 0.2218 in, t(X1.4) = 0.1976 in', () => {
		const r = f1216Full(full);
		expect(r.waterBuoyancyFactor).toBeCloseTo(0.835, 6);
		expect(r.soilSupportFactor).toBeCloseTo(0.3238, 4);
		expect(r.totalLoadPsi).toBeCloseTo(9.123, 3);
		expect(r.thicknessX13In).toBeCloseTo(0.2218, 4);
		expect(r.thicknessX14In).toBeCloseTo(0.1976, 4);
		expect(r.governs).toBe('X1.3');
		expect(r.thicknessMm).toBeCloseTo(0.2218 * 25.4, 2);
	});

	it('the X1.3 thickness satisfies Eq. X1.3 when put back in, and the X1.4 thickness gives E I / D³ = 0.093 psi', () => {
		const r = f1216Full(full);
		const I13 = r.thicknessX13In ** 3 / 12;
		const qt =
			(1 / 2) *
			Math.sqrt(32 * r.waterBuoyancyFactor * r.soilSupportFactor * 700 * r.ovalityFactorC * ((125000 * I13) / 12 ** 3));
		expect(qt).toBeCloseTo(r.totalLoadPsi, 9);
		const I14 = r.thicknessX14In ** 3 / 12;
		expect((250000 * I14) / 12 ** 3).toBeCloseTo(0.093, 12);
	});

	it('keeps the water buoyancy factor at or above 0.67 (ASTM F1216 X1.3)', () => {
		expect(f1216Full({ ...full, groundwaterHeightFt: 10 }).waterBuoyancyFactor).toBeCloseTo(0.67, 12);
	});

	it('lets minimum stiffness govern under light load', () => {
		const r = f1216Full({ ...full, groundwaterHeightFt: 0, soilHeightFt: 3 });
		expect(r.governs).toBe('X1.4');
		expect(r.thicknessIn).toBe(r.thicknessX14In);
	});

	it('rejects groundwater above the ground surface', () => {
		const out = runCalculation('f1216-full', { ...full, groundwaterHeightFt: 12 });
		expect(out).toMatchObject({ ok: false, errors: { groundwaterHeightFt: expect.any(String) } });
	});
});
