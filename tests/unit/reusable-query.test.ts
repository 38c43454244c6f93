import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { sql, type Kysely } from 'kysely';
import { afterEach, describe, expect, it } from 'vitest';
import { openDatabase, reusableQuery } from '$lib/server/db/engine';
import type { Database } from '$lib/server/db/schema';

/** A table of its own, so the test needs no migrations; the query is typed loosely on purpose. */
async function withTable(db: Kysely<Database>) {
	await sql`create table probe (id integer primary key, name text not null)`.execute(db);
	await sql`insert into probe (id, name) values (1, 'one'), (2, 'two')`.execute(db);
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
const byId = reusableQuery<{ id: number; name: string }>((db) => (db as Kysely<any>).selectFrom('probe').select(['id', 'name']).where('id', '=', 0));

const opened: Kysely<Database>[] = [];
afterEach(async () => {
	for (const db of opened.splice(0)) await db.destroy();
});

describe('a reusable query (built once, run with new parameters)', () => {
	it('answers as the query built afresh would, on a file and in memory', async () => {
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-reusable-'));
		for (const file of [path.join(dir, 'app.sqlite'), ':memory:']) {
			const db = openDatabase(file);
			opened.push(db);
			await withTable(db);
			expect(await byId(db, [2])).toEqual([{ id: 2, name: 'two' }]);
			expect(await byId(db, [1])).toEqual([{ id: 1, name: 'one' }]);
			expect(await byId(db, [3])).toEqual([]);
			expect(() => byId(db, [1, 2])).toThrow(/2 parameters given, 1 expected/);
		}
	});

	it("never sees another request's transaction before it commits, nor what it rolls back", async () => {
		const db = openDatabase(path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'pw-reusable-')), 'app.sqlite'));
		opened.push(db);
		await withTable(db);
		let release!: () => void;
		const held = new Promise<void>((resolve) => (release = resolve));
		let inserted!: () => void;
		const insertedYet = new Promise<void>((resolve) => (inserted = resolve));
		const rolledBack = db
			.transaction()
			.execute(async (trx) => {
				await sql`insert into probe (id, name) values (7, 'seven')`.execute(trx);
				inserted();
				await held;
				throw new Error('roll back');
			})
			.catch(() => 'rolled back');
		await insertedYet;
		expect(await byId(db, [7])).toEqual([]);
		release();
		expect(await rolledBack).toBe('rolled back');
		expect(await byId(db, [7])).toEqual([]);
		await sql`insert into probe (id, name) values (8, 'eight')`.execute(db);
		expect(await byId(db, [8])).toEqual([{ id: 8, name: 'eight' }]);
	});
});
