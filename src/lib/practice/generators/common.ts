/** Job details shared by the generators: round sizes a crew meets, and words for prompts. */
import { unitLabel } from '../../calc/units';
import { given } from '../../calc/worksheet';
import type { Rng } from '../random';

/** Bores of clay, concrete and plastic sewers and drains met on patch jobs (mm). */
export const SEWER_BORES_MM = [100, 150, 150, 200, 225, 250, 300] as const;

export const HOST_PIPES = ['clay sewer', 'clay drain', 'concrete sewer', 'PVC sewer', 'clay lateral', 'asbestos-cement sewer'] as const;

export const DEFECTS = ['circumferential crack', 'open joint', 'longitudinal crack', 'root-damaged joint', 'displaced joint', 'holed section'] as const;

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
