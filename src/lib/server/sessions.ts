import type { Statement } from 'better-sqlite3';
import type { CompanyMembership, Identity, Role } from '$lib/roles';
import { config } from './config';
import { recordAudit } from './audit';
import { db as defaultDb, getDb, inTransaction, type DB } from './db';
import { sqliteHandle } from './db/engine';
import { isDatabaseBusy } from './db/errors';
import { loadIdentity } from './roles';

/**
 * Server-side sessions. Auth.js keeps its encrypted session cookie, and the cookie carries the
 * id of a `user_session` row (claim `sid`); a request is signed in only while that row is open,
 * not idle for longer than SESSION_IDLE_HOURS and not past its end. Ending the row ends the
 * session everywhere at once, whatever the cookie says.
 */

export type EndReason = 'sign-out' | 'password-reset' | 'role-removed' | 'signed-out-everywhere';

/** How stale `last_seen_at` may get before a request writes it again (keeps reads read-only). */
const TOUCH_EVERY_MS = 5 * 60 * 1000;

/** Ended or expired sessions are kept this long for the record, then removed when the person next signs in. */
const KEEP_FOR_MS = 30 * 24 * 60 * 60 * 1000;

export async function startSession(userId: string, db: DB = defaultDb): Promise<string> {
	const now = new Date();
	const id = crypto.randomUUID();
	await db
		.deleteFrom('user_session')
		.where('user_id', '=', userId)
		.where('expires_at', '<', new Date(now.getTime() - KEEP_FOR_MS).toISOString())
		.execute();
	await db
		.insertInto('user_session')
		.values({
			id,
			user_id: userId,
			created_at: now.toISOString(),
			last_seen_at: now.toISOString(),
			expires_at: new Date(now.getTime() + config.sessionMaxAgeSeconds * 1000).toISOString(),
			ended_at: null,
			ended_why: null
		})
		.execute();
	return id;
}

export async function endSession(sessionId: string, why: EndReason, db: DB = defaultDb): Promise<void> {
	await db
		.updateTable('user_session')
		.set({ ended_at: new Date().toISOString(), ended_why: why })
		.where('id', '=', sessionId)
		.where('ended_at', 'is', null)
		.execute();
}

/** Ends every open session of a person; returns how many. Pass the transaction of the change that causes it. */
export async function endAllSessions(userId: string, why: EndReason, db: DB = defaultDb): Promise<number> {
	const result = await db
		.updateTable('user_session')
		.set({ ended_at: new Date().toISOString(), ended_why: why })
		.where('user_id', '=', userId)
		.where('ended_at', 'is', null)
		.executeTakeFirst();
	return Number(result.numUpdatedRows);
}

/** A registrar ends every session of a person (a lost phone, a shared computer); recorded in the audit log. */
export async function signOutEverywhere(actorId: string, userId: string, db: DB = defaultDb): Promise<number> {
	return inTransaction(db, async (trx) => {
		const ended = await endAllSessions(userId, 'signed-out-everywhere', trx);
		await recordAudit({ actorId, action: 'user.signed-out-everywhere', subjectType: 'user', subjectId: userId, detail: { sessions: ended } }, trx);
		return ended;
	});
}

interface SessionRow {
	user_id: string;
	last_seen_at: string;
	id: string;
	email: string;
	name: string | null;
}

interface Statements {
	session: Statement<[string, string, string], SessionRow>;
	access: Statement<[string, string], { kind: 'role' | 'company'; a: string; b: string | null; c: string | null }>;
	touch: Statement<[string, string]>;
}

const roleOrder: Role[] = ['trainee', 'trainer', 'inspector', 'registrar'];
let prepared: { db: DB; statements: Statements } | undefined;

/** Prepared once per database; null on engines without prepared statements here (Kysely then). */
function statements(db: DB): Statements | null {
	if (prepared?.db === db) return prepared.statements;
	const sqlite = sqliteHandle(db);
	if (!sqlite) return null;
	const statementsForDb: Statements = {
		session: sqlite.prepare(
			`select s.user_id, s.last_seen_at, u.id, u.email, u.name from user_session s join "User" u on u.id = s.user_id
			 where s.id = ? and s.ended_at is null and s.expires_at > ? and s.last_seen_at > ?`
		),
		// Roles and company memberships in one statement: both decide what the person may do.
		access: sqlite.prepare(
			`select 'role' as kind, role as a, null as b, null as c from user_role where user_id = ?
			 union all
			 select 'company', c.id, c.name, m.role from membership m join company c on c.id = m.company_id where m.user_id = ?
			 order by 1, 3`
		),
		touch: sqlite.prepare(`update user_session set last_seen_at = ? where id = ? and ended_at is null`)
	};
	prepared = { db, statements: statementsForDb };
	return statementsForDb;
}

/**
 * The person behind an open session, with roles and companies read fresh (so a removed role
 * or an ended session takes effect on the very next request); null when the session is ended,
 * idle too long, past its end, or the person is gone.
 */
export async function identityForSession(sessionId: string, db: DB = getDb()): Promise<Identity | null> {
	const now = Date.now();
	const nowIso = new Date(now).toISOString();
	const idleSince = new Date(now - config.sessionIdleMs).toISOString();
	const s = statements(db);
	if (!s) return identityThroughKysely(sessionId, nowIso, idleSince, db);

	const row = s.session.get(sessionId, nowIso, idleSince);
	if (!row) return null;
	const held = new Set<Role>(['trainee']);
	const companies: CompanyMembership[] = [];
	for (const r of s.access.all(row.id, row.id)) {
		if (r.kind === 'role') held.add(r.a as Role);
		else companies.push({ id: r.a, name: r.b!, role: r.c as CompanyMembership['role'] });
	}
	if (now - Date.parse(row.last_seen_at) > TOUCH_EVERY_MS) {
		try {
			s.touch.run(nowIso, sessionId);
		} catch (e) {
			// Another process holds the write lock: the next request records the visit instead.
			if (!isDatabaseBusy(e)) throw e;
		}
	}
	return { id: row.id, email: row.email, name: row.name, roles: roleOrder.filter((r) => held.has(r)), companies };
}

async function identityThroughKysely(sessionId: string, nowIso: string, idleSince: string, db: DB): Promise<Identity | null> {
	const row = await db
		.selectFrom('user_session')
		.select(['user_id', 'last_seen_at'])
		.where('id', '=', sessionId)
		.where('ended_at', 'is', null)
		.where('expires_at', '>', nowIso)
		.where('last_seen_at', '>', idleSince)
		.executeTakeFirst();
	if (!row) return null;
	if (Date.parse(nowIso) - Date.parse(row.last_seen_at) > TOUCH_EVERY_MS) {
		await db.updateTable('user_session').set({ last_seen_at: nowIso }).where('id', '=', sessionId).execute();
	}
	return loadIdentity(row.user_id, db);
}
