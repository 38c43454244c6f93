import fs from 'node:fs';
import { Migrator, sql, type Kysely } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase } from '$lib/server/db/engine';
import { bundledMigrations, migrateToLatest } from '$lib/server/db/migrate';
import { recordAudit } from '$lib/server/audit';
import { createTestDb, openTestDb, testEngine } from '../helpers/db';

/** Tables of the database a handle talks to, on either engine. */
async function tableNames(db: Kysely<any>): Promise<string[]> {
	const rows =
		testEngine === 'sqlite'
			? await sql<{ name: string }>`select name from sqlite_master where type = 'table' and name not like 'sqlite_%'`.execute(db)
			: await sql<{ name: string }>`select tablename as name from pg_tables where schemaname = current_schema()`.execute(db);
	return rows.rows.map((r) => r.name).filter((n) => !n.startsWith('kysely_')).sort();
}

describe(`migrations (${testEngine})`, () => {
	let db: Kysely<any> | undefined;
	afterEach(async () => db?.destroy());

	it('create every table on a fresh database, and a second run changes nothing', async () => {
		db = await openTestDb();
		const applied = await migrateToLatest(db);
		expect(applied.slice(0, 2)).toEqual(['001_people_and_auth', '002_enrolments']);
		const names = await tableNames(db);
		for (const t of ['User', 'Account', 'Session', 'VerificationToken', 'user_role', 'company', 'membership', 'audit_log', 'password_reset']) {
			expect(names).toContain(t);
		}
		expect(await migrateToLatest(db)).toEqual([]);
	});

	it('roll all the way down again', async () => {
		db = await openTestDb();
		await migrateToLatest(db);
		const migrator = new Migrator({ db, provider: bundledMigrations, allowUnorderedMigrations: true });
		let result;
		do {
			result = await migrator.migrateDown();
			expect(result.error).toBeUndefined();
		} while (result.results?.length);
		expect(await tableNames(db)).toEqual([]);
	});

	it('turn foreign keys on', async () => {
		db = await createTestDb();
		await expect(
			db.insertInto('membership').values({ company_id: 'nope', user_id: 'nobody', role: 'member', created_at: 'x' }).execute()
		).rejects.toThrow(/FOREIGN KEY/i);
	});

	it('keep the audit log append-only', async () => {
		db = await createTestDb();
		await recordAudit({ actorId: null, action: 'test', subjectType: 'thing', subjectId: '1' }, db);
		await expect(db.updateTable('audit_log').set({ action: 'changed' }).execute()).rejects.toThrow(/append-only/);
		await expect(db.deleteFrom('audit_log').execute()).rejects.toThrow(/append-only/);
		expect((await db.selectFrom('audit_log').select('action').execute()).map((r) => r.action)).toEqual(['test']);
	});

	it('number audit entries and fill the SQL defaults the Auth.js tables keep', async () => {
		db = await createTestDb();
		await recordAudit({ actorId: null, action: 'one', subjectType: 'thing', subjectId: '1' }, db);
		await recordAudit({ actorId: null, action: 'two', subjectType: 'thing', subjectId: '1' }, db);
		const ids = (await db.selectFrom('audit_log').select('id').orderBy('id').execute()).map((r) => Number(r.id));
		expect(ids[1]).toBeGreaterThan(ids[0]);
		await db.insertInto('User').values({ id: 'u1', email: 'u1@example.test' }).execute();
		await db.insertInto('Account').values({ userId: 'u1', type: 'email', provider: 'p', providerAccountId: 'x' }).execute();
		const user = await db.selectFrom('User').select('createdAt').executeTakeFirstOrThrow();
		expect(user.createdAt).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
		expect(Math.abs(Date.parse(user.createdAt) - Date.now())).toBeLessThan(60_000);
		expect((await db.selectFrom('Account').select('id').executeTakeFirstOrThrow()).id).toMatch(/^[0-9a-f]{32}$/);
	});
});

describe('portable migrations leave the SQLite schema as it was', () => {
	it('001..040 give exactly the tables, indexes and triggers they gave before the engine module', async () => {
		// The fixture is sqlite_master of a fresh database migrated to 040 by the migrations as they
		// stood before their engine-specific pieces moved into engine.ts; existing databases hold that schema.
		const before = JSON.parse(fs.readFileSync('tests/unit/fixtures/sqlite-schema-001-040.json', 'utf8'));
		const db = openDatabase(':memory:');
		const migrator = new Migrator({ db, provider: bundledMigrations, allowUnorderedMigrations: true });
		const { error } = await migrator.migrateTo('040_certificates');
		expect(error).toBeUndefined();
		const now = await sql`select type, name, tbl_name, sql from sqlite_master where name not like 'kysely_%' order by type, name`.execute(db);
		expect(now.rows).toEqual(before);
		await db.destroy();
	});
});
