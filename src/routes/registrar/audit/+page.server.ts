import { requireRole } from '$lib/server/authz';
import { searchAudit } from '$lib/server/audit';
import { readAuditQuery } from '$lib/server/audit-filter';
import { actionLabels, describeAudit } from '$lib/audit-words';
import { courses } from '$lib/content';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 50;

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	const { filter, values, errors } = readAuditQuery(event.url);
	const { entries, older } = await searchAudit({ ...filter, limit: PAGE_SIZE });
	const titles = Object.fromEntries(courses.map((c) => [c.slug, c.title]));
	return {
		values,
		errors,
		actions: Object.entries(actionLabels).map(([value, label]) => ({ value, label })),
		entries: entries.map((e) => ({ id: e.id, at: e.at, action: e.action, label: actionLabels[e.action] ?? e.action, words: describeAudit(e, titles) })),
		older,
		paged: filter.before !== undefined
	};
};
