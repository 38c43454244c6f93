import Papa from 'papaparse';
import { requireRole } from '$lib/server/authz';
import { searchAudit } from '$lib/server/audit';
import { readAuditQuery } from '$lib/server/audit-filter';
import { actionLabels, csvSafe, describeAudit } from '$lib/audit-words';
import { courses } from '$lib/content';
import type { RequestHandler } from './$types';

/** The audit log as CSV, with the page's filters (every matching entry, up to 50 000). */
export const GET: RequestHandler = async (event) => {
	requireRole(event, 'registrar');
	const { filter } = readAuditQuery(event.url);
	const { entries } = await searchAudit({ ...filter, limit: 50_000 });
	const titles = Object.fromEntries(courses.map((c) => [c.slug, c.title]));
	const rows = entries.map((e) =>
		[e.at, e.actor ?? 'system', actionLabels[e.action] ?? e.action, describeAudit(e, titles), e.subject ?? e.company ?? '', e.action, e.subjectType, e.subjectId, JSON.stringify(e.detail)].map(
			(cell) => csvSafe(String(cell))
		)
	);
	const csv = Papa.unparse({ fields: ['time (UTC)', 'who', 'action', 'what happened', 'about', 'action code', 'subject type', 'subject id', 'detail'], data: rows });
	return new Response(`\ufeff${csv}\r\n`, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="audit-log-${new Date().toISOString().slice(0, 10)}.csv"`,
			'cache-control': 'no-store'
		}
	});
};
