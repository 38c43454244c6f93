/**
 * Validating and computing with one calculator's definition: the single path the API, the
 * practice problems and the browser's live calculators all take.
 */
import type { CalcOutput, CalculatorDef } from './types';
import { parseInputs } from './validate';

export type CalculationSuccess = { ok: true } & CalcOutput;

export type CalculationFailure = {
	ok: false;
	status: 404 | 400;
	errors: Record<string, string>;
};

/** Missing, non-numeric, out-of-range or inconsistent inputs -> 400 with a message per field. */
export function calculateWith(def: CalculatorDef, raw: unknown): CalculationSuccess | CalculationFailure {
	const parsed = parseInputs(def, raw);
	if (!parsed.ok) return { ok: false, status: 400, errors: parsed.errors };
	return { ok: true, ...def.compute(parsed.inputs) };
}
