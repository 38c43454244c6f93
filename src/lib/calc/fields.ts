/**
 * The checks on each calculator input, without a schema library: the live calculators run
 * them in the browser on every keystroke, and the server runs the very same function after
 * zod has checked the request's shape (./validate), so a field's message is written once.
 * Contract: numbers may arrive as JSON numbers or as numeric strings from forms; the first
 * failing check gives the field's message.
 */
import type { CalculatorDef, InputSpec, Inputs } from './types';
import { given, plain } from './worksheet';

const NUMERIC = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Whether text is a plain decimal number such as "150", "-0.5" or "6e2". */
export function isNumericText(text: string): boolean {
	return NUMERIC.test(text);
}

/** "Must be between 50 and 1600 mm", with limits given in `unit` (converted by the caller). */
export function rangeMessage(min: number, max: number, unit: string): string {
	return `Must be between ${plain(min)} and ${given(max, unit)}`;
}

/** Empty and null count as left out; numeric strings become numbers; anything else stays to fail. */
function readNumber(value: unknown): unknown {
	if (value === null || value === undefined) return undefined;
	if (typeof value === 'string') {
		const trimmed = value.trim();
		if (trimmed === '') return undefined;
		return isNumericText(trimmed) ? Number(trimmed) : value;
	}
	return value;
}

export type FieldCheck = { ok: true; value: number } | { ok: false; message: string };

/** One field: left out (optional ones take their default), a finite number, whole, in range, one of the choices. */
export function checkField(spec: InputSpec, raw: unknown): FieldCheck {
	const read = readNumber(raw);
	const value = read === undefined && spec.optional ? spec.default : read;
	if (value === undefined) return { ok: false, message: 'Required' };
	if (typeof value !== 'number' || !Number.isFinite(value)) return { ok: false, message: 'Must be a number' };
	if (spec.integer && !Number.isSafeInteger(value)) return { ok: false, message: 'Must be a whole number' };
	if (value < spec.min || value > spec.max) return { ok: false, message: rangeMessage(spec.min, spec.max, spec.unit) };
	if (spec.choices && !spec.choices.includes(value)) {
		return { ok: false, message: `Must be one of ${spec.choices.map((c) => plain(c)).join(', ')}` };
	}
	return { ok: true, value };
}

export type ParsedInputs = { ok: true; inputs: Inputs } | { ok: false; errors: Record<string, string> };

/**
 * Every field of `values` (only the calculator's own names are read), then the checks across
 * fields (the calculator's `check`). Unknown names are the caller's to refuse.
 */
export function checkInputs(def: CalculatorDef, values: Readonly<Record<string, unknown>>): ParsedInputs {
	const inputs: Inputs = {};
	const errors: Record<string, string> = {};
	for (const spec of def.inputs) {
		const field = checkField(spec, Object.hasOwn(values, spec.name) ? values[spec.name] : undefined);
		if (field.ok) inputs[spec.name] = field.value;
		else errors[spec.name] = field.message;
	}
	if (Object.keys(errors).length > 0) return { ok: false, errors };
	for (const [name, message] of Object.entries(def.check?.(inputs) ?? {})) {
		if (typeof message === 'string') errors[name] = message;
	}
	return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, inputs };
}

/** The inputs a calculator starts from: every default. */
export function defaultInputs(def: CalculatorDef): Inputs {
	return Object.fromEntries(def.inputs.map((s) => [s.name, s.default]));
}
