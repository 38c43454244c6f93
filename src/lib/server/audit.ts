import type { AuditView } from '$lib/audit-words';
import { db as defaultDb, type DB } from './db';
import { containsText } from './db/engine';

export interface AuditRecord {
	actorId: string | null;
	action: string;
	subjectType: string;
	subjectId: string;
	detail?: Record<string, unknown>;
}

/** Appends one entry to the audit log. Pass the transaction when the change is part of one. */
export async function recordAudit(entry: AuditRecord, db: DB = defaultDb): Promise<void> {
	await db
		.insertInto('audit_log')
		.values({
			at: new Date().toISOString(),
			actor_id: entry.actorId,
			action: entry.action,
			subject_type: entry.subjectType,
			subject_id: entry.subjectId,
			detail: JSON.stringify(entry.detail ?? {})
		})
		.execute();
}

export async function listAudit(
	filter: { subjectType?: string; subjectId?: string; limit?: number } = {},
	db: DB = defaultDb
) {
	let query = db
		.selectFrom('audit_log')
		.leftJoin('User', 'User.id', 'audit_log.actor_id')
		.select([
			'audit_log.id',
			'audit_log.at',
			'audit_log.action',
			'audit_log.subject_type',
			'audit_log.subject_id',
			'audit_log.detail',
			'User.email as actor_email'
		])
		.orderBy('audit_log.id', 'desc')
		.limit(filter.limit ?? 100);
	if (filter.subjectType) query = query.where('audit_log.subject_type', '=', filter.subjectType);
	if (filter.subjectId) query = query.where('audit_log.subject_id', '=', filter.subjectId);
	return query.execute();
}

export interface AuditFilter {
	/** Part of a name or e-mail: entries by that person or about them. */
	person?: string;
	action?: string;
	/** Inclusive UTC dates, YYYY-MM-DD. */
	from?: string;
	to?: string;
	/** Keyset paging: only entries older than this id. */
	before?: number;
	limit?: number;
}

/**
 * Audit entries, newest first, filtered and resolved into what a person reads: who did it and
 * whom it is about, by name. One more row than `limit` is read to tell whether older ones exist.
 */
export async function searchAudit(filter: AuditFilter, db: DB = defaultDb): Promise<{ entries: AuditView[]; older: number | null }> {
	const limit = filter.limit ?? 50;
	let query = db
		.selectFrom('audit_log')
		.select(['id', 'at', 'action', 'subject_type', 'subject_id', 'detail', 'actor_id'])
		.orderBy('id', 'desc')
		.limit(limit + 1);
	if (filter.action) query = query.where('action', '=', filter.action);
	if (filter.from) query = query.where('at', '>=', `${filter.from}T00:00:00.000Z`);
	if (filter.to) query = query.where('at', '<=', `${filter.to}T23:59:59.999Z`);
	if (filter.before !== undefined) query = query.where('id', '<', filter.before);
	const person = filter.person?.trim().toLowerCase();
	if (person) {
		const ids = (
			await db
				.selectFrom('User')
				.select('id')
				.where((eb) => eb.or([containsText(eb, eb.ref('email'), person), containsText(eb, eb.ref('name'), person)]))
				.limit(200)
				.execute()
		).map((u) => u.id);
		if (ids.length === 0) return { entries: [], older: null };
		query = query.where((eb) =>
			eb.or([eb('actor_id', 'in', ids), eb('subject_id', 'in', ids), ...ids.map((id) => eb('detail', 'like', `%"userId":"${id}"%`))])
		);
	}
	const rows = await query.execute();
	const page = rows.slice(0, limit);
	const details = page.map((r) => {
		try {
			const parsed = JSON.parse(r.detail);
			return parsed && typeof parsed === 'object' && !Array.isArray(parsed) ? (parsed as Record<string, unknown>) : {};
		} catch {
			return {};
		}
	});
	const aboutId = (r: (typeof page)[number], d: Record<string, unknown>) =>
		r.subject_type === 'user' ? r.subject_id : typeof d.userId === 'string' ? d.userId : null;
	const userIds = [...new Set(page.flatMap((r, i) => [r.actor_id, aboutId(r, details[i])]).filter((id): id is string => !!id))];
	const companyIds = [...new Set(page.filter((r) => r.subject_type === 'company').map((r) => r.subject_id))];
	const [users, companies] = await Promise.all([
		userIds.length ? db.selectFrom('User').select(['id', 'name', 'email']).where('id', 'in', userIds).execute() : [],
		companyIds.length ? db.selectFrom('company').select(['id', 'name']).where('id', 'in', companyIds).execute() : []
	]);
	const nameOf = new Map(users.map((u) => [u.id, u.name ? `${u.name} (${u.email})` : u.email]));
	const companyOf = new Map(companies.map((c) => [c.id, c.name]));
	const entries = page.map((r, i): AuditView => {
		const about = aboutId(r, details[i]);
		return {
			id: Number(r.id),
			at: r.at,
			action: r.action,
			subjectType: r.subject_type,
			subjectId: r.subject_id,
			detail: details[i],
			actor: r.actor_id ? (nameOf.get(r.actor_id) ?? 'a removed account') : null,
			subject: about ? (nameOf.get(about) ?? null) : null,
			company: r.subject_type === 'company' ? (companyOf.get(r.subject_id) ?? null) : null
		};
	});
	return { entries, older: rows.length > limit ? entries[entries.length - 1].id : null };
}
