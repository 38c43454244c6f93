/**
 * Calculator inputs as they arrive at the server's edge (the API's JSON, practice answers):
 * zod checks the shape (an object holding only this calculator's names), then ./fields checks
 * each field exactly as the browser does. Every failure is a message per field name
 * ('inputs' for the whole object).
 */
import * as z from 'zod/mini';
import { checkInputs, type ParsedInputs } from './fields';
import type { CalculatorDef } from './types';

const shapes = new WeakMap<CalculatorDef, z.ZodMiniType<Record<string, unknown>>>();

/** An object with no names but the calculator's own; each value is checked by ./fields. */
function shapeOf(def: CalculatorDef): z.ZodMiniType<Record<string, unknown>> {
	let shape = shapes.get(def);
	if (!shape) {
		shape = z.strictObject(Object.fromEntries(def.inputs.map((spec) => [spec.name, z.optional(z.unknown())])), {
			error: (issue) => (issue.code === 'invalid_type' ? 'Must be an object of named numbers' : undefined)
		}) as unknown as z.ZodMiniType<Record<string, unknown>>;
		shapes.set(def, shape);
	}
	return shape;
}

/** Validates raw inputs: the object's shape, each field, then the checks across fields. */
export function parseInputs(def: CalculatorDef, raw: unknown): ParsedInputs {
	const shaped = shapeOf(def).safeParse(raw);
	if (shaped.success) return checkInputs(def, shaped.data);
	// Keys come from the request: collect them without a prototype ("__proto__" is a key here).
	const errors: Record<string, string> = Object.create(null);
	const names = def.inputs.map((s) => s.name).join(', ');
	for (const issue of shaped.error.issues) {
		if (issue.code === 'unrecognized_keys') {
			for (const key of issue.keys) errors[key] ??= `Unknown input; this calculator takes ${names}`;
		} else {
			errors.inputs ??= issue.message;
		}
	}
	// An object with names it does not know still gets its own fields checked.
	if (errors.inputs === undefined) {
		const fields = checkInputs(def, raw as Record<string, unknown>);
		if (!fields.ok) Object.assign(errors, fields.errors);
	}
	return { ok: false, errors: { ...errors } };
}
