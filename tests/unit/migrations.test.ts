import { sql } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase } from '$lib/server/db/connect';
import { bundledMigrations, migrateToLatest } from '$lib/server/db/migrate';
import { Migrator } from 'kysely';
import { recordAudit } from '$lib/server/audit';
import { createTestDb } from '../helpers/db';

describe('migrations', () => {
	let db: Awaited<ReturnType<typeof createTestDb>> | undefined;
	afterEach(async () => db?.destroy());

	it('create every table on a fresh database, and a second run changes nothing', async () => {
		db = openDatabase(':memory:');
		const applied = await migrateToLatest(db);
		expect(applied.slice(0, 2)).toEqual(['001_people_and_auth', '002_enrolments']);
		const tables = await sql<{ name: string }>`select name from sqlite_master where type = 'table' order by name`.execute(db);
		const names = tables.rows.map((r) => r.name);
		for (const t of ['User', 'Account', 'Session', 'VerificationToken', 'user_role', 'company', 'membership', 'audit_log', 'password_reset']) {
			expect(names).toContain(t);
		}
		expect(await migrateToLatest(db)).toEqual([]);
	});

	it('roll all the way down again', async () => {
		db = openDatabase(':memory:');
		await migrateToLatest(db);
		const migrator = new Migrator({ db, provider: bundledMigrations });
		let result;
		do {
			result = await migrator.migrateDown();
			expect(result.error).toBeUndefined();
		} while (result.results?.length);
		const tables = await sql<{ name: string }>`select name from sqlite_master where type = 'table' and name not like 'kysely_%' and name not like 'sqlite_%'`.execute(db);
		expect(tables.rows).toEqual([]);
	});

	it('turn foreign keys on', async () => {
		db = await createTestDb();
		await expect(
			db.insertInto('membership').values({ company_id: 'nope', user_id: 'nobody', role: 'member', created_at: 'x' }).execute()
		).rejects.toThrow(/FOREIGN KEY/);
	});

	it('keep the audit log append-only', async () => {
		db = await createTestDb();
		await recordAudit({ actorId: null, action: 'test', subjectType: 'thing', subjectId: '1' }, db);
		await expect(db.updateTable('audit_log').set({ action: 'changed' }).execute()).rejects.toThrow(/append-only/);
		await expect(db.deleteFrom('audit_log').execute()).rejects.toThrow(/append-only/);
	});
});
