import { z } from 'zod';
import type { AuditFilter } from './audit';

const date = z
	.string()
	.regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date such as 2026-03-31.')
	.refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), 'Not a date.');

/** The audit log's filters as they arrive in the address bar; empty fields mean "any". */
const schema = z.object({
	person: z.string().trim().max(100, 'At most 100 characters.').optional(),
	action: z.string().trim().max(60).regex(/^[a-z0-9.\-]*$/, 'Not an action.').optional(),
	from: date.optional(),
	to: date.optional(),
	before: z.coerce.number().int().positive().optional()
});

export type AuditQuery = { filter: AuditFilter; values: Record<string, string>; errors: Record<string, string> };

/** Reads the filters from a URL; a bad field is reported and ignored, never a 500. */
export function readAuditQuery(url: URL): AuditQuery {
	const values: Record<string, string> = {};
	for (const key of ['person', 'action', 'from', 'to', 'before']) {
		const v = url.searchParams.get(key);
		if (v !== null && v.trim() !== '') values[key] = v.slice(0, 200);
	}
	const errors: Record<string, string> = {};
	const filter: AuditFilter = {};
	for (const [key, value] of Object.entries(values)) {
		const one = schema.shape[key as keyof typeof schema.shape].safeParse(value);
		if (one.success) (filter as Record<string, unknown>)[key] = one.data;
		else errors[key] = one.error.issues[0].message;
	}
	return { filter, values, errors };
}
