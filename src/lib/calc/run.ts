/**
 * Computing with one calculator's definition once its inputs are checked: the single path the
 * API, the practice problems and the browser's live calculators all take.
 */
import type { ParsedInputs } from './fields';
import type { CalcOutput, CalculatorDef } from './types';

export type CalculationSuccess = { ok: true } & CalcOutput;

export type CalculationFailure = {
	ok: false;
	status: 404 | 400;
	errors: Record<string, string>;
};

/** Inputs that did not pass -> 400 with a message per field; otherwise the calculation. */
export function computeChecked(def: CalculatorDef, parsed: ParsedInputs): CalculationSuccess | CalculationFailure {
	if (!parsed.ok) return { ok: false, status: 400, errors: parsed.errors };
	return { ok: true, ...def.compute(parsed.inputs) };
}
