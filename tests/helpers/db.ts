import { openDatabase } from '$lib/server/db/connect';
import { migrateToLatest } from '$lib/server/db/migrate';

/** A fresh in-memory database migrated with the real migrations. */
export async function createTestDb() {
	const db = openDatabase(':memory:');
	await migrateToLatest(db);
	return db;
}
