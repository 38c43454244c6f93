/**
 * Materials for a straight point repair: glass mat, resin, laminate volume, mix ratio.
 */
import { SOURCES } from './sources';
import type { Alert, CalculatorDef, InputSpec } from './types';
import { given, num, qty, Worksheet } from './worksheet';

const RESIN_DATA_SHEET: Alert = {
	level: 'warning',
	title: 'Resins sensitise skin',
	text: 'Wear laminate-film or thick nitrile gloves (with spares), an apron and eye protection. The resin data sheet and safety data sheet come before any figure here.'
};

const PIPE_DIAMETER_MM: InputSpec = { name: 'diameterMm', label: 'Pipe internal diameter', unit: 'mm', default: 150, min: 50, max: 1600, step: 1 };
const PATCH_LENGTH_MM: InputSpec = { name: 'lengthMm', label: 'Patch length', unit: 'mm', default: 600, min: 100, max: 6000, step: 10 };
const PLIES: InputSpec = { name: 'plies', label: 'Plies of mat', unit: '', default: 3, min: 1, max: 8, step: 1, integer: true };

// ---------------------------------------------------------------- resin quantity

/**
 * Resin to glass by weight for hand lay-up (composites handbook ranges, from memory):
 * woven cloth 1.0–1.5; well-consolidated mat 1.5–1.9; chopped strand mat 25–35 % glass,
 * i.e. about 1.9–3 : 1. Outside 1.0–3.0 the calculator warns; below 1.9 it says lean for chopped mat.
 */
export const RESIN_GLASS_USUAL_MIN = 1;
export const RESIN_GLASS_CHOPPED_MAT_MIN = 1.9;
export const RESIN_GLASS_USUAL_MAX = 3;

export type ResinQuantityInputs = {
	diameterMm: number;
	lengthMm: number;
	plies: number;
	matWeightGm2: number;
	resinGlassRatio: number;
	wastePercent: number;
};

/**
 * Glass and resin by weight for a patch of `plies` plies of mat (common practice):
 * glass = n × π × D × L × w; resin = glass × r; with waste = resin × (1 + waste).
 */
export function resinQuantity(i: ResinQuantityInputs) {
	const matAreaM2 = i.plies * Math.PI * (i.diameterMm / 1000) * (i.lengthMm / 1000);
	const glassKg = (matAreaM2 * i.matWeightGm2) / 1000;
	const resinKg = glassKg * i.resinGlassRatio;
	const resinWithWasteKg = resinKg * (1 + i.wastePercent / 100);
	return { matAreaM2, glassKg, resinKg, resinWithWasteKg };
}

export const resinQuantityCalculator: CalculatorDef<ResinQuantityInputs> = {
	id: 'resin-quantity',
	title: 'Resin quantity',
	summary: 'Glass and resin by weight for a patch, with a waste allowance.',
	lesson: '/courses/point-repair-installer/resin-quantity',
	system: 'metric',
	inputs: [
		PIPE_DIAMETER_MM,
		PATCH_LENGTH_MM,
		PLIES,
		{ name: 'matWeightGm2', label: 'Mat weight', unit: 'g/m2', default: 1000, min: 100, max: 3000, step: 10 },
		{
			name: 'resinGlassRatio',
			label: 'Resin to glass ratio by weight',
			unit: '',
			default: 2,
			min: 0.5,
			max: 4,
			step: 0.1,
			help: 'From the mat or resin data sheet: kilograms of resin per kilogram of glass (chopped mat by hand about 1.9–3).'
		},
		{ name: 'wastePercent', label: 'Waste allowance', unit: '%', default: 15, min: 0, max: 100, step: 1, optional: true }
	],
	results: [
		{ name: 'matAreaM2', label: 'Mat area (all plies)', unit: 'm2' },
		{ name: 'glassKg', label: 'Glass', unit: 'kg' },
		{ name: 'resinKg', label: 'Resin', unit: 'kg' },
		{ name: 'resinWithWasteKg', label: 'Resin to mix, with waste', unit: 'kg' }
	],
	cautions: [RESIN_DATA_SHEET],
	compute(i) {
		const r = resinQuantity(i);
		const w = new Worksheet([SOURCES.geometryCylinder, SOURCES.resinRatio, SOURCES.wasteAllowance]);
		w.step(
			`Mat area = n × π × D × L = ${i.plies} × π × ${qty(i.diameterMm / 1000, 'm')} × ${qty(i.lengthMm / 1000, 'm')} = ${qty(r.matAreaM2, 'm2')}`
		);
		w.step(
			`Glass = area × mat weight = ${qty(r.matAreaM2, 'm2')} × ${given(i.matWeightGm2, 'g/m2')} = ${qty(r.glassKg, 'kg')}`
		);
		w.step(`Resin = glass × ratio = ${qty(r.glassKg, 'kg')} × ${given(i.resinGlassRatio)} = ${qty(r.resinKg, 'kg')}`);
		w.step(
			`With waste = ${qty(r.resinKg, 'kg')} × (1 + ${given(i.wastePercent, '%')}) = ${qty(r.resinWithWasteKg, 'kg')}`
		);
		if (i.resinGlassRatio < RESIN_GLASS_USUAL_MIN || i.resinGlassRatio > RESIN_GLASS_USUAL_MAX) {
			w.warn(
				'caution',
				'Unusual resin to glass ratio',
				'Chopped mat by hand usually takes about 1.9–3 kg of resin per kg of glass (25–35 % glass), a well-consolidated mat about 1.5–1.9, woven cloth 1.0–1.5. Check the mat and resin data sheets.'
			);
		} else if (i.resinGlassRatio < RESIN_GLASS_CHOPPED_MAT_MIN) {
			w.warn(
				'caution',
				'Lean for chopped mat',
				'Below about 1.9 is a consolidated-mat or woven-cloth figure. For chopped mat wetted out by hand it can leave dry fibre: check the mat data sheet.'
			);
		}
		if (i.wastePercent < 10) {
			w.warn(
				'caution',
				'Small waste allowance',
				'Resin left in the bucket, on the sheet and on the tools is usually 10–20 %. Running short during wet-out leaves dry fibre, and a dry spot is a leak path.'
			);
		}
		return w.done(r);
	}
};

// ---------------------------------------------------------------- laminate volume

export type LaminateVolumeInputs = { diameterMm: number; thicknessMm: number; lengthMm: number };

/** Exact annulus inside a bore D: V = π × t × (D − t) × L (geometry). Litres. */
export function laminateVolumeL(i: LaminateVolumeInputs): number {
	return (Math.PI * i.thicknessMm * (i.diameterMm - i.thicknessMm) * i.lengthMm) / 1e6;
}

export const laminateVolumeCalculator: CalculatorDef<LaminateVolumeInputs> = {
	id: 'laminate-volume',
	title: 'Laminate volume',
	summary: 'The volume of the cured laminate ring inside the host pipe.',
	lesson: '/courses/point-repair-installer/resin-quantity',
	system: 'metric',
	inputs: [
		PIPE_DIAMETER_MM,
		{ name: 'thicknessMm', label: 'Laminate thickness', unit: 'mm', default: 3, min: 0.5, max: 50, step: 0.1 },
		PATCH_LENGTH_MM
	],
	results: [{ name: 'volumeL', label: 'Laminate volume', unit: 'L' }],
	check(i) {
		return i.thicknessMm * 2 >= i.diameterMm ? { thicknessMm: 'Must be less than half the diameter' } : {};
	},
	compute(i) {
		const volumeL = laminateVolumeL(i);
		const w = new Worksheet([SOURCES.geometryAnnulus]);
		w.step(
			`V = π × t × (D − t) × L = π × ${given(i.thicknessMm, 'mm')} × (${given(i.diameterMm, 'mm')} − ${given(i.thicknessMm, 'mm')}) × ${given(i.lengthMm, 'mm')} = ${num(volumeL * 1e6)} mm³ = ${qty(volumeL, 'L')}`
		);
		return w.done({ volumeL });
	}
};

// ---------------------------------------------------------------- mat size

export type MatSizeInputs = { diameterMm: number; plies: number; overlapMm: number; patchLengthMm: number };

/** Mat cut for a wrap of n plies (common practice): width around = n × π × D + overlap. */
export function matSize(i: MatSizeInputs) {
	const cutWidthMm = i.plies * Math.PI * i.diameterMm + i.overlapMm;
	const cutLengthMm = i.patchLengthMm;
	const areaM2 = (cutWidthMm / 1000) * (cutLengthMm / 1000);
	return { cutWidthMm, cutLengthMm, areaM2 };
}

/** Patch length must cover the defect plus 150 mm at each end (common practice). */
const MIN_END_COVER_MM = 150;

export const matSizeCalculator: CalculatorDef<MatSizeInputs> = {
	id: 'mat-size',
	title: 'Mat size',
	summary: 'Cut width and length of the glass mat for a wrap of several plies.',
	lesson: '/courses/point-repair-installer/measuring-and-sizing',
	system: 'metric',
	inputs: [
		{
			name: 'diameterMm',
			label: 'Pipe internal diameter',
			unit: 'mm',
			default: 150,
			min: 50,
			max: 1600,
			step: 1,
			help: 'For a transition, the larger diameter.'
		},
		PLIES,
		{ name: 'overlapMm', label: 'Overlap of the last ply', unit: 'mm', default: 50, min: 0, max: 500, step: 5 },
		{
			name: 'patchLengthMm',
			label: 'Patch length',
			unit: 'mm',
			default: 600,
			min: 100,
			max: 6000,
			step: 10,
			help: 'Defect length plus at least 150 mm at each end.',
			helpBySystem: { imperial: 'Defect length plus at least 6 in (150 mm) at each end.' }
		}
	],
	results: [
		{ name: 'cutWidthMm', label: 'Cut width (around the packer)', unit: 'mm' },
		{ name: 'cutLengthMm', label: 'Cut length (along the pipe)', unit: 'mm' },
		{ name: 'areaM2', label: 'Mat area', unit: 'm2' }
	],
	compute(i) {
		const r = matSize(i);
		const w = new Worksheet([SOURCES.matWrap]);
		w.step(
			`Cut width = n × π × D + overlap = ${i.plies} × π × ${given(i.diameterMm, 'mm')} + ${given(i.overlapMm, 'mm')} = ${qty(r.cutWidthMm, 'mm')}`
		);
		w.step(`Cut length = patch length = ${qty(r.cutLengthMm, 'mm')}`);
		w.step(
			`Area = width × length = ${qty(r.cutWidthMm / 1000, 'm')} × ${qty(r.cutLengthMm / 1000, 'm')} = ${qty(r.areaM2, 'm2')}`
		);
		if (i.patchLengthMm < 2 * MIN_END_COVER_MM + 1) {
			w.warn(
				'caution',
				'Patch too short to cover a defect',
				'A patch needs at least 150 mm of sound pipe beyond each end of the defect, so it is always longer than 300 mm.'
			);
		}
		return w.done(r);
	}
};

// ---------------------------------------------------------------- mix ratio

export type MixRatioInputs = {
	totalKg: number;
	totalL: number;
	ratioA: number;
	ratioB: number;
	ratioByVolume: number;
	densityAGcm3: number;
	densityBGcm3: number;
};

/**
 * Splits a two-part mix. A ratio by volume becomes a ratio by mass through the densities
 * (g/cm³ = kg/L); a total given by volume assumes the parts' volumes add.
 */
export function massFractionA(i: MixRatioInputs): number {
	const massA = i.ratioByVolume === 1 ? i.ratioA * i.densityAGcm3 : i.ratioA;
	const massB = i.ratioByVolume === 1 ? i.ratioB * i.densityBGcm3 : i.ratioB;
	return massA / (massA + massB);
}

export function mixRatio(i: MixRatioInputs) {
	const fractionA = massFractionA(i);
	const litresPerKg = fractionA / i.densityAGcm3 + (1 - fractionA) / i.densityBGcm3;
	const mixKg = i.totalL > 0 ? i.totalL / litresPerKg : i.totalKg;
	const partAKg = mixKg * fractionA;
	const partBKg = mixKg - partAKg;
	const partAL = partAKg / i.densityAGcm3;
	const partBL = partBKg / i.densityBGcm3;
	return { partAKg, partBKg, partAL, partBL, mixKg, mixL: partAL + partBL };
}

export const mixRatioCalculator: CalculatorDef<MixRatioInputs> = {
	id: 'mix-ratio',
	title: 'Mix ratio',
	summary: 'How much part A and part B to meter for a batch, by weight or by volume.',
	lesson: '/courses/point-repair-installer/materials',
	system: 'metric',
	inputs: [
		{ name: 'totalKg', label: 'Mixed resin needed', unit: 'kg', default: 1.2, min: 0.01, max: 500, step: 0.01 },
		{
			name: 'totalL',
			label: 'Or mixed volume needed',
			unit: 'L',
			default: 0,
			min: 0,
			max: 500,
			step: 0.01,
			optional: true,
			help: 'Leave at 0 to use the mass; any volume above 0 replaces the mass.'
		},
		{ name: 'ratioA', label: 'Ratio, part A', unit: '', default: 100, min: 0.01, max: 1000, step: 1 },
		{ name: 'ratioB', label: 'Ratio, part B', unit: '', default: 50, min: 0.01, max: 1000, step: 1 },
		{
			name: 'ratioByVolume',
			label: 'The ratio is given',
			unit: '',
			default: 0,
			min: 0,
			max: 1,
			integer: true,
			optional: true,
			choices: [0, 1],
			choiceLabels: ['by weight', 'by volume']
		},
		{ name: 'densityAGcm3', label: 'Density of part A', unit: 'g/cm3', default: 1.15, min: 0.5, max: 3, step: 0.01, optional: true },
		{ name: 'densityBGcm3', label: 'Density of part B', unit: 'g/cm3', default: 1, min: 0.5, max: 3, step: 0.01, optional: true }
	],
	results: [
		{ name: 'partAKg', label: 'Part A', unit: 'kg' },
		{ name: 'partBKg', label: 'Part B', unit: 'kg' },
		{ name: 'partAL', label: 'Part A by volume', unit: 'L' },
		{ name: 'partBL', label: 'Part B by volume', unit: 'L' },
		{ name: 'mixKg', label: 'Mix', unit: 'kg' },
		{ name: 'mixL', label: 'Mix by volume', unit: 'L' }
	],
	cautions: [
		RESIN_DATA_SHEET,
		{
			level: 'caution',
			title: 'A big batch cures faster',
			text: 'A large mass of mixed resin heats itself and shortens its own pot life. Meter to the data sheet ratio and start the pot-life clock at mixing.'
		}
	],
	compute(i) {
		const r = mixRatio(i);
		const fractionA = massFractionA(i);
		const w = new Worksheet([SOURCES.mixRatio]);
		const ratio = `${given(i.ratioA)} : ${given(i.ratioB)}`;
		if (i.ratioByVolume === 1) {
			w.step(
				`Ratio by volume ${ratio} → by weight ${given(i.ratioA)} × ${given(i.densityAGcm3, 'g/cm3')} : ${given(i.ratioB)} × ${given(i.densityBGcm3, 'g/cm3')}, part A = ${num(fractionA * 100)} % of the mass`
			);
		} else {
			w.step(`Ratio by weight ${ratio}: part A = ${given(i.ratioA)} ÷ (${given(i.ratioA)} + ${given(i.ratioB)}) = ${num(fractionA * 100)} % of the mass`);
		}
		if (i.totalL > 0) {
			w.step(
				`Mix mass = volume ÷ (fraction A ÷ ρA + fraction B ÷ ρB) = ${given(i.totalL, 'L')} ÷ ${num(fractionA / i.densityAGcm3 + (1 - fractionA) / i.densityBGcm3)} L/kg = ${qty(r.mixKg, 'kg')}`
			);
		}
		w.step(`Part A = ${qty(r.mixKg, 'kg')} × ${num(fractionA, 4)} = ${qty(r.partAKg, 'kg')} (${qty(r.partAL, 'L')})`);
		w.step(`Part B = ${qty(r.mixKg, 'kg')} × ${num(1 - fractionA, 4)} = ${qty(r.partBKg, 'kg')} (${qty(r.partBL, 'L')})`);
		return w.done(r);
	}
};
