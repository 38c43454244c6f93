import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Kysely } from 'kysely';
import pg from 'pg';
import { openDatabase, openPostgres } from '$lib/server/db/engine';
import { migrateToLatest } from '$lib/server/db/migrate';
import type { Database } from '$lib/server/db/schema';
import { pgliteTestDb } from './pglite';

/**
 * Test databases on the engine chosen by TEST_DB:
 * - `sqlite` (default): in-memory SQLite;
 * - `pglite`: PostgreSQL 17 in WebAssembly, in process: one instance per test process, a schema
 *   per test database (see pglite.ts); one connection, so transactions take turns;
 * - `postgres`: a real server at PG_TEST_URL (an account that may create databases); every test
 *   database is a copy of one migrated template, so transactions really run at once.
 */
export type TestEngine = 'sqlite' | 'pglite' | 'postgres';

export const testEngine: TestEngine = (() => {
	const chosen = (process.env.TEST_DB || 'sqlite').toLowerCase();
	if (chosen !== 'sqlite' && chosen !== 'pglite' && chosen !== 'postgres') throw new Error(`TEST_DB=${chosen}: use sqlite, pglite or postgres`);
	return chosen;
})();

type DB = Kysely<Database>;

function serverUrl(database: string): string {
	const url = new URL(process.env.PG_TEST_URL || '');
	url.pathname = `/${database}`;
	return url.toString();
}

let serial = 0;
let template: Promise<string> | undefined;

async function adminQuery(text: string): Promise<void> {
	const client = new pg.Client({ connectionString: process.env.PG_TEST_URL });
	await client.connect();
	try {
		await client.query(text);
	} finally {
		await client.end();
	}
}

/** One migrated template per test process; each test database is a copy of it. */
function migratedTemplate(): Promise<string> {
	template ??= (async () => {
		if (!process.env.PG_TEST_URL) throw new Error('TEST_DB=postgres needs PG_TEST_URL (for example postgres://postgres@127.0.0.1:55432/postgres)');
		const name = `pw_test_tpl_${process.pid}`;
		await adminQuery(`drop database if exists ${name}`);
		await adminQuery(`create database ${name}`);
		const db = openPostgres(serverUrl(name), { poolSize: 1 });
		await migrateToLatest(db);
		await db.destroy();
		return name;
	})();
	return template;
}

async function freshServerDatabase(migrated: boolean): Promise<string> {
	const name = `pw_test_${process.pid}_${++serial}`;
	await adminQuery(migrated ? `create database ${name} template ${await migratedTemplate()}` : `create database ${name}`);
	return name;
}

/** A fresh, empty database on the test engine, not migrated (for migration tests). */
export async function openTestDb(): Promise<DB> {
	if (testEngine === 'pglite') return pgliteTestDb<Database>(false, migrateToLatest);
	if (testEngine === 'postgres') return openPostgres(serverUrl(await freshServerDatabase(false)), { poolSize: 4 });
	return openDatabase(':memory:');
}

/** A fresh database on the test engine, migrated with the real migrations. */
export async function createTestDb(): Promise<DB> {
	if (testEngine === 'postgres') return openPostgres(serverUrl(await freshServerDatabase(true)), { poolSize: 4 });
	if (testEngine === 'pglite') return pgliteTestDb<Database>(true, migrateToLatest);
	const db = await openTestDb();
	await migrateToLatest(db);
	return db;
}

/**
 * `count` handles on ONE fresh migrated database, each with its own connections, for race tests:
 * SQLite opens one file several times (the write lock makes writers take turns); PostgreSQL gets
 * one pool per handle (transactions interleave). PGlite has a single connection, so every handle
 * is the same one.
 */
export async function createSharedTestDbs(count: number): Promise<DB[]> {
	if (testEngine === 'pglite') {
		const db = await createTestDb();
		return Array.from({ length: count }, () => db);
	}
	if (testEngine === 'postgres') {
		const url = serverUrl(await freshServerDatabase(true));
		return Array.from({ length: count }, () => openPostgres(url, { poolSize: 8 }));
	}
	const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'pw-shared-')), 'shared.sqlite');
	const first = openDatabase(file);
	await migrateToLatest(first);
	return [first, ...Array.from({ length: count - 1 }, () => openDatabase(file))];
}

/** Closes handles from `createSharedTestDbs` (the same PGlite handle only once). */
export async function destroyAll(dbs: DB[]): Promise<void> {
	for (const db of new Set(dbs)) await db.destroy();
}
