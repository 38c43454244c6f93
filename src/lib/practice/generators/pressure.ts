/** Problems on packer pressure: groundwater head, the pressure window (with safe-or-not decisions), end thrust. */
import { convert } from '../../calc/units';
import { num } from '../../calc/worksheet';
import type { Rng } from '../random';
import type { Choice, Generator, Mistake, Problem } from '../types';
import { g, inUnit, pickWeighted, TRANSITIONS_MM } from './common';

/** A head of water over the invert, stated directly or as two depths read at the manhole. */
function headSituation(rng: Rng): { headM: number; depthM?: number; waterBelowCoverM?: number; text: string } {
	if (rng.chance(0.5)) {
		const headM = rng.step(1, 5, 0.1);
		return { headM, text: `Groundwater stands ${g(headM, 'm')} above the pipe invert.` };
	}
	const depthM = rng.step(2.5, 6, 0.5);
	const waterBelowCoverM = rng.step(0.5, depthM - 1, 0.5);
	const headM = Number((depthM - waterBelowCoverM).toFixed(2));
	return {
		headM,
		depthM,
		waterBelowCoverM,
		text: `At the manhole the invert is ${g(depthM, 'm')} below the cover, and groundwater stands ${g(waterBelowCoverM, 'm')} below the cover.`
	};
}

function depthMistakes(p: Problem, field: string): Mistake[] {
	const { depthM, waterBelowCoverM } = p.given ?? {};
	if (depthM === undefined || waterBelowCoverM === undefined) return [];
	return [
		{
			hint: 'The head is the height of water above the invert: invert depth minus the depth to the water, not the whole manhole depth.',
			inputs: { ...p.inputs, [field]: depthM }
		},
		{
			hint: 'The depth to the water from the cover is not the head. Take it away from the invert depth.',
			inputs: { ...p.inputs, [field]: waterBelowCoverM }
		}
	];
}

const PRESSURE_RESULTS: Record<string, string> = { kPa: 'pressureKPa', bar: 'pressureBar', psi: 'pressurePsi' };

export const groundwaterHeadGenerator: Generator = {
	id: 'groundwater-head',
	calculator: 'groundwater-head',
	title: 'Groundwater head to pressure',
	topic: 'Groundwater head',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		headM: { min: 0.5, max: 6, basis: 'groundwater 0.5-6 m over the invert on patch jobs (common practice)' },
		depthM: { min: 2.5, max: 6, basis: 'invert depths of 2.5-6 m at the manhole (common practice)' },
		waterBelowCoverM: { min: 0.5, max: 5, basis: 'water table 0.5 m below the cover or deeper (common practice)' }
	},
	create(rng) {
		const head = headSituation(rng);
		const unit = pickWeighted(rng, [['bar', 2], ['kPa', 1], ['psi', 1]] as [string, number][]);
		return {
			inputs: { headM: head.headM },
			asks: PRESSURE_RESULTS[unit],
			unit,
			given: head.depthM === undefined ? undefined : { depthM: head.depthM, waterBelowCoverM: head.waterBelowCoverM! },
			prompt: `${head.text} What pressure does the groundwater put on the pipe at the invert, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		return depthMistakes(p, 'headM');
	}
};

/**
 * Packer ratings by bore, the example maker's table the packer-rating lesson teaches
 * (2.5 bar up to 150 mm, 2.0 bar from 151 to 225 mm, 1.5 bar from 226 to 300 mm). Typical
 * values from memory, no published source: each maker rates its own packers, and ratings
 * fall as the diameter grows.
 */
export const RATINGS: readonly [boreMm: number, ratedMaxBar: number][] = [
	[100, 2.5],
	[150, 2.5],
	[200, 2],
	[225, 2],
	[250, 1.5],
	[300, 1.5]
];

/**
 * A light large-bore packer whose maker rates it at only 1.0 bar in a 300 mm pipe (within the
 * 1-2 bar typical of DN200-300 packers, from memory): with a deep water table it has no window.
 */
const LIGHT_PACKER: readonly [boreMm: number, ratedMaxBar: number] = [300, 1];

/** Is a planned pressure safe? Only asked where a window exists, so exactly one choice is right. */
export const PLAN_CHOICES: Choice[] = [
	{ value: 'too-low', label: 'Too low: the groundwater could lift the patch' },
	{ value: 'inside', label: 'Safe: inside the pressure window' },
	{ value: 'too-high', label: "Too high: above the packer's rating" }
];

/** Is there a safe pressure at all? Asked without a planned pressure, so the two choices exclude each other. */
export const WINDOW_CHOICES: Choice[] = [
	{ value: 'window', label: 'Yes: a pressure above the groundwater plus the margin and within the rating exists; inflate within it' },
	{ value: 'no-window', label: 'No: the groundwater plus the margin is above the rating; do not inflate with this packer' }
];

/** Proposed pressures stay at least this far from either edge of the window: no trick questions. */
const CLEAR_OF_EDGE_BAR = 0.05;

/** Groundwater over the invert on patch jobs: 0.5-6 m (common practice). */
const HEAD_M = { min: 0.5, max: 6 };
/** Deep sewers in a high water table: 6-8 m over the invert, met in city centres (common practice). */
const DEEP_HEAD_M = { min: 6, max: 8 };

function proposeDecision(rng: Rng) {
	for (;;) {
		const [diameterMm, ratedMaxBar] = rng.pick(RATINGS);
		const marginBar = rng.pick([0.2, 0.3, 0.5]);
		const headM = rng.step(1, HEAD_M.max, 0.5);
		const minBar = convert(headM, 'mH2O', 'bar') + marginBar;
		if (minBar > ratedMaxBar - 2 * CLEAR_OF_EDGE_BAR) continue;
		const region = rng.pick(['too-low', 'inside', 'too-high']);
		const lo = region === 'too-low' ? 0.2 : region === 'inside' ? minBar : ratedMaxBar;
		const hi = region === 'too-low' ? minBar : region === 'too-high' ? ratedMaxBar + 1 : ratedMaxBar;
		const inPsi = rng.chance(0.35);
		const proposed = inPsi
			? rng.int(Math.ceil(convert(Math.max(lo, 0.2), 'bar', 'psi')), Math.floor(convert(hi, 'bar', 'psi')))
			: rng.step(Math.ceil(Math.max(lo, 0.2) * 10) / 10, Math.floor(hi * 10) / 10, 0.1);
		const proposedBar = inPsi ? convert(proposed, 'psi', 'bar') : proposed;
		if (!(proposedBar > 0)) continue;
		if (Math.abs(proposedBar - minBar) < CLEAR_OF_EDGE_BAR || Math.abs(proposedBar - ratedMaxBar) < CLEAR_OF_EDGE_BAR) continue;
		if (proposedBar < lo - 1e-9 || proposedBar > hi + 1e-9) continue;
		return { diameterMm, ratedMaxBar, marginBar, headM, proposed, proposedBar, inPsi };
	}
}

/** A job where the question is whether any pressure is safe: about half of them have none. */
function windowQuestion(rng: Rng) {
	for (;;) {
		const none = rng.chance(0.5);
		const [diameterMm, ratedMaxBar] = none ? LIGHT_PACKER : rng.pick([...RATINGS, LIGHT_PACKER]);
		const marginBar = rng.pick([0.3, 0.5]);
		const headM = none || ratedMaxBar === LIGHT_PACKER[1] ? rng.step(DEEP_HEAD_M.min - 2, DEEP_HEAD_M.max, 0.5) : rng.step(1, HEAD_M.max, 0.5);
		const minBar = convert(headM, 'mH2O', 'bar') + marginBar;
		// Clear of the edge either way: no trick questions.
		if (Math.abs(minBar - ratedMaxBar) < CLEAR_OF_EDGE_BAR) continue;
		if (none !== minBar > ratedMaxBar) continue;
		return { diameterMm, ratedMaxBar, marginBar, headM };
	}
}

export const pressureWindowGenerator: Generator = {
	id: 'pressure-window',
	calculator: 'pressure-window',
	title: 'Pressure window',
	topic: 'Pressure window',
	level: 'foundation',
	tolerancePercent: 2,
	ranges: {
		groundwaterHeadM: { min: 0.5, max: DEEP_HEAD_M.max, basis: 'groundwater 0.5-6 m over the invert, up to 8 m in deep city sewers (common practice)' },
		marginBar: { min: 0.2, max: 0.5, basis: 'margins of 0.2-0.5 bar over the head that crews and specifications use (common practice)' },
		ratedMaxBar: { min: 1, max: 2.5, basis: "the lesson's example ratings, 1.5-2.5 bar at DN100-300, and a light 300 mm packer rated 1.0 bar (from memory)" },
		proposedBar: { min: 0.2, max: 3.5, basis: 'gauge settings a crew might plan, up to 1 bar over the rating' },
		proposedPsi: { min: 3, max: 51, basis: 'the same plans read on a psi gauge' },
		depthM: { min: 2.5, max: 6, basis: 'invert depths of 2.5-6 m at the manhole (common practice)' },
		waterBelowCoverM: { min: 0.5, max: 5, basis: 'water table 0.5 m below the cover or deeper (common practice)' }
	},
	create(rng) {
		const kind = rng.float();
		if (kind < 0.35) {
			const d = proposeDecision(rng);
			const reading = d.inPsi ? g(d.proposed, 'psi') : g(d.proposed, 'bar');
			const given: Record<string, number> = d.inPsi ? { proposedBar: d.proposedBar, proposedPsi: d.proposed } : { proposedBar: d.proposedBar };
			return {
				kind: 'choice',
				choices: PLAN_CHOICES,
				inputs: { groundwaterHeadM: d.headM, marginBar: d.marginBar, ratedMaxBar: d.ratedMaxBar },
				asks: 'decision',
				unit: '',
				given,
				prompt:
					`A packer for a ${g(d.diameterMm, 'mm')} pipe is rated by its maker at ${g(d.ratedMaxBar, 'bar')} for that diameter. ` +
					`Groundwater stands ${g(d.headM, 'm')} above the invert, and the crew keeps a margin of ${g(d.marginBar, 'bar')} above the head. ` +
					`The plan is to hold the cure at ${reading}. Is that pressure safe?`
			};
		}
		if (kind < 0.5) {
			const d = windowQuestion(rng);
			return {
				kind: 'choice',
				choices: WINDOW_CHOICES,
				inputs: { groundwaterHeadM: d.headM, marginBar: d.marginBar, ratedMaxBar: d.ratedMaxBar },
				asks: 'decision',
				unit: '',
				prompt:
					`The packer on the van for a ${g(d.diameterMm, 'mm')} pipe is rated by its maker at ${g(d.ratedMaxBar, 'bar')} for that diameter. ` +
					`Groundwater stands ${g(d.headM, 'm')} above the invert, and the crew keeps a margin of ${g(d.marginBar, 'bar')} above the head. ` +
					'Is there a pressure that is safe to cure at with this packer?'
			};
		}
		const head = headSituation(rng);
		const [diameterMm, ratedMaxBar] = rng.pick(RATINGS);
		const marginBar = rng.pick([0.2, 0.3, 0.5]);
		const unit = pickWeighted(rng, [['bar', 2], ['psi', 1], ['kPa', 1]] as [string, number][]);
		return {
			inputs: { groundwaterHeadM: head.headM, marginBar, ratedMaxBar },
			asks: 'minBar',
			unit,
			given: head.depthM === undefined ? undefined : { depthM: head.depthM, waterBelowCoverM: head.waterBelowCoverM! },
			prompt:
				`You are placing a patch in a ${g(diameterMm, 'mm')} pipe with a packer rated at ${g(ratedMaxBar, 'bar')} for that diameter. ${head.text} ` +
				`The crew keeps a margin of ${g(marginBar, 'bar')} above the groundwater. What is the lowest inflation pressure, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		return [
			{ hint: 'Add the margin on top of the groundwater pressure: at exactly the head a small error lets the patch lift.', inputs: { ...p.inputs, marginBar: 0 } },
			...depthMistakes(p, 'groundwaterHeadM')
		];
	},
	decide(p, r) {
		if (p.given?.proposedBar === undefined) return r.ok === true ? 'window' : 'no-window';
		const proposed = p.given.proposedBar;
		if (proposed < Number(r.minBar)) return 'too-low';
		if (proposed > Number(r.maxBar)) return 'too-high';
		return 'inside';
	},
	choiceHint(p, r, chosen) {
		const right = pressureWindowGenerator.decide!(p, r);
		const lowest = `${num(Number(r.minBar))} bar`;
		const rating = `${num(Number(r.maxBar))} bar`;
		const psi = p.given?.proposedPsi;
		const psiNote = psi === undefined ? '' : ` The plan is in psi: ${g(psi, 'psi')} is ${num(p.given!.proposedBar)} bar.`;
		const why: Record<string, string> = {
			'too-low': `The lowest safe pressure is the groundwater pressure plus the margin, ${lowest}; below it the water can push the patch off the wall before it cures.`,
			inside: `Between ${lowest} (groundwater plus margin) and ${rating} (the rating) the patch is held and the packer stays within its rating.`,
			'too-high': `The maker's rating for this diameter, ${rating}, is the ceiling. Above it the bladder can burst.`,
			window: `Groundwater plus margin is ${lowest}, below the ${rating} rating: any pressure between the two holds the patch safely.`,
			'no-window': `Holding the patch needs ${lowest}, more than the packer's ${rating} rating: no pressure is both high enough and safe. Use a packer rated higher for the diameter, or lower the water.`
		};
		return chosen === right ? undefined : why[right] + psiNote;
	},
	decisionStep(p, r) {
		const right = pressureWindowGenerator.decide!(p, r);
		if (p.given?.proposedBar === undefined) {
			return `${WINDOW_CHOICES.find((c) => c.value === right)!.label}.`;
		}
		const proposed = p.given.proposedBar;
		const shown = p.given.proposedPsi === undefined ? `${num(proposed)} bar` : `${g(p.given.proposedPsi, 'psi')} = ${num(proposed)} bar`;
		const label = PLAN_CHOICES.find((c) => c.value === right)!.label;
		return `Planned ${shown}: ${label}.`;
	}
};

export const endThrustGenerator: Generator = {
	id: 'end-thrust',
	calculator: 'end-thrust',
	title: 'End thrust',
	topic: 'End thrust',
	level: 'foundation',
	tolerancePercent: 3,
	ranges: {
		diameterMm: { min: 100, max: 300, basis: 'DN100-300 packers, the scope of the courses (common practice)' },
		pressureBar: { min: 1, max: 2.5, basis: "working pressures of 1-2.5 bar, never above the lesson's example rating for the bore (from memory)" },
		smallDiameterMm: { min: 0, max: 225, basis: 'small side of the common concentric transitions, 0 for a straight packer' }
	},
	create(rng) {
		const unit = rng.chance(0.65) ? 'kN' : 'kgf';
		const ask = unit === 'kN' ? 'forceKN' : 'forceKgf';
		if (rng.chance(0.35)) {
			const [small, large] = rng.pick(TRANSITIONS_MM);
			// A transition packer is held to its rating at the larger bore.
			const largeRating = RATINGS.find(([bore]) => bore === large)![1];
			const pressureBar = rng.pick([1, 1.5, 2].filter((p) => p <= largeRating));
			return {
				inputs: { diameterMm: large, pressureBar, smallDiameterMm: small },
				asks: ask,
				unit,
				prompt:
					`A transition packer steps from ${g(large, 'mm')} down to ${g(small, 'mm')} and is inflated to ${g(pressureBar, 'bar')}. ` +
					`What force does the pressure put on the step, pushing the packer toward the larger pipe, ${inUnit(unit)}?`
			};
		}
		const [diameterMm, rating] = rng.pick(RATINGS);
		const pressureBar = rng.pick([1, 1.5, 2, 2.5].filter((p) => p <= rating));
		return {
			inputs: { diameterMm, pressureBar, smallDiameterMm: 0 },
			asks: ask,
			unit,
			prompt:
				`A packer in a ${g(diameterMm, 'mm')} pipe is inflated to ${g(pressureBar, 'bar')} with its far end plugged. ` +
				`What force does the pressure put on the plugged end, ${inUnit(unit)}?`
		};
	},
	mistakes(p) {
		const i = p.inputs;
		const list: Mistake[] = [
			{ hint: 'The area is π × D² ÷ 4 with D the diameter; you used the radius as D.', inputs: { ...i, diameterMm: i.diameterMm / 2, smallDiameterMm: i.smallDiameterMm / 2 } },
			{ hint: 'The area is π × r² with r the radius (or π × D² ÷ 4); you used the diameter as r.', inputs: { ...i, diameterMm: i.diameterMm * 2, smallDiameterMm: i.smallDiameterMm * 2 } }
		];
		if (i.smallDiameterMm > 0) {
			list.push(
				{ hint: 'Only the ring of the step carries the thrust: take the small pipe’s area away from the large one’s.', inputs: { ...i, smallDiameterMm: 0 } },
				{ hint: 'The step is the ring between the two diameters, not the small pipe’s area.', inputs: { ...i, diameterMm: i.smallDiameterMm, smallDiameterMm: 0 } }
			);
		}
		return list;
	}
};
