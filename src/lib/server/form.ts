import { fail, type ActionFailure } from '@sveltejs/kit';
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export interface FormFailure {
	values: Record<string, string>;
	errors: FieldErrors;
	message?: string;
}

/** Fields never echoed back to the page. */
const secretFields = /password|confirm|token|secret/i;

export function safeValues(form: FormData): Record<string, string> {
	// Field names come from the request: collect them without a prototype.
	const values: Record<string, string> = Object.create(null);
	for (const [key, value] of form) {
		if (typeof value === 'string' && !secretFields.test(key)) values[key] = value.slice(0, 500);
	}
	return { ...values };
}

/** The first message per field, keyed by the field's dotted path ("" for form-wide). */
export function fieldErrors(error: z.ZodError): FieldErrors {
	const errors: FieldErrors = {};
	for (const issue of error.issues) {
		const key = issue.path.join('.');
		errors[key] ??= issue.message;
	}
	return errors;
}

/**
 * Parses a submitted form with a zod schema. On failure returns `fail(400, ...)` with the
 * safe values and one message per field, ready to return from an action.
 */
export async function parseForm<S extends z.ZodType>(
	request: Request,
	schema: S
): Promise<{ ok: true; data: z.output<S>; form: FormData } | { ok: false; failure: ActionFailure<FormFailure> }> {
	let form: FormData;
	try {
		form = await request.formData();
	} catch {
		return { ok: false, failure: fail(400, { values: {}, errors: {}, message: 'The form could not be read.' }) };
	}
	const raw = Object.fromEntries([...form].filter(([, v]) => typeof v === 'string'));
	const parsed = schema.safeParse(raw);
	if (!parsed.success) {
		return {
			ok: false,
			failure: fail(400, { values: safeValues(form), errors: fieldErrors(parsed.error), message: 'Please correct the marked fields.' })
		};
	}
	return { ok: true, data: parsed.data, form };
}

export function failWith(status: number, form: FormData | null, message: string, errors: FieldErrors = {}) {
	return fail(status, { values: form ? safeValues(form) : {}, errors, message });
}
