/**
 * Invariants that must hold for any sensible input (fast-check property tests).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { scaleMinutesForTemperature } from './cure';
import { f1216Partial, ovalityFactor } from './f1216';
import { calculators, runCalculation } from './index';
import { laminateVolumeL, mixRatio, resinQuantity } from './materials';
import { endThrustKN } from './pressure';
import { transitionArea } from './transition';
import type { InputSpec } from './types';
import { airTestSeconds, waterTest } from './watertightness';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-12);
const within = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

describe('invariants', () => {
	it('resin grows linearly with patch length', () => {
		fc.assert(
			fc.property(within(50, 1600), within(100, 3000), fc.integer({ min: 1, max: 8 }), within(1, 2), (d, l, n, k) => {
				const base = { diameterMm: d, lengthMm: l, plies: n, matWeightGm2: 900, resinGlassRatio: 1.5, wastePercent: 15 };
				const a = resinQuantity(base).resinWithWasteKg;
				const b = resinQuantity({ ...base, lengthMm: l * k }).resinWithWasteKg;
				expect(rel(b, a * k)).toBeLessThan(1e-12);
			})
		);
	});

	it('end thrust grows with the square of the diameter and linearly with pressure', () => {
		fc.assert(
			fc.property(within(50, 800), within(0.1, 5), within(1, 2), (d, p, k) => {
				const f = endThrustKN({ diameterMm: d, pressureBar: p, smallDiameterMm: 0 });
				expect(rel(endThrustKN({ diameterMm: d * k, pressureBar: p, smallDiameterMm: 0 }), f * k * k)).toBeLessThan(1e-12);
				expect(rel(endThrustKN({ diameterMm: d, pressureBar: p * k, smallDiameterMm: 0 }), f * k)).toBeLessThan(1e-12);
			})
		);
	});

	it('thrust on a transition step is the difference of the two end thrusts', () => {
		fc.assert(
			fc.property(within(60, 1600), within(0.1, 0.95), within(0.1, 5), (big, ratio, p) => {
				const small = big * ratio;
				const step = endThrustKN({ diameterMm: big, pressureBar: p, smallDiameterMm: small });
				const diff =
					endThrustKN({ diameterMm: big, pressureBar: p, smallDiameterMm: 0 }) -
					endThrustKN({ diameterMm: small, pressureBar: p, smallDiameterMm: 0 });
				expect(rel(step, diff)).toBeLessThan(1e-9);
			})
		);
	});

	it('the ovality factor falls as ovality grows, from 1 at a round pipe', () => {
		expect(ovalityFactor(0)).toBe(1);
		fc.assert(
			fc.property(within(0, 30), within(0.01, 10), (q, dq) => {
				expect(ovalityFactor(q + dq)).toBeLessThan(ovalityFactor(q));
			})
		);
	});

	it('cure time halves for each 10 °C rise at factor 2, and falls with temperature for any factor above 1', () => {
		fc.assert(
			fc.property(within(1, 1000), within(0, 40), within(-5, 50), within(1.1, 3), (t, ref, temp, f) => {
				const now = scaleMinutesForTemperature(t, ref, temp, 2);
				expect(rel(scaleMinutesForTemperature(t, ref, temp + 10, 2), now / 2)).toBeLessThan(1e-12);
				expect(scaleMinutesForTemperature(t, ref, temp + 1, f)).toBeLessThan(scaleMinutesForTemperature(t, ref, temp, f));
			})
		);
	});

	it('laminate volume sits just under the thin-wall estimate π D t L', () => {
		fc.assert(
			fc.property(within(50, 1600), within(0.001, 0.2), within(100, 6000), (d, frac, l) => {
				const t = d * frac;
				const v = laminateVolumeL({ diameterMm: d, thicknessMm: t, lengthMm: l });
				const thin = (Math.PI * d * t * l) / 1e6;
				expect(v).toBeLessThan(thin);
				expect(v / thin).toBeCloseTo(1 - frac, 10);
			})
		);
	});

	it('the taper is at least as large as its projected band π (r₁ + r₂) h, and its pattern arcs are the circumferences', () => {
		fc.assert(
			fc.property(within(50, 1000), within(1.01, 3), within(10, 2000), (small, k, h) => {
				const large = small * k;
				const r = transitionArea({ smallDiameterMm: small, largeDiameterMm: large, taperLengthMm: h });
				expect(r.areaM2 * 1e6).toBeGreaterThanOrEqual((Math.PI * (small + large) * h) / 2 - 1e-6);
				const theta = (r.patternAngleDeg * Math.PI) / 180;
				expect(rel(r.patternOuterRadiusMm * theta, Math.PI * large)).toBeLessThan(1e-9);
				expect(rel(r.patternInnerRadiusMm * theta, Math.PI * small)).toBeLessThan(1e-9);
			})
		);
	});

	it('a split mix adds back to the whole and keeps the ratio by weight', () => {
		fc.assert(
			fc.property(within(0.01, 100), within(1, 200), within(1, 200), (total, a, b) => {
				const r = mixRatio({ totalKg: total, totalL: 0, ratioA: a, ratioB: b, ratioByVolume: 0, densityAGcm3: 1.1, densityBGcm3: 0.95 });
				expect(rel(r.partAKg + r.partBKg, total)).toBeLessThan(1e-12);
				expect(rel(r.partAKg / r.partBKg, a / b)).toBeLessThan(1e-9);
			})
		);
	});

	it('air test time never falls as the line gets longer, and 0.5 psig takes half of 1.0 psig', () => {
		fc.assert(
			fc.property(fc.integer({ min: 4, max: 60 }), within(1, 5000), within(0, 1000), (d, l, extra) => {
				const t = airTestSeconds({ diameterIn: d, lengthFt: l, dropPsig: 1 });
				expect(airTestSeconds({ diameterIn: d, lengthFt: l + extra, dropPsig: 1 })).toBeGreaterThanOrEqual(t);
				expect(airTestSeconds({ diameterIn: d, lengthFt: l, dropPsig: 0.5 })).toBeCloseTo(t / 2, 9);
			})
		);
	});

	it('water allowed grows linearly with length', () => {
		fc.assert(
			fc.property(within(50, 3000), within(0.1, 500), within(1, 2), (d, l, k) => {
				const a = waterTest({ diameterMm: d, lengthM: l, allowanceLPerM2: 0.15, manholeAreaM2: 0 }).allowedL;
				const b = waterTest({ diameterMm: d, lengthM: l * k, allowanceLPerM2: 0.15, manholeAreaM2: 0 }).allowedL;
				expect(rel(b, a * k)).toBeLessThan(1e-12);
			})
		);
	});

	it('an F1216 liner is never thinner with more groundwater, nor thicker with a stiffer resin', () => {
		fc.assert(
			fc.property(within(0.5, 20), within(1.01, 2), within(0, 10), (p, k, q) => {
				const base = {
					diameterIn: 12,
					pressurePsi: p,
					ovalityPercent: q,
					longTermModulusPsi: 150000,
					enhancementK: 7,
					poisson: 0.3,
					safetyFactor: 2,
					flexuralStrengthPsi: 2250
				};
				const t = f1216Partial(base).thicknessIn;
				expect(f1216Partial({ ...base, pressurePsi: p * k }).thicknessIn).toBeGreaterThanOrEqual(t);
				expect(f1216Partial({ ...base, longTermModulusPsi: 150000 * k }).thicknessIn).toBeLessThanOrEqual(t);
			})
		);
	});
});

/** Any value a spec allows. */
function valueFor(spec: InputSpec): fc.Arbitrary<number> {
	if (spec.choices) return fc.constantFrom(...spec.choices);
	if (spec.integer) return fc.integer({ min: spec.min, max: spec.max });
	return within(spec.min, spec.max);
}

describe('every calculator, over its whole allowed range', () => {
	for (const def of Object.values(calculators)) {
		it(`${def.id} either computes finite results or names the inconsistent field`, () => {
			const record = Object.fromEntries(def.inputs.map((s) => [s.name, valueFor(s)]));
			fc.assert(
				fc.property(fc.record(record), (inputs) => {
					const out = runCalculation(def.id, inputs);
					if (!out.ok) {
						expect(out.status).toBe(400);
						for (const key of Object.keys(out.errors)) expect(def.inputs.map((s) => s.name)).toContain(key);
						return;
					}
					for (const [name, value] of Object.entries(out.result)) {
						if (typeof value === 'number') expect(Number.isFinite(value), name).toBe(true);
					}
					expect(out.steps.every((s) => !/NaN|Infinity|undefined/.test(s))).toBe(true);
				}),
				{ numRuns: 200 }
			);
		});
	}
});
