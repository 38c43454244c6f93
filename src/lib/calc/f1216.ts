/**
 * Liner wall thickness for gravity pipe, ASTM F1216 Appendix X1 (design considerations).
 * Inch-pound units as in the standard: D in inches, pressures and moduli in psi, heights in ft.
 */
import { SOURCES } from './sources';
import type { Alert, CalculatorDef } from './types';
import { convert } from './units';
import { given, num, qty, Worksheet } from './worksheet';

/** Water pressure per foot of head as written in ASTM F1216 Eq. X1.3's load term (psi/ft). */
const PSI_PER_FT_WATER = 0.433;
/** ASTM F1216 Eq. X1.4 minimum stiffness E I / D³ (psi). */
const MIN_STIFFNESS_PSI = 0.093;
/**
 * ASTM F1216 X1: with no groundwater above the invert, a maximum DR of about 100 (from memory).
 * Applied to every design here, which can only thicken a liner.
 */
const MAX_DR = 100;

const DESIGN_CAUTION: Alert = {
	level: 'caution',
	title: 'A design aid, not a design',
	text: 'Liner design is the engineer of record’s call, with the liner maker’s tested long-term properties. Use this to check figures, not to set them.'
};

/** Ovality reduction factor, ASTM F1216 X1.1: C = ((1 − q)/(1 + q)²)³ with q as a fraction. */
export function ovalityFactor(ovalityPercent: number): number {
	const q = ovalityPercent / 100;
	return ((1 - q) / (1 + q) ** 2) ** 3;
}

/**
 * ASTM F1216 Eq. X1.1 solved for DR:
 * P = 2 K E_L / (1 − ν²) × 1 / (DR − 1)³ × C / N  ⇒  DR = 1 + ∛(2 K E_L C / ((1 − ν²) P N)).
 */
export function bucklingDr(p: {
	pressurePsi: number;
	longTermModulusPsi: number;
	enhancementK: number;
	poisson: number;
	safetyFactor: number;
	ovalityFactorC: number;
}): number {
	const ratio =
		(2 * p.enhancementK * p.longTermModulusPsi * p.ovalityFactorC) /
		((1 - p.poisson ** 2) * p.pressurePsi * p.safetyFactor);
	return 1 + Math.cbrt(ratio);
}

/**
 * ASTM F1216 Eq. X1.2 (oval pipe, bending) solved for DR, the positive root of
 * 1.5 q (1 + q) DR² − 0.5 (1 + q) DR − σ_L / (P N) = 0, q as a fraction.
 * A round pipe (q = 0) sets no limit: Infinity.
 */
export function bendingDr(p: {
	ovalityPercent: number;
	flexuralStrengthPsi: number;
	pressurePsi: number;
	safetyFactor: number;
}): number {
	const q = p.ovalityPercent / 100;
	const a = 1.5 * q * (1 + q);
	const b = -0.5 * (1 + q);
	const c = -p.flexuralStrengthPsi / (p.pressurePsi * p.safetyFactor);
	if (!(a > 0)) return Infinity;
	const dr = (-b + Math.sqrt(b * b - 4 * a * c)) / (2 * a);
	return Number.isNaN(dr) ? Infinity : dr;
}

// ---------------------------------------------------------------- partially deteriorated

export type F1216PartialInputs = {
	diameterIn: number;
	pressurePsi: number;
	ovalityPercent: number;
	longTermModulusPsi: number;
	enhancementK: number;
	poisson: number;
	safetyFactor: number;
	flexuralStrengthPsi: number;
};

/** Every figure of the partially deteriorated design, including each check's own DR. */
export function f1216PartialDetail(i: F1216PartialInputs) {
	const ovalityFactorC = ovalityFactor(i.ovalityPercent);
	const wet = i.pressurePsi > 0;
	const drBuckling = wet ? bucklingDr({ ...i, ovalityFactorC }) : Infinity;
	const drBending = wet && i.ovalityPercent > 0 ? bendingDr(i) : Infinity;
	const dr = Math.min(drBuckling, drBending, MAX_DR);
	const governs = dr === MAX_DR ? 'DR 100' : drBending < drBuckling ? 'X1.2' : 'X1.1';
	const thicknessIn = i.diameterIn / dr;
	return {
		ovalityFactorC,
		drBuckling,
		drBending,
		dr,
		thicknessIn,
		thicknessMm: convert(thicknessIn, 'in', 'mm'),
		// A check that sets no limit asks for no thickness.
		thicknessBucklingIn: i.diameterIn / drBuckling,
		thicknessBendingIn: i.diameterIn / drBending,
		governs
	};
}

/** The published results: each check's own DR stays out (it may be unbounded). */
function partialResult(detail: ReturnType<typeof f1216PartialDetail>) {
	const { ovalityFactorC, dr, thicknessIn, thicknessMm, thicknessBucklingIn, thicknessBendingIn, governs } = detail;
	return { ovalityFactorC, dr, thicknessIn, thicknessMm, thicknessBucklingIn, thicknessBendingIn, governs };
}

export function f1216Partial(i: F1216PartialInputs) {
	return partialResult(f1216PartialDetail(i));
}

const commonInputs = {
	ovalityPercent: {
		name: 'ovalityPercent',
		label: 'Ovality of the host pipe',
		unit: '%',
		default: 2,
		min: 0,
		max: 15,
		step: 0.5,
		help: '100 × (mean − smallest inside diameter) ÷ mean.'
	},
	longTermModulusPsi: {
		name: 'longTermModulusPsi',
		label: 'Long-term flexural modulus E_L',
		unit: 'psi',
		default: 125000,
		min: 10000,
		max: 2000000,
		step: 1000,
		help: 'Default: half the 250 000 psi felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value. Use the maker’s tested long-term figure.',
		helpBySystem: { metric: 'Default: half the 1724 MPa felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value. Use the maker’s tested long-term figure.' }
	},
	safetyFactor: {
		name: 'safetyFactor',
		label: 'Factor of safety N',
		unit: '',
		default: 2,
		min: 1,
		max: 5,
		step: 0.1,
		optional: true
	}
} as const;

export const f1216PartialCalculator: CalculatorDef<F1216PartialInputs> = {
	id: 'f1216-partial',
	title: 'Liner thickness, partially deteriorated pipe',
	summary: 'ASTM F1216 Appendix X1 wall thickness where the host pipe still carries the soil.',
	system: 'imperial',
	inputs: [
		{ name: 'diameterIn', label: 'Mean inside diameter of the host pipe', unit: 'in', default: 6, min: 4, max: 120, step: 0.5 },
		{
			name: 'pressurePsi',
			label: 'Groundwater pressure at the invert',
			unit: 'psi',
			default: 4.33,
			min: 0,
			max: 50,
			step: 0.01,
			help: '0.433 psi per foot of water above the invert.',
			helpBySystem: { metric: '9.81 kPa per metre of water above the invert.' }
		},
		commonInputs.ovalityPercent,
		commonInputs.longTermModulusPsi,
		{ name: 'enhancementK', label: 'Enhancement factor K', unit: '', default: 7, min: 1, max: 10, step: 0.5, optional: true },
		{ name: 'poisson', label: "Poisson's ratio", unit: '', default: 0.3, min: 0.2, max: 0.5, step: 0.01, optional: true },
		commonInputs.safetyFactor,
		{
			name: 'flexuralStrengthPsi',
			label: 'Long-term flexural strength σ_L',
			unit: 'psi',
			default: 2250,
			min: 500,
			max: 20000,
			step: 50,
			optional: true,
			help: 'For the oval-pipe bending check. Default: half the 4500 psi felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value.',
			helpBySystem: { metric: 'For the oval-pipe bending check. Default: half the 31 MPa felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value.' }
		}
	],
	results: [
		{ name: 'ovalityFactorC', label: 'Ovality reduction factor C', unit: '' },
		{ name: 'dr', label: 'Dimension ratio DR', unit: '' },
		{ name: 'thicknessIn', label: 'Wall thickness', unit: 'in' },
		{ name: 'thicknessMm', label: 'Wall thickness', unit: 'mm' },
		{ name: 'thicknessBucklingIn', label: 'Thickness for buckling (X1.1)', unit: 'in' },
		{ name: 'thicknessBendingIn', label: 'Thickness for bending of an oval pipe (X1.2)', unit: 'in' },
		{ name: 'governs', label: 'Governing check', unit: '' }
	],
	cautions: [DESIGN_CAUTION],
	compute(i) {
		const r = f1216PartialDetail(i);
		const w = new Worksheet([SOURCES.f1216X11, SOURCES.f1216X12, SOURCES.f1216Dr100, SOURCES.f1216Table1]);
		w.step(
			`C = ((1 − q) ÷ (1 + q)²)³ = ((1 − ${given(i.ovalityPercent / 100)}) ÷ (1 + ${given(i.ovalityPercent / 100)})²)³ = ${num(r.ovalityFactorC)}`
		);
		if (Number.isFinite(r.drBuckling)) {
			w.step(
				`X1.1: DR = 1 + ∛(2 K E_L C ÷ ((1 − ν²) P N)) = 1 + ∛(2 × ${given(i.enhancementK)} × ${given(i.longTermModulusPsi, 'psi')} × ${num(r.ovalityFactorC)} ÷ ((1 − ${given(i.poisson)}²) × ${given(i.pressurePsi, 'psi')} × ${given(i.safetyFactor)})) = ${num(r.drBuckling)}; t = ${given(i.diameterIn, 'in')} ÷ ${num(r.drBuckling)} = ${qty(r.thicknessBucklingIn, 'in')}`
			);
		} else {
			w.step('X1.1 sets no limit: no groundwater pressure above the invert.');
		}
		if (Number.isFinite(r.drBending)) {
			w.step(
				`X1.2: 1.5 q (1 + q) DR² − 0.5 (1 + q) DR = σ_L ÷ (P N) = ${given(i.flexuralStrengthPsi, 'psi')} ÷ (${given(i.pressurePsi, 'psi')} × ${given(i.safetyFactor)}) gives DR = ${num(r.drBending)}; t = ${qty(r.thicknessBendingIn, 'in')}`
			);
		} else {
			w.step('X1.2 sets no limit: the host pipe is round or carries no groundwater pressure.');
		}
		w.step(
			`${r.governs} governs (DR never above ${MAX_DR}): DR = ${num(r.dr)}, t = ${given(i.diameterIn, 'in')} ÷ ${num(r.dr)} = ${qty(r.thicknessIn, 'in')} = ${qty(r.thicknessMm, 'mm')}`
		);
		if (i.ovalityPercent > 10) {
			w.warn(
				'caution',
				'Very oval host pipe',
				'Above 10 % ovality the host pipe may no longer count as partially deteriorated. Have an engineer check the design.'
			);
		}
		return w.done(partialResult(r));
	}
};

// ---------------------------------------------------------------- fully deteriorated

export type F1216FullInputs = {
	diameterIn: number;
	groundwaterHeightFt: number;
	soilHeightFt: number;
	soilUnitWeightPcf: number;
	liveLoadPsi: number;
	soilModulusPsi: number;
	ovalityPercent: number;
	longTermModulusPsi: number;
	shortTermModulusPsi: number;
	safetyFactor: number;
};

export function f1216Full(i: F1216FullInputs) {
	const ovalityFactorC = ovalityFactor(i.ovalityPercent);
	// Water buoyancy factor, not below 0.67 (ASTM F1216 X1.3).
	const waterBuoyancyFactor = Math.max(0.67, 1 - 0.33 * (i.groundwaterHeightFt / i.soilHeightFt));
	// Coefficient of elastic support, H in feet (ASTM F1216 X1.3).
	const soilSupportFactor = 1 / (1 + 4 * Math.exp(-0.065 * i.soilHeightFt));
	const totalLoadPsi =
		PSI_PER_FT_WATER * i.groundwaterHeightFt +
		(i.soilUnitWeightPcf * i.soilHeightFt * waterBuoyancyFactor) / 144 +
		i.liveLoadPsi;
	// Eq. X1.3 with I = t³/12 solved for t: t³ = 12 D³ (q_t N)² / (32 R_w B' E's C E_L).
	const thicknessX13In =
		i.diameterIn *
		Math.cbrt(
			(12 * (totalLoadPsi * i.safetyFactor) ** 2) /
				(32 * waterBuoyancyFactor * soilSupportFactor * i.soilModulusPsi * ovalityFactorC * i.longTermModulusPsi)
		);
	// Eq. X1.4 with I = t³/12: t = D ∛(12 × 0.093 / E).
	const thicknessX14In = i.diameterIn * Math.cbrt((12 * MIN_STIFFNESS_PSI) / i.shortTermModulusPsi);
	const governs = thicknessX13In >= thicknessX14In ? 'X1.3' : 'X1.4';
	const thicknessIn = Math.max(thicknessX13In, thicknessX14In);
	return {
		ovalityFactorC,
		waterBuoyancyFactor,
		soilSupportFactor,
		totalLoadPsi,
		thicknessX13In,
		thicknessX14In,
		thicknessIn,
		thicknessMm: convert(thicknessIn, 'in', 'mm'),
		dr: i.diameterIn / thicknessIn,
		governs
	};
}

export const f1216FullCalculator: CalculatorDef<F1216FullInputs> = {
	id: 'f1216-full',
	title: 'Liner thickness, fully deteriorated pipe',
	summary: 'ASTM F1216 Appendix X1 wall thickness where the liner carries water, soil and live load, with the minimum-stiffness check.',
	system: 'imperial',
	inputs: [
		{ name: 'diameterIn', label: 'Mean inside diameter of the host pipe', unit: 'in', default: 12, min: 4, max: 120, step: 0.5 },
		{ name: 'groundwaterHeightFt', label: 'Groundwater above the top of the pipe', unit: 'ft', default: 5, min: 0, max: 100, step: 0.5 },
		{ name: 'soilHeightFt', label: 'Soil above the top of the pipe', unit: 'ft', default: 10, min: 1, max: 100, step: 0.5 },
		{ name: 'soilUnitWeightPcf', label: 'Soil unit weight', unit: 'lb/ft3', default: 120, min: 70, max: 160, step: 1, optional: true },
		{ name: 'liveLoadPsi', label: 'Live load on the pipe', unit: 'psi', default: 0, min: 0, max: 50, step: 0.1, optional: true },
		{ name: 'soilModulusPsi', label: "Modulus of soil reaction E's", unit: 'psi', default: 700, min: 50, max: 5000, step: 50, optional: true },
		commonInputs.ovalityPercent,
		commonInputs.longTermModulusPsi,
		{
			name: 'shortTermModulusPsi',
			label: 'Short-term flexural modulus E',
			unit: 'psi',
			default: 250000,
			min: 50000,
			max: 3000000,
			step: 1000,
			optional: true,
			help: 'For the minimum-stiffness check (X1.4). Default: the 250 000 psi felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value.',
			helpBySystem: { metric: 'For the minimum-stiffness check (X1.4). Default: the 1724 MPa felt-tube minimum of ASTM F1216 Table 1, not a patch laminate value.' }
		},
		commonInputs.safetyFactor
	],
	results: [
		{ name: 'ovalityFactorC', label: 'Ovality reduction factor C', unit: '' },
		{ name: 'waterBuoyancyFactor', label: 'Water buoyancy factor R_w', unit: '' },
		{ name: 'soilSupportFactor', label: "Coefficient of elastic support B'", unit: '' },
		{ name: 'totalLoadPsi', label: 'Total external load q_t', unit: 'psi' },
		{ name: 'thicknessX13In', label: 'Thickness for the load (X1.3)', unit: 'in' },
		{ name: 'thicknessX14In', label: 'Thickness for minimum stiffness (X1.4)', unit: 'in' },
		{ name: 'thicknessIn', label: 'Wall thickness', unit: 'in' },
		{ name: 'thicknessMm', label: 'Wall thickness', unit: 'mm' },
		{ name: 'dr', label: 'Dimension ratio DR', unit: '' },
		{ name: 'governs', label: 'Governing check', unit: '' }
	],
	cautions: [DESIGN_CAUTION],
	check(i) {
		return i.groundwaterHeightFt > i.soilHeightFt
			? { groundwaterHeightFt: 'Cannot be above the ground surface (the soil height)' }
			: {};
	},
	compute(i) {
		const r = f1216Full(i);
		const w = new Worksheet([SOURCES.f1216X13, SOURCES.f1216X14, SOURCES.f1216Table1]);
		w.step(`C = ((1 − q) ÷ (1 + q)²)³ with q = ${given(i.ovalityPercent / 100)}: C = ${num(r.ovalityFactorC)}`);
		w.step(
			`R_w = 1 − 0.33 × H_w ÷ H = 1 − 0.33 × ${given(i.groundwaterHeightFt, 'ft')} ÷ ${given(i.soilHeightFt, 'ft')} = ${num(r.waterBuoyancyFactor)} (not below 0.67)`
		);
		w.step(`B' = 1 ÷ (1 + 4 e^(−0.065 H)) = 1 ÷ (1 + 4 e^(−0.065 × ${given(i.soilHeightFt)})) = ${num(r.soilSupportFactor)}`);
		w.step(
			`q_t = 0.433 H_w + w H R_w ÷ 144 + W_s = 0.433 × ${given(i.groundwaterHeightFt)} + ${given(i.soilUnitWeightPcf)} × ${given(i.soilHeightFt)} × ${num(r.waterBuoyancyFactor)} ÷ 144 + ${given(i.liveLoadPsi)} = ${qty(r.totalLoadPsi, 'psi')}`
		);
		w.step(
			`X1.3: t = D ∛(12 (q_t N)² ÷ (32 R_w B' E's C E_L)) = ${given(i.diameterIn, 'in')} × ∛(12 × (${num(r.totalLoadPsi)} × ${given(i.safetyFactor)})² ÷ (32 × ${num(r.waterBuoyancyFactor)} × ${num(r.soilSupportFactor)} × ${given(i.soilModulusPsi)} × ${num(r.ovalityFactorC)} × ${given(i.longTermModulusPsi)})) = ${qty(r.thicknessX13In, 'in')}`
		);
		w.step(
			`X1.4: t = D ∛(12 × 0.093 ÷ E) = ${given(i.diameterIn, 'in')} × ∛(1.116 ÷ ${given(i.shortTermModulusPsi, 'psi')}) = ${qty(r.thicknessX14In, 'in')}`
		);
		w.step(`${r.governs} governs: t = ${qty(r.thicknessIn, 'in')} = ${qty(r.thicknessMm, 'mm')}, DR = ${num(r.dr)}`);
		return w.done(r);
	}
};
