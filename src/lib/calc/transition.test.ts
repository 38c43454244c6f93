import { describe, expect, it } from 'vitest';
import { evaluate } from 'mathjs';
import { runCalculation } from './index';
import { transitionArea } from './transition';

describe('transition-area', () => {
	const r = transitionArea({ smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 100 });

	it('100 -> 150 mm over a 100 mm taper: s = 103.1 mm, A = 0.0405 m² (geometry of the frustum, hand-worked)', () => {
		expect(r.slantMm).toBeCloseTo(103.1, 1);
		expect(r.areaM2).toBeCloseTo(0.0405, 4);
	});

	it('agrees with the frustum area evaluated by mathjs units', () => {
		const expected = evaluate('pi * (50 mm + 75 mm) * sqrt((25 mm)^2 + (100 mm)^2)').toNumber('m^2');
		expect(r.areaM2).toBeCloseTo(expected, 12);
	});

	it('unrolls to a sector whose arcs are the two circumferences and whose area is the taper area (geometry)', () => {
		const thetaRad = (r.patternAngleDeg * Math.PI) / 180;
		expect(r.patternOuterRadiusMm * thetaRad).toBeCloseTo(Math.PI * 150, 9);
		expect(r.patternInnerRadiusMm * thetaRad).toBeCloseTo(Math.PI * 100, 9);
		expect(r.patternOuterRadiusMm - r.patternInnerRadiusMm).toBeCloseTo(r.slantMm, 9);
		const sectorAreaMm2 = (thetaRad / 2) * (r.patternOuterRadiusMm ** 2 - r.patternInnerRadiusMm ** 2);
		expect(sectorAreaMm2 / 1e6).toBeCloseTo(r.areaM2, 12);
	});

	it('hand-worked pattern: R₂ = 309.2 mm, R₁ = 206.2 mm, θ = 87.3°', () => {
		expect(r.patternOuterRadiusMm).toBeCloseTo(309.2, 1);
		expect(r.patternInnerRadiusMm).toBeCloseTo(206.2, 1);
		expect(r.patternAngleDeg).toBeCloseTo(87.3, 1);
	});

	it('a mat cut for the large end of 100 -> 150 carries 1.5 times the plies at the small end (common practice)', () => {
		expect(r.smallEndPlyFactor).toBe(1.5);
		const out = runCalculation('transition-area', { smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 100 });
		expect(out.ok && out.alerts.map((a) => a.title)).toContain('Expect folds at the small end');
	});

	it('rejects a "larger" diameter that is not larger', () => {
		const out = runCalculation('transition-area', { smallDiameterMm: 150, largeDiameterMm: 150, taperLengthMm: 100 });
		expect(out).toMatchObject({ ok: false, status: 400, errors: { largeDiameterMm: expect.any(String) } });
	});
});
