/** Problems on glass mat and resin: resin quantity, laminate volume, mat size, mix ratio. */
import type { Generator, Mistake } from '../types';
import { a, aPipe, g, inUnit, pickDefect, pickHost, pickWeighted, SEWER_BORES_MM, TRANSITIONS_MM } from './common';

/** Chopped and stitched glass mats sold for patch work, g/m² (common practice). */
const MAT_WEIGHTS = [450, 600, 900, 1000] as const;

const END_COVER_MM = 150;

/** Ranges shared by the mat and resin problems, with their basis. */
const BORE = { min: 100, max: 300, basis: 'DN100-300 sewers and drains, the scope of the courses (common practice)' };
const PATCH_LENGTH = { min: 320, max: 1200, basis: 'point-repair patches of about 0.3-1.2 m, the usual packer working lengths (common practice)' };
const PLIES = { min: 2, max: 4, basis: '2 to 4 plies of mat, 3 usual (common practice)' };

export const resinQuantityGenerator: Generator = {
	id: 'resin-quantity',
	calculator: 'resin-quantity',
	title: 'Resin for a patch',
	topic: 'Resin quantity',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		diameterMm: BORE,
		lengthMm: PATCH_LENGTH,
		defectMm: { min: 20, max: 600, basis: 'defect lengths along the pipe as surveys measure them, joints 20-200 mm, cracks and holes up to 600 mm (common practice)' },
		plies: PLIES,
		matWeightGm2: { min: 450, max: 1000, basis: 'chopped and stitched mats sold for patch work (common practice)' },
		resinGlassRatio: { min: 1.9, max: 3, basis: 'chopped strand mat by hand lay-up, 25-35 % glass by weight (composites handbook ranges, from memory)' },
		wastePercent: { min: 10, max: 20, basis: 'waste allowance of 10-20 % (common practice)' }
	},
	create(rng) {
		const diameterMm = rng.pick(SEWER_BORES_MM);
		const host = pickHost(rng, diameterMm);
		const { defect, lengthMm: defectMm } = pickDefect(rng);
		const fromDefect = rng.chance(0.5);
		const lengthMm = fromDefect ? defectMm + 2 * END_COVER_MM : rng.step(400, 1200, 100);
		const plies = pickWeighted(rng, [[2, 1], [3, 3], [4, 1]]);
		const matWeightGm2 = rng.pick(MAT_WEIGHTS);
		const resinGlassRatio = rng.step(1.9, 3, 0.1);
		const wastePercent = rng.pick([10, 15, 20]);
		const unit = rng.chance(0.75) ? 'kg' : 'g';
		const mat = `${plies} plies of ${g(matWeightGm2, 'g/m2')} glass mat`;
		const where = fromDefect
			? `${aPipe(diameterMm, host)} has ${a(defect)} measuring ${g(defectMm, 'mm')} along the pipe. The patch is to cover ${g(END_COVER_MM, 'mm')} of sound pipe beyond each end of the defect and is made of ${mat}.`
			: `${aPipe(diameterMm, host)} needs ${a(g(lengthMm, 'mm'))} patch made of ${mat}.`;
		return {
			inputs: { diameterMm, lengthMm, plies, matWeightGm2, resinGlassRatio, wastePercent },
			asks: 'resinWithWasteKg',
			unit,
			given: fromDefect ? { defectMm } : undefined,
			prompt:
				`${where} ` +
				`The data sheet calls for ${g(resinGlassRatio)} kg of resin per kg of glass, and you allow ${g(wastePercent, '%')} for waste. ` +
				`How much mixed resin (part A and part B together) do you prepare, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'Add the waste allowance: resin left in the bucket, on the sheet and on the tools is part of what you mix.', inputs: { ...i, wastePercent: 0 } },
			{ hint: 'The mat goes round the whole bore: use π × D with the diameter, not the radius.', inputs: { ...i, diameterMm: i.diameterMm / 2 } },
			{ hint: `Every ply takes resin: multiply the mat area by the ${i.plies} plies.`, inputs: { ...i, plies: 1 } },
			{ hint: 'That is the weight of the glass. The resin is the glass weight times the resin-to-glass ratio, plus waste.', asks: 'glassKg' },
			{ hint: 'That is the resin before waste: add the waste allowance to it.', asks: 'resinKg' }
		];
		const defect = p.given?.defectMm;
		if (defect !== undefined) {
			list.push(
				{ hint: `The patch is longer than the defect: add ${g(END_COVER_MM, 'mm')} at each end.`, inputs: { ...i, lengthMm: defect } },
				{ hint: `The patch covers ${g(END_COVER_MM, 'mm')} beyond both ends, so add it twice.`, inputs: { ...i, lengthMm: defect + END_COVER_MM } }
			);
		}
		return list;
	}
};

export const laminateVolumeGenerator: Generator = {
	id: 'laminate-volume',
	calculator: 'laminate-volume',
	title: 'Laminate volume',
	topic: 'Resin quantity',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		diameterMm: BORE,
		thicknessMm: { min: 3, max: 6, basis: 'cured patch laminates of 3-6 mm in DN100-300 (common practice)' },
		lengthMm: PATCH_LENGTH
	},
	create(rng) {
		const diameterMm = rng.pick(SEWER_BORES_MM);
		const thicknessMm = rng.pick([3, 4, 4.5, 5, 6]);
		const lengthMm = rng.step(400, 1200, 100);
		const host = pickHost(rng, diameterMm);
		const unit = rng.chance(0.75) ? 'L' : 'mL';
		return {
			inputs: { diameterMm, thicknessMm, lengthMm },
			asks: 'volumeL',
			unit,
			prompt:
				`${aPipe(diameterMm, host)} gets ${a(g(lengthMm, 'mm'))} patch that cures to a ${g(thicknessMm, 'mm')} thick laminate inside the bore. ` +
				`What volume of laminate is that, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		return [
			{ hint: 'Use the bore diameter in V = π × t × (D − t) × L, not the radius.', inputs: { ...i, diameterMm: i.diameterMm / 2 } },
			{ hint: 'The laminate lies inside the bore: its mean diameter is D − t, not D + t.', inputs: { ...i, diameterMm: i.diameterMm + 2 * i.thicknessMm } }
		];
	}
};

export const matSizeGenerator: Generator = {
	id: 'mat-size',
	calculator: 'mat-size',
	title: 'Mat cut size',
	topic: 'Mat size',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		diameterMm: BORE,
		plies: PLIES,
		overlapMm: { min: 50, max: 100, basis: 'overlap of the last ply, 50-100 mm (common practice)' },
		patchLengthMm: PATCH_LENGTH,
		smallDiameterMm: { min: 100, max: 225, basis: 'small side of the common concentric transitions (common practice)' }
	},
	create(rng) {
		const plies = pickWeighted(rng, [[2, 1], [3, 3], [4, 1]]);
		const overlapMm = rng.pick([50, 75, 100]);
		const patchLengthMm = rng.step(400, 1200, 100);
		const transition = rng.chance(0.3) ? rng.pick(TRANSITIONS_MM) : undefined;
		const diameterMm = transition ? transition[1] : rng.pick(SEWER_BORES_MM);
		const asksArea = rng.chance(0.25);
		const host = pickHost(rng, diameterMm);
		const situation = transition
			? `A transition from ${g(transition[0], 'mm')} to ${g(transition[1], 'mm')} gets ${a(g(patchLengthMm, 'mm'))} patch`
			: `${aPipe(diameterMm, host)} gets ${a(g(patchLengthMm, 'mm'))} patch`;
		return {
			inputs: { diameterMm, plies, overlapMm, patchLengthMm },
			asks: asksArea ? 'areaM2' : 'cutWidthMm',
			unit: asksArea ? 'm2' : 'mm',
			given: transition ? { smallDiameterMm: transition[0] } : undefined,
			prompt:
				`${situation} of ${plies} plies, the last ply overlapping by ${g(overlapMm, 'mm')}.${transition ? ' The mat is cut for the larger pipe.' : ''} ` +
				(asksArea
					? 'What area of glass mat do you cut, in square metres?'
					: 'How wide do you cut the mat (the width that goes around the packer), in millimetres?')
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'Add the overlap of the last ply to the width around.', inputs: { ...i, overlapMm: 0 } },
			{ hint: `The width around is one circumference per ply: ${i.plies} × π × D.`, inputs: { ...i, plies: 1 } },
			{ hint: 'A circumference is π × diameter (or 2 × π × radius), not π × radius.', inputs: { ...i, diameterMm: i.diameterMm / 2 } }
		];
		const small = p.given?.smallDiameterMm;
		if (small !== undefined) {
			list.push({ hint: 'On a transition the mat is cut for the larger diameter, so that it opens fully there.', inputs: { ...i, diameterMm: small } });
		}
		return list;
	}
};

/** Two-part mixes as data sheets state them, part A : part B. */
const MIX_RATIOS: readonly [number, number][] = [
	[100, 50],
	[100, 30],
	[100, 25],
	[2, 1],
	[3, 1],
	[4, 1]
];

export const mixRatioGenerator: Generator = {
	id: 'mix-ratio',
	calculator: 'mix-ratio',
	title: 'Part A and part B',
	topic: 'Mix ratio',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		totalKg: { min: 0.6, max: 3, basis: 'mixed resin for one DN100-300 patch, as the resin quantity problems give (common practice)' },
		totalL: { min: 0, max: 0, basis: 'the batch is stated by mass' },
		ratioA: { min: 2, max: 100, basis: 'mix ratios as two-part data sheets state them, 100:25 to 2:1 (common practice)' },
		ratioB: { min: 1, max: 50, basis: 'mix ratios as two-part data sheets state them (common practice)' },
		ratioByVolume: { min: 0, max: 1, basis: 'ratio stated by weight or by volume' },
		densityAGcm3: { min: 1.1, max: 1.2, basis: 'liquid resins about 1.1-1.2 g/cm³ (from memory)' },
		densityBGcm3: { min: 0.95, max: 1.05, basis: 'amine hardeners about 0.95-1.05 g/cm³ (from memory)' }
	},
	create(rng) {
		const [ratioA, ratioB] = rng.pick(MIX_RATIOS);
		const byVolume = rng.chance(0.25) ? 1 : 0;
		const totalKg = rng.step(0.6, 3, 0.1);
		const densityAGcm3 = rng.pick([1.1, 1.15, 1.2]);
		const densityBGcm3 = rng.pick([0.95, 1, 1.05]);
		const asksB = rng.chance(0.6);
		const unit = rng.chance(0.6) ? 'g' : 'kg';
		const density = byVolume
			? ` Part A weighs ${g(densityAGcm3, 'g/cm3')}, part B ${g(densityBGcm3, 'g/cm3')}, and you meter by weight on a scale.`
			: '';
		return {
			inputs: { totalKg, totalL: 0, ratioA, ratioB, ratioByVolume: byVolume, densityAGcm3, densityBGcm3 },
			asks: asksB ? 'partBKg' : 'partAKg',
			unit,
			prompt:
				`The resin data sheet sets the mix at ${g(ratioA)} : ${g(ratioB)} ${byVolume ? 'by volume' : 'by weight'} (part A : part B). ` +
				`You need ${g(totalKg, 'kg')} of mixed resin.${density} ` +
				`How much part ${asksB ? 'B' : 'A'} do you weigh out, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'The ratio reads part A : part B. You used it the other way round.', inputs: { ...i, ratioA: i.ratioB, ratioB: i.ratioA } }
		];
		if (p.asks === 'partBKg' && i.ratioA > i.ratioB) {
			list.push({
				hint: `Part B is ${g(i.ratioB)} parts of ${g(i.ratioA + i.ratioB)} in the whole mix, not ${g(i.ratioB)} parts of ${g(i.ratioA)}: B ÷ (A + B).`,
				inputs: { ...i, ratioA: i.ratioA - i.ratioB }
			});
		}
		if (p.asks === 'partAKg') {
			list.push({ hint: 'That is part B. Part A is the larger share here.', asks: 'partBKg' });
		}
		if (i.ratioByVolume === 1) {
			list.push({ hint: 'The ratio is by volume and you weigh the parts: turn it into a ratio by weight with each part’s density.', inputs: { ...i, ratioByVolume: 0 } });
		}
		return list;
	}
};
