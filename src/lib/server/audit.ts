import { db as defaultDb, type DB } from './db';

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
