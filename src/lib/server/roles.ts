import type { Identity, PlatformRole, Role } from '$lib/roles';
import { recordAudit } from './audit';
import { db as defaultDb, inTransaction, type DB } from './db';
import { endAllSessions } from './sessions';

const roleOrder: Role[] = ['trainee', 'trainer', 'inspector', 'registrar'];

/** Loads the person with roles and company memberships; null when the account is gone. */
export async function loadIdentity(userId: string, db: DB = defaultDb): Promise<Identity | null> {
	const user = await db
		.selectFrom('User')
		.select(['id', 'email', 'name'])
		.where('id', '=', userId)
		.executeTakeFirst();
	if (!user) return null;
	const [roles, companies] = await Promise.all([
		db.selectFrom('user_role').select('role').where('user_id', '=', userId).execute(),
		db
			.selectFrom('membership')
			.innerJoin('company', 'company.id', 'membership.company_id')
			.select(['company.id', 'company.name', 'membership.role'])
			.where('membership.user_id', '=', userId)
			.orderBy('company.name')
			.execute()
	]);
	const held = new Set<Role>(['trainee', ...roles.map((r) => r.role)]);
	return { ...user, roles: roleOrder.filter((r) => held.has(r)), companies };
}

/** Grants a platform role (no-op when already held) and records who did it. */
export async function grantRole(actorId: string | null, userId: string, role: PlatformRole, db: DB = defaultDb) {
	await inTransaction(db, async (trx) => {
		const result = await trx
			.insertInto('user_role')
			.values({ user_id: userId, role, granted_at: new Date().toISOString(), granted_by: actorId })
			.onConflict((oc) => oc.doNothing())
			.executeTakeFirst();
		if (Number(result.numInsertedOrUpdatedRows ?? 0) > 0) {
			await recordAudit({ actorId, action: 'role.grant', subjectType: 'user', subjectId: userId, detail: { role } }, trx);
		}
	});
}

export async function revokeRole(actorId: string | null, userId: string, role: PlatformRole, db: DB = defaultDb) {
	await inTransaction(db, async (trx) => {
		const result = await trx
			.deleteFrom('user_role')
			.where('user_id', '=', userId)
			.where('role', '=', role)
			.executeTakeFirst();
		if (Number(result.numDeletedRows) > 0) {
			await recordAudit({ actorId, action: 'role.revoke', subjectType: 'user', subjectId: userId, detail: { role } }, trx);
			// Whatever was opened or cached with the role in hand ends with it.
			await endAllSessions(userId, 'role-removed', trx);
		}
	});
}

/**
 * Sets whose crew a trainer works with: `companyId` null for everyone (the training provider's
 * trainer), else that one company's crew. Grants the trainer role when not held. False when
 * the company does not exist.
 */
export async function setTrainerScope(actorId: string | null, userId: string, companyId: string | null, db: DB = defaultDb): Promise<boolean> {
	return inTransaction(db, async (trx) => {
		if (companyId !== null && !(await trx.selectFrom('company').select('id').where('id', '=', companyId).executeTakeFirst())) return false;
		const held = await trx.selectFrom('user_role').select('company_id').where('user_id', '=', userId).where('role', '=', 'trainer').executeTakeFirst();
		if (held && held.company_id === companyId) return true;
		if (held) {
			await trx.updateTable('user_role').set({ company_id: companyId }).where('user_id', '=', userId).where('role', '=', 'trainer').execute();
		} else {
			await trx.insertInto('user_role').values({ user_id: userId, role: 'trainer', company_id: companyId, granted_at: new Date().toISOString(), granted_by: actorId }).execute();
			await recordAudit({ actorId, action: 'role.grant', subjectType: 'user', subjectId: userId, detail: { role: 'trainer', companyId } }, trx);
		}
		await recordAudit({ actorId, action: 'role.trainer-scope', subjectType: 'user', subjectId: userId, detail: { companyId } }, trx);
		return true;
	});
}

/** Platform roles for many people at once (everyone is also a trainee), keyed by user id. */
export async function rolesByUser(userIds: string[], db: DB = defaultDb): Promise<Map<string, Role[]>> {
	const byUser = new Map<string, Role[]>(userIds.map((id) => [id, ['trainee']]));
	if (userIds.length === 0) return byUser;
	const rows = await db.selectFrom('user_role').select(['user_id', 'role']).where('user_id', 'in', userIds).execute();
	for (const row of rows) byUser.get(row.user_id)?.push(row.role);
	for (const roles of byUser.values()) roles.sort((a, b) => roleOrder.indexOf(a) - roleOrder.indexOf(b));
	return byUser;
}
