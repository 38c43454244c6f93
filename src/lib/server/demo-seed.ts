import { addMember, createCompany } from './companies';
import { db as defaultDb, inTransaction, type DB } from './db';
import { DEMO_COMPANIES, DEMO_PASSWORD, DEMO_PEOPLE } from './demo-people';
import { grantRole, setTrainerScope } from './roles';
import { createUser } from './users';
import { hashPassword } from './passwords';
import { enrol } from './enrolments';
import { seedDemoCertificates } from './demo-certificates';
import { BOARD_DEMO_PEOPLE, seedBoardDemo } from './demo-board';

/** Seeds the invented demo scenario into an empty database; does nothing otherwise. */
export async function seedDemo(db: DB = defaultDb): Promise<boolean> {
	const existing = await db.selectFrom('User').select('id').limit(1).executeTakeFirst();
	if (existing) return false;
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	await inTransaction(db, async (trx) => {
		const companyIds = new Map<string, string>();
		const byEmail = new Map<string, string>();
		for (const name of DEMO_COMPANIES) companyIds.set(name, (await createCompany(null, name, trx)).id);
		for (const person of [...DEMO_PEOPLE, ...BOARD_DEMO_PEOPLE]) {
			const user = await createUser({ email: person.email, name: person.name, emailVerified: true }, trx);
			byEmail.set(person.email, user.id);
			await trx.updateTable('User').set({ passwordHash }).where('id', '=', user.id).execute();
			for (const role of person.roles) await grantRole(null, user.id, role, trx);
			if (person.company) await addMember(null, companyIds.get(person.company.name)!, user.id, person.company.role, trx);
			if (person.company && person.companyTrainer) await setTrainerScope(null, user.id, companyIds.get(person.company.name)!, trx);
			for (const course of person.enrolments ?? []) await enrol(null, user.id, course, 'demo', trx);
		}
		await seedDemoCertificates(byEmail, trx);
		await seedBoardDemo(byEmail, trx);
	});
	return true;
}
