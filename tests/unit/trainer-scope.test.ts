/**
 * Trainer scope (issue 8, item 9): the training provider's trainer works with everyone; a
 * company's own trainer only with that company's crew, in every domain function the trainer
 * pages use. Before the scope existed, the company trainer saw and acted on everyone.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { listAttemptsForStaff, reviewAttemptForStaff, startAttempt, submitAttempt, waiveWait } from '$lib/server/attempts';
import { listAudit } from '$lib/server/audit';
import { addMember, createCompany } from '$lib/server/companies';
import { enrol } from '$lib/server/enrolments';
import { itemStatistics } from '$lib/server/item-stats';
import { grantRole, setTrainerScope } from '$lib/server/roles';
import { trainerMaySee, trainerScope } from '$lib/server/trainer-scope';
import { createUser } from '$lib/server/users';
import { openDatabase } from '$lib/server/db/engine';
import { Migrator, type Kysely, type Migration } from 'kysely';
import { createTestDb } from '../helpers/db';

const COURSE = 'packer-pressure-safety';
const T0 = new Date('2025-03-03T08:00:00.000Z');

describe('trainer scope', () => {
	let db: Awaited<ReturnType<typeof createTestDb>>;
	let provider: string;
	let companyTrainer: string;
	let plainAdmin: string;
	let ownCrew: string;
	let otherCrew: string;
	let registrar: string;

	beforeEach(async () => {
		db = await createTestDb();
		const mk = async (email: string) => (await createUser({ email, name: email.split('@')[0] }, db)).id;
		const [a, b] = [await createCompany(null, 'Alpha Drains', db), await createCompany(null, 'Beta Pipes', db)];
		provider = await mk('provider@example.test');
		companyTrainer = await mk('trainer@alpha.test');
		plainAdmin = await mk('admin@beta.test');
		ownCrew = await mk('crew@alpha.test');
		otherCrew = await mk('crew@beta.test');
		registrar = await mk('registrar@example.test');
		await grantRole(null, provider, 'trainer', db);
		await grantRole(null, registrar, 'registrar', db);
		await addMember(null, a.id, companyTrainer, 'admin', db);
		await addMember(null, a.id, ownCrew, 'member', db);
		await addMember(null, b.id, otherCrew, 'member', db);
		await addMember(null, b.id, plainAdmin, 'admin', db);
		expect(await setTrainerScope(registrar, companyTrainer, a.id, db)).toBe(true);
		for (const person of [ownCrew, otherCrew]) {
			await enrol(null, person, COURSE, 'registrar', db);
			const started = await startAttempt(person, COURSE, { db, now: T0, seed: 3 });
			if (!started.ok) throw new Error(started.reason);
			await submitAttempt(person, started.attempt.id, { db, now: T0 });
		}
	});
	afterEach(async () => db.destroy());

	const attemptOf = async (userId: string) => (await db.selectFrom('test_attempt').select('id').where('user_id', '=', userId).executeTakeFirstOrThrow()).id;

	it('answers who may see whom', async () => {
		expect(await trainerMaySee(provider, otherCrew, db)).toBe(true);
		expect(await trainerMaySee(registrar, otherCrew, db)).toBe(true);
		expect(await trainerMaySee(companyTrainer, ownCrew, db)).toBe(true);
		expect(await trainerMaySee(companyTrainer, otherCrew, db)).toBe(false);
		expect(await trainerMaySee(plainAdmin, otherCrew, db)).toBe(false);
		expect(await trainerScope(plainAdmin, db)).toEqual({ kind: 'nobody' });
	});

	it("lists, shows and lets a company trainer lift waits only for the company's crew", async () => {
		const listed = async (viewer: string) => (await listAttemptsForStaff(viewer, { db, now: T0 })).map((r) => r.person.id).sort();
		expect(await listed(provider)).toEqual([ownCrew, otherCrew].sort());
		expect(await listed(companyTrainer)).toEqual([ownCrew]);
		expect(await listed(plainAdmin)).toEqual([]);

		expect(await reviewAttemptForStaff(companyTrainer, await attemptOf(ownCrew), { db })).not.toBeNull();
		expect(await reviewAttemptForStaff(companyTrainer, await attemptOf(otherCrew), { db })).toBeNull();

		const later = new Date(T0.getTime() + 3_600_000);
		expect(await waiveWait(companyTrainer, await attemptOf(otherCrew), 'Ill on the day', { db, now: later })).toMatchObject({ ok: false, status: 404 });
		expect(await listAudit({ subjectId: await attemptOf(otherCrew) }, db)).not.toContainEqual(expect.objectContaining({ action: 'test.wait-waived' }));
		expect(await waiveWait(companyTrainer, await attemptOf(ownCrew), 'Ill on the day', { db, now: later })).toMatchObject({ ok: true });
	});

	it("counts only the company's crew in the item statistics", async () => {
		expect((await itemStatistics(provider, COURSE, db))?.attemptCount).toBe(2);
		expect((await itemStatistics(companyTrainer, COURSE, db))?.attemptCount).toBe(1);
		expect((await itemStatistics(plainAdmin, COURSE, db))?.attemptCount).toBe(0);
	});

	it('moves a trainer between everyone and one company, in the audit log, and refuses an unknown company', async () => {
		expect(await setTrainerScope(registrar, companyTrainer, null, db)).toBe(true);
		expect(await trainerMaySee(companyTrainer, otherCrew, db)).toBe(true);
		expect(await setTrainerScope(registrar, companyTrainer, crypto.randomUUID(), db)).toBe(false);
		const actions = (await listAudit({ subjectId: companyTrainer }, db)).map((e) => e.action);
		expect(actions.filter((a) => a === 'role.trainer-scope')).toHaveLength(2);
	});
});

describe('migration 010 moves existing trainers forward', () => {
	it('keeps trainers without a company for everyone and scopes a one-company trainer to that company', async () => {
		const modules = import.meta.glob<Migration>('/migrations/*.ts', { eager: true });
		const all = Object.fromEntries(Object.entries(modules).map(([path, m]) => [path.split('/').pop()!.replace(/\.ts$/, ''), m]));
		const before = Object.fromEntries(Object.entries(all).filter(([name]) => name < '010'));
		const db = openDatabase(':memory:') as Kysely<any>;
		const migrate = (migrations: Record<string, Migration>) =>
			new Migrator({ db, provider: { getMigrations: async () => migrations }, allowUnorderedMigrations: true }).migrateToLatest();
		expect((await migrate(before)).error).toBeUndefined();
		const now = new Date().toISOString();
		await db.insertInto('User').values([{ id: 'p', email: 'p@example.test' }, { id: 'c', email: 'c@example.test' }]).execute();
		await db.insertInto('company').values({ id: 'co', name: 'Co', created_at: now }).execute();
		await db.insertInto('membership').values({ company_id: 'co', user_id: 'c', role: 'admin', created_at: now }).execute();
		await db.insertInto('user_role').values([{ user_id: 'p', role: 'trainer', granted_at: now }, { user_id: 'c', role: 'trainer', granted_at: now }, { user_id: 'c', role: 'inspector', granted_at: now }]).execute();
		expect((await migrate(all)).error).toBeUndefined();
		const rows = await sql<{ user_id: string; role: string; company_id: string | null }>`select user_id, role, company_id from user_role order by user_id, role`.execute(db);
		expect(rows.rows).toEqual([
			{ user_id: 'c', role: 'inspector', company_id: null },
			{ user_id: 'c', role: 'trainer', company_id: 'co' },
			{ user_id: 'p', role: 'trainer', company_id: null }
		]);
		await db.destroy();
	});
});
