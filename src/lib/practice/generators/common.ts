/** Job details shared by the generators: round sizes a crew meets, and words for prompts. */
import { unitLabel } from '../../calc/units';
import { given } from '../../calc/worksheet';
import type { Rng } from '../random';

/**
 * Bores of clay, concrete and plastic sewers and drains met on patch jobs (mm): the DN100-300
 * scope of the courses (common practice).
 */
export const SEWER_BORES_MM = [100, 150, 150, 200, 225, 250, 300] as const;

/**
 * Host pipes with the bores they are met in (mm, common practice): laterals and drains are
 * 100-150 mm; concrete sewers start at about 225 mm; asbestos-cement sewers from 150 mm.
 */
const HOSTS: readonly [host: string, smallestMm: number, largestMm: number][] = [
	['clay sewer', 150, 300],
	['clay drain', 100, 150],
	['concrete sewer', 225, 300],
	['PVC sewer', 100, 300],
	['clay lateral', 100, 150],
	['asbestos-cement sewer', 150, 300]
];

/** A host pipe that really comes in this bore. */
export function pickHost(rng: Rng, boreMm: number): string {
	return rng.pick(HOSTS.filter(([, lo, hi]) => boreMm >= lo && boreMm <= hi).map(([host]) => host));
}

/**
 * Defects with the length along the pipe a CCTV survey usually measures for them (mm, common
 * practice): joints and circumferential cracks are short; longitudinal cracks and holed
 * sections run further. Longer damage is a case for a longer liner, not a point repair drill.
 */
export const DEFECT_LENGTHS_MM: readonly [defect: string, shortestMm: number, longestMm: number][] = [
	['circumferential crack', 20, 100],
	['open joint', 20, 100],
	['root-damaged joint', 50, 200],
	['displaced joint', 50, 150],
	['longitudinal crack', 150, 600],
	['holed section', 100, 300]
];

/** A defect and its measured length, in 10 mm steps. */
export function pickDefect(rng: Rng): { defect: string; lengthMm: number } {
	const [defect, lo, hi] = rng.pick(DEFECT_LENGTHS_MM);
	return { defect, lengthMm: rng.step(lo, hi, 10) };
}

/** Concentric transitions between common bores (small, large), mm. */
export const TRANSITIONS_MM: readonly [number, number][] = [
	[100, 150],
	[150, 200],
	[150, 225],
	[200, 250],
	[200, 300],
	[225, 300]
];

/** A number with its unit as written in a prompt: "150 mm", "15 %". */
export const g = given;

/** "kilograms (kg)" style wording for the unit an answer is asked in. */
export function inUnit(unit: string): string {
	const words: Record<string, string> = {
		kg: 'kilograms',
		g: 'grams',
		L: 'litres',
		mL: 'millilitres',
		mm: 'millimetres',
		m2: 'square metres',
		bar: 'bar',
		kPa: 'kPa',
		psi: 'psi',
		kN: 'kN',
		kgf: 'kgf',
		lbf: 'lbf',
		min: 'minutes',
		h: 'hours',
		s: 'seconds',
		in: 'inches'
	};
	return words[unit] ? `in ${words[unit]}` : `in ${unitLabel(unit)}`;
}

/** "a"/"an" before a figure or word as it is read aloud. */
export function article(next: string): string {
	return /^(8|11|18|80|a|e|i|o|u)/i.test(next) && !/^(one|uni|use)/i.test(next) ? 'an' : 'a';
}

/** The figure or word with its article: "an 800 mm", "a 600 mm". */
export function a(next: string): string {
	return `${article(next)} ${next}`;
}

/** A prompt sentence starting with the pipe: "A 150 mm clay sewer ...". */
export function aPipe(boreMm: number, host: string): string {
	const size = g(boreMm, 'mm');
	return `${article(size) === 'an' ? 'An' : 'A'} ${size} ${host}`;
}

export function pickWeighted<T>(rng: Rng, items: readonly [T, number][]): T {
	const total = items.reduce((s, [, w]) => s + w, 0);
	let x = rng.float() * total;
	for (const [item, w] of items) {
		x -= w;
		if (x < 0) return item;
	}
	return items[items.length - 1][0];
}
