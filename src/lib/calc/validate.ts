/**
 * Input validation for calculators: zod schemas built from each calculator's InputSpec list.
 * Contract: every failure is a message per field name ('inputs' for the whole object);
 * numbers may arrive as JSON numbers or as numeric strings from forms.
 * Built with zod's functional build (zod/mini, the same checks as the chainable one) because
 * the live calculators run this in the browser, where the chainable build would ship with it.
 */
import * as z from 'zod/mini';
import type { CalculatorDef, InputSpec, Inputs } from './types';
import { given, plain } from './worksheet';

const NUMERIC = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Whether text is a plain decimal number such as "150", "-0.5" or "6e2". */
export function isNumericText(text: string): boolean {
	return NUMERIC.test(text);
}

/** Empty and null count as left out; numeric strings become numbers; anything else passes through to fail. */
function readNumber(value: unknown): unknown {
	if (value === null || value === undefined) return undefined;
	if (typeof value === 'string') {
		const trimmed = value.trim();
		if (trimmed === '') return undefined;
		return isNumericText(trimmed) ? Number(trimmed) : value;
	}
	return value;
}

/** "Must be between 50 and 1600 mm", with limits given in `unit` (converted by the caller). */
export function rangeMessage(min: number, max: number, unit: string): string {
	return `Must be between ${plain(min)} and ${given(max, unit)}`;
}

function choicesMessage(spec: InputSpec): string {
	return `Must be one of ${spec.choices!.map((c) => plain(c)).join(', ')}`;
}

function fieldSchema(spec: InputSpec) {
	const range = rangeMessage(spec.min, spec.max, spec.unit);
	// In the order the checks run; the first message for a field is the one shown.
	const checks: z.core.$ZodCheck<number>[] = [
		...(spec.integer ? [z.int('Must be a whole number')] : []),
		z.gte(spec.min, range),
		z.lte(spec.max, range),
		...(spec.choices ? [z.refine<number>((v) => spec.choices!.includes(v), choicesMessage(spec))] : [])
	];
	const checked = z.number({
		error: (issue) => (issue.input === undefined ? 'Required' : 'Must be a number')
	}).check(...checks);
	const readField = z.transform((value: unknown) => {
		const n = readNumber(value);
		return n === undefined && spec.optional ? spec.default : n;
	});
	return z.pipe(readField, checked);
}

const schemas = new WeakMap<CalculatorDef, z.ZodMiniType<Inputs>>();

function schemaFor(def: CalculatorDef): z.ZodMiniType<Inputs> {
	let schema = schemas.get(def);
	if (!schema) {
		const shape = Object.fromEntries(def.inputs.map((spec) => [spec.name, fieldSchema(spec)]));
		schema = z.strictObject(shape, {
			error: (issue) =>
				issue.code === 'invalid_type' ? 'Must be an object of named numbers' : undefined
		}) as unknown as z.ZodMiniType<Inputs>;
		schemas.set(def, schema);
	}
	return schema;
}

export type ParsedInputs =
	| { ok: true; inputs: Inputs }
	| { ok: false; errors: Record<string, string> };

/** Validates raw inputs field by field, then across fields (the calculator's own `check`). */
export function parseInputs(def: CalculatorDef, raw: unknown): ParsedInputs {
	const parsed = schemaFor(def).safeParse(raw);
	if (!parsed.success) {
		// Keys come from the request: collect them without a prototype ("__proto__" is a key here).
		const errors: Record<string, string> = Object.create(null);
		const names = def.inputs.map((s) => s.name).join(', ');
		for (const issue of parsed.error.issues) {
			if (issue.code === 'unrecognized_keys') {
				for (const key of issue.keys) errors[key] ??= `Unknown input; this calculator takes ${names}`;
				continue;
			}
			const key = issue.path.length > 0 ? String(issue.path[0]) : 'inputs';
			errors[key] ??= issue.message;
		}
		return { ok: false, errors: { ...errors } };
	}
	const errors = Object.fromEntries(
		Object.entries(def.check?.(parsed.data) ?? {}).filter(
			(entry): entry is [string, string] => typeof entry[1] === 'string'
		)
	);
	return Object.keys(errors).length > 0 ? { ok: false, errors } : { ok: true, inputs: parsed.data };
}

/** The inputs a calculator starts from: every default. */
export function defaultInputs(def: CalculatorDef): Inputs {
	return Object.fromEntries(def.inputs.map((s) => [s.name, s.default]));
}
