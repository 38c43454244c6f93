import type { CompanyRole } from './db/schema';
import { recordAudit } from './audit';
import { db as defaultDb, inTransaction, type DB } from './db';

export async function createCompany(actorId: string | null, name: string, db: DB = defaultDb) {
	const company = { id: crypto.randomUUID(), name: name.trim(), created_at: new Date().toISOString() };
	await inTransaction(db, async (trx) => {
		await trx.insertInto('company').values(company).execute();
		await recordAudit({ actorId, action: 'company.create', subjectType: 'company', subjectId: company.id, detail: { name: company.name } }, trx);
	});
	return company;
}

export async function addMember(
	actorId: string | null,
	companyId: string,
	userId: string,
	role: CompanyRole,
	db: DB = defaultDb
) {
	await inTransaction(db, async (trx) => {
		await trx
			.insertInto('membership')
			.values({ company_id: companyId, user_id: userId, role, created_at: new Date().toISOString() })
			.onConflict((oc) => oc.columns(['company_id', 'user_id']).doUpdateSet({ role }))
			.execute();
		await recordAudit({ actorId, action: 'membership.set', subjectType: 'company', subjectId: companyId, detail: { userId, role } }, trx);
	});
}

export function listMembers(companyId: string, db: DB = defaultDb) {
	return db
		.selectFrom('membership')
		.innerJoin('User', 'User.id', 'membership.user_id')
		.select(['User.id', 'User.name', 'User.email', 'membership.role'])
		.where('membership.company_id', '=', companyId)
		.orderBy('User.name')
		.execute();
}

export function listCompanies(db: DB = defaultDb) {
	return db.selectFrom('company').select(['id', 'name']).orderBy('name').execute();
}
