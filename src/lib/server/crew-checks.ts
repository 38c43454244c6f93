import { checkNumbers, CREW_CHECK_LIMIT, splitNumbers, type CrewRow } from './certificates';
import { db as defaultDb, type DB } from './db';

/** An inspector's saved crew check: the list as checked and each answer at that moment. */

export type CrewCheckOutcome = { ok: true; id: string; rows: CrewRow[] } | { ok: false; message: string };

export async function runCrewCheck(inspectorId: string, text: string, label: string, { db = defaultDb, now = new Date() }: { db?: DB; now?: Date } = {}): Promise<CrewCheckOutcome> {
	const inputs = splitNumbers(text);
	if (inputs.length === 0) return { ok: false, message: 'Paste or upload at least one certificate number.' };
	if (inputs.length > CREW_CHECK_LIMIT) return { ok: false, message: `A crew check takes at most ${CREW_CHECK_LIMIT} numbers; this list has ${inputs.length}.` };
	const rows = await checkNumbers(inputs, { db, now });
	const id = crypto.randomUUID();
	const title = label.trim().slice(0, 120) || `Crew check of ${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
	await db.insertInto('crew_check').values({ id, inspector_id: inspectorId, checked_at: now.toISOString(), label: title, results: JSON.stringify(rows) }).execute();
	return { ok: true, id, rows };
}

export async function recentCrewChecks(inspectorId: string, limit = 10, db: DB = defaultDb) {
	const checks = await db
		.selectFrom('crew_check')
		.select(['id', 'label', 'checked_at', 'results'])
		.where('inspector_id', '=', inspectorId)
		.orderBy('checked_at', 'desc')
		.limit(limit)
		.execute();
	return checks.map((c) => {
		const rows = JSON.parse(c.results) as CrewRow[];
		return { id: c.id, label: c.label, checkedAt: c.checked_at, count: rows.length, valid: rows.filter((r) => r.result?.status === 'valid').length };
	});
}

/** One saved check, only for the inspector who ran it. */
export async function getCrewCheck(inspectorId: string, id: string, db: DB = defaultDb) {
	const row = await db.selectFrom('crew_check').select(['id', 'label', 'checked_at', 'results']).where('id', '=', id).where('inspector_id', '=', inspectorId).executeTakeFirst();
	return row ? { id: row.id, label: row.label, checkedAt: row.checked_at, rows: JSON.parse(row.results) as CrewRow[] } : null;
}
