/**
 * The taper of a concentric transition patch, treated as a cone frustum.
 */
import { SOURCES } from './sources';
import type { CalculatorDef } from './types';
import { given, num, qty, Worksheet } from './worksheet';

export type TransitionAreaInputs = {
	smallDiameterMm: number;
	largeDiameterMm: number;
	taperLengthMm: number;
};

/**
 * Frustum side (geometry): s = √((r₂ − r₁)² + h²), A = π (r₁ + r₂) s.
 * Unrolled, the side is a ring sector centred on the cone's apex: outer radius
 * R₂ = r₂ s / (r₂ − r₁), inner R₁ = r₁ s / (r₂ − r₁), angle θ = 360° × (r₂ − r₁) / s.
 * Requires r₂ > r₁ (a cylinder unrolls to a rectangle, not a sector).
 */
export function transitionArea(i: TransitionAreaInputs) {
	const r1 = i.smallDiameterMm / 2;
	const r2 = i.largeDiameterMm / 2;
	const slantMm = Math.hypot(r2 - r1, i.taperLengthMm);
	const areaM2 = (Math.PI * (r1 + r2) * slantMm) / 1e6;
	const patternOuterRadiusMm = (r2 * slantMm) / (r2 - r1);
	const patternInnerRadiusMm = patternOuterRadiusMm - slantMm;
	const patternAngleDeg = (360 * (r2 - r1)) / slantMm;
	const smallEndPlyFactor = i.largeDiameterMm / i.smallDiameterMm;
	return {
		slantMm,
		areaM2,
		patternInnerRadiusMm,
		patternOuterRadiusMm,
		patternAngleDeg,
		smallEndPlyFactor
	};
}

export const transitionAreaCalculator: CalculatorDef<TransitionAreaInputs> = {
	id: 'transition-area',
	title: 'Transition taper',
	summary: 'Slant length and area of the taper, and the flat pattern to cut a taper piece.',
	lesson: '/courses/transition-patches/sizing-the-taper',
	system: 'metric',
	inputs: [
		{ name: 'smallDiameterMm', label: 'Smaller pipe diameter', unit: 'mm', default: 100, min: 50, max: 1500, step: 1 },
		{ name: 'largeDiameterMm', label: 'Larger pipe diameter', unit: 'mm', default: 150, min: 50, max: 1600, step: 1 },
		{ name: 'taperLengthMm', label: 'Taper length along the pipe', unit: 'mm', default: 100, min: 10, max: 2000, step: 5 }
	],
	results: [
		{ name: 'slantMm', label: 'Slant length of the taper', unit: 'mm' },
		{ name: 'areaM2', label: 'Taper area', unit: 'm2' },
		{ name: 'patternInnerRadiusMm', label: 'Flat pattern inner radius', unit: 'mm' },
		{ name: 'patternOuterRadiusMm', label: 'Flat pattern outer radius', unit: 'mm' },
		{ name: 'patternAngleDeg', label: 'Flat pattern angle', unit: 'deg' },
		{ name: 'smallEndPlyFactor', label: 'Plies at the small end, per ply cut for the large end', unit: '' }
	],
	check(i) {
		return i.largeDiameterMm > i.smallDiameterMm
			? {}
			: { largeDiameterMm: 'Must be larger than the smaller pipe diameter' };
	},
	compute(i) {
		const r = transitionArea(i);
		const r1 = i.smallDiameterMm / 2;
		const r2 = i.largeDiameterMm / 2;
		const w = new Worksheet([SOURCES.geometryFrustum]);
		w.step(
			`Slant s = √((r₂ − r₁)² + h²) = √((${qty(r2, 'mm')} − ${qty(r1, 'mm')})² + (${given(i.taperLengthMm, 'mm')})²) = ${qty(r.slantMm, 'mm', 4)}`
		);
		w.step(
			`Area = π × (r₁ + r₂) × s = π × (${qty(r1 / 1000, 'm')} + ${qty(r2 / 1000, 'm')}) × ${qty(r.slantMm / 1000, 'm', 4)} = ${qty(r.areaM2, 'm2')}`
		);
		w.step(
			`Flat pattern outer radius R₂ = r₂ × s ÷ (r₂ − r₁) = ${qty(r2, 'mm')} × ${qty(r.slantMm, 'mm', 4)} ÷ ${qty(r2 - r1, 'mm')} = ${qty(r.patternOuterRadiusMm, 'mm', 4)}`
		);
		w.step(
			`Inner radius R₁ = R₂ − s = ${qty(r.patternOuterRadiusMm, 'mm', 4)} − ${qty(r.slantMm, 'mm', 4)} = ${qty(r.patternInnerRadiusMm, 'mm', 4)}`
		);
		w.step(
			`Angle θ = 360° × (r₂ − r₁) ÷ s = 360° × ${qty(r2 - r1, 'mm')} ÷ ${qty(r.slantMm, 'mm', 4)} = ${num(r.patternAngleDeg)}°`
		);
		w.step(
			`A mat cut for the large end carries D₂ ÷ D₁ = ${given(i.largeDiameterMm)} ÷ ${given(i.smallDiameterMm)} = ${num(r.smallEndPlyFactor)} × its plies at the small end`
		);
		if (r.smallEndPlyFactor >= 1.25) {
			w.warn(
				'caution',
				'Expect folds at the small end',
				`A mat sized for the larger pipe holds ${num(r.smallEndPlyFactor)} times the plies once it closes down on the smaller pipe. Size the taper piece from the flat pattern, and make sure the small side can still open fully.`
			);
		}
		return w.done(r);
	}
};
