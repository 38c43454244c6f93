import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { runCalculation } from './index';
import { laminateVolumeL, matSize, mixRatio, resinQuantity } from './materials';

/** mathjs's unit-aware evaluator as an independent calculator for hand-worked examples. */
function mathjs(expression: string, unit: string): number {
	return evaluate(expression).toNumber(unit);
}

function ok(id: string, inputs: Record<string, unknown>) {
	const out = runCalculation(id, inputs);
	if (!out.ok) throw new Error(`${id} failed: ${JSON.stringify(out.errors)}`);
	return out;
}

describe('resin-quantity', () => {
	const dn150 = {
		diameterMm: 150,
		lengthMm: 600,
		plies: 3,
		matWeightGm2: 1000,
		resinGlassRatio: 1.2,
		wastePercent: 15
	};

	it('DN150 x 0.6 m, 3 plies of 1000 g/m2, r = 1.2, 15 % waste: 0.848 m2, 0.85 kg glass, 1.02 kg resin, 1.17 kg with waste (hand-worked, common-practice formula)', () => {
		const r = resinQuantity(dn150);
		expect(r.matAreaM2).toBeCloseTo(0.848, 3);
		expect(r.glassKg).toBeCloseTo(0.85, 2);
		expect(r.resinKg).toBeCloseTo(1.02, 2);
		expect(r.resinWithWasteKg).toBeCloseTo(1.17, 2);
	});

	it('agrees with the same sum done by mathjs units', () => {
		const r = resinQuantity(dn150);
		expect(r.matAreaM2).toBeCloseTo(mathjs('3 * pi * 150 mm * 600 mm', 'm^2'), 12);
		expect(r.resinWithWasteKg).toBeCloseTo(
			mathjs('3 * pi * 150 mm * 600 mm * 1000 g/m^2 * 1.2 * 1.15', 'kg'),
			12
		);
	});

	it('writes the worked steps with numbers and units substituted', () => {
		const out = ok('resin-quantity', dn150);
		expect(out.steps[0]).toBe('Mat area = n × π × D × L = 3 × π × 0.150 m × 0.600 m = 0.848 m²');
		expect(out.steps.at(-1)).toBe('With waste = 1.02 kg × (1 + 15 %) = 1.17 kg');
		expect(ok('resin-quantity', { ...dn150, resinGlassRatio: 2.3 }).warnings).toEqual([]);
	});

	it('warns about a waste allowance below the usual 10 % (common practice)', () => {
		const out = ok('resin-quantity', { ...dn150, wastePercent: 5 });
		expect(out.alerts.map((a) => a.title)).toContain('Small waste allowance');
	});

	it('warns about a ratio outside hand lay-up ranges: chopped mat 25–35 % glass by weight is 1.9–3 : 1 (composites handbook ranges, from memory)', () => {
		// 35 % glass -> 65/35 = 1.86 resin per glass; 25 % glass -> 75/25 = 3.
		expect(65 / 35).toBeCloseTo(1.86, 2);
		expect(75 / 25).toBe(3);
		const titles = (r: number) => ok('resin-quantity', { ...dn150, resinGlassRatio: r }).alerts.map((a) => a.title);
		expect(titles(3.2)).toContain('Unusual resin to glass ratio');
		expect(titles(0.8)).toContain('Unusual resin to glass ratio');
		expect(titles(1.2)).toEqual(['Lean for chopped mat']);
		expect(titles(1.9)).toEqual([]);
		expect(titles(3)).toEqual([]);
	});

	it('fills the waste allowance with its 15 % default when left out', () => {
		const { wastePercent: _, ...rest } = dn150;
		expect(ok('resin-quantity', rest).result.resinWithWasteKg).toBeCloseTo(1.17, 2);
	});
});

describe('laminate-volume', () => {
	it('DN150, 3 mm wall, 600 mm long: π × 3 × 147 × 600 mm³ = 0.831 L (hand-worked, exact annulus)', () => {
		expect(laminateVolumeL({ diameterMm: 150, thicknessMm: 3, lengthMm: 600 })).toBeCloseTo(0.8313, 4);
	});

	it('equals the difference of two circles, π/4 (D² − (D − 2t)²) L, evaluated by mathjs', () => {
		const v = laminateVolumeL({ diameterMm: 225, thicknessMm: 6, lengthMm: 1000 });
		expect(v).toBeCloseTo(mathjs('pi / 4 * ((225 mm)^2 - (213 mm)^2) * 1000 mm', 'L'), 10);
	});

	it('rejects a wall thicker than the radius', () => {
		const out = runCalculation('laminate-volume', { diameterMm: 60, thicknessMm: 30, lengthMm: 600 });
		expect(out).toMatchObject({ ok: false, status: 400, errors: { thicknessMm: expect.any(String) } });
	});
});

describe('mat-size', () => {
	it('DN150, 3 plies, 50 mm overlap, 600 mm patch: width 3π × 150 + 50 = 1463.7 mm (hand-worked, common practice)', () => {
		const r = matSize({ diameterMm: 150, plies: 3, overlapMm: 50, patchLengthMm: 600 });
		expect(r.cutWidthMm).toBeCloseTo(1463.7, 1);
		expect(r.cutLengthMm).toBe(600);
		expect(r.areaM2).toBeCloseTo(mathjs('(3 * pi * 150 mm + 50 mm) * 600 mm', 'm^2'), 12);
	});

	it('warns when the patch cannot cover a defect with 150 mm each end (common practice)', () => {
		const out = ok('mat-size', { diameterMm: 150, plies: 3, overlapMm: 50, patchLengthMm: 250 });
		expect(out.alerts[0]?.title).toBe('Patch too short to cover a defect');
		const long = ok('mat-size', { diameterMm: 150, plies: 3, overlapMm: 50, patchLengthMm: 600 });
		expect(long.alerts).toEqual([]);
	});
});

describe('mix-ratio', () => {
	const base = { totalKg: 1.2, totalL: 0, ratioA: 100, ratioB: 50, ratioByVolume: 0, densityAGcm3: 1.15, densityBGcm3: 1 };

	it('1.2 kg at 100:50 by weight: 0.8 kg A and 0.4 kg B (hand-worked)', () => {
		const r = mixRatio(base);
		expect(r.partAKg).toBeCloseTo(0.8, 12);
		expect(r.partBKg).toBeCloseTo(0.4, 12);
		expect(r.partAL).toBeCloseTo(0.8 / 1.15, 12);
	});

	it('2:1 by volume with densities 1.15 and 1.00: mass ratio 2.3:1, A = 1.2 × 2.3 / 3.3 kg (hand-worked)', () => {
		const r = mixRatio({ ...base, ratioA: 2, ratioB: 1, ratioByVolume: 1 });
		expect(r.partAKg).toBeCloseTo((1.2 * 2.3) / 3.3, 12);
		expect(r.partAL / r.partBL).toBeCloseTo(2, 12);
	});

	it('a total of 1 L at 2:1 by volume is 2/3 L of A and 1/3 L of B (hand-worked)', () => {
		const r = mixRatio({ ...base, totalL: 1, ratioA: 2, ratioB: 1, ratioByVolume: 1 });
		expect(r.partAL).toBeCloseTo(2 / 3, 12);
		expect(r.partBL).toBeCloseTo(1 / 3, 12);
		expect(r.mixKg).toBeCloseTo((2 / 3) * 1.15 + 1 / 3, 12);
	});

	it('rejects a ratio basis other than 0 (by weight) or 1 (by volume)', () => {
		expect(runCalculation('mix-ratio', { ...base, ratioByVolume: 2 })).toMatchObject({
			ok: false,
			errors: { ratioByVolume: expect.stringContaining('Must be') }
		});
	});
});
