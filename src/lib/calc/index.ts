/**
 * The trade calculators: one registry serving the field calculators (/tools), the
 * computed practice and test problems, and the public calculation API.
 * Pure and isomorphic: no database, environment or framework imports.
 */
import { cureTimeCalculator } from './cure';
import { f1216FullCalculator, f1216PartialCalculator } from './f1216';
import {
	laminateVolumeCalculator,
	matSizeCalculator,
	mixRatioCalculator,
	resinQuantityCalculator
} from './materials';
import { endThrustCalculator, groundwaterHeadCalculator, pressureWindowCalculator } from './pressure';
import { transitionAreaCalculator } from './transition';
import { computeChecked, type CalculationFailure, type CalculationSuccess } from './run';
import type { CalculatorDef, InputSpec, ResultSpec } from './types';
import { parseInputs } from './validate';
import { airTestCalculator, waterTestCalculator } from './watertightness';

export type { Alert, CalcOutput, CalculatorDef, InputSpec, Inputs, ResultSpec, ResultValue } from './types';
export { defaultInputs, rangeMessage } from './fields';
export { parseInputs } from './validate';
export type { CalculationFailure, CalculationSuccess } from './run';

const all: CalculatorDef[] = [
	resinQuantityCalculator,
	laminateVolumeCalculator,
	transitionAreaCalculator,
	matSizeCalculator,
	mixRatioCalculator,
	groundwaterHeadCalculator,
	pressureWindowCalculator,
	endThrustCalculator,
	cureTimeCalculator,
	f1216PartialCalculator,
	f1216FullCalculator,
	airTestCalculator,
	waterTestCalculator
];

export const calculators: Record<string, CalculatorDef> = Object.fromEntries(all.map((c) => [c.id, c]));

export function getCalculator(id: string): CalculatorDef | undefined {
	return Object.hasOwn(calculators, id) ? calculators[id] : undefined;
}

/**
 * Validates `raw` (an object of named numbers) for calculator `id` and computes.
 * Unknown id -> 404; missing, non-numeric, out-of-range or inconsistent inputs -> 400 with a
 * message per field. Optional inputs left out take their defaults.
 */
export function runCalculation(id: string, raw: unknown): CalculationSuccess | CalculationFailure {
	const def = getCalculator(id);
	if (!def) return { ok: false, status: 404, errors: { id: `Unknown calculator "${id}"` } };
	return computeChecked(def, parseInputs(def, raw));
}

export type CalculatorListing = {
	id: string;
	title: string;
	summary: string;
	lesson?: string;
	system: 'metric' | 'imperial';
	inputs: InputSpec[];
	results: ResultSpec[];
};

/** Every calculator as plain data: what the GET listing of the API returns. */
export function listCalculators(): CalculatorListing[] {
	return all.map(({ id, title, summary, lesson, system, inputs, results }) => ({
		id,
		title,
		summary,
		lesson,
		system,
		inputs: inputs.map((s) => ({ ...s })),
		results: results.map((r) => ({ ...r }))
	}));
}
