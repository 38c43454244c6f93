import type { Kysely } from 'kysely';
import { config } from '../config';
import { ensureWritableDir, openConfigured } from './engine';
import type { Database } from './schema';

export type { Database } from './schema';
export type DB = Kysely<Database>;

let instance: DB | undefined;

/** The app's one database, opened on first use: PostgreSQL when DATABASE_URL is set, else SQLite under DATA_DIR. */
export function getDb(): DB {
	if (!instance) {
		ensureWritableDir(config.dataDir);
		instance = openConfigured(config);
	}
	return instance;
}

/** A proxy so modules can write `db.selectFrom(...)` and still open the file lazily. */
export const db: DB = new Proxy({} as DB, {
	get(_target, prop) {
		const real = getDb() as unknown as Record<string | symbol, unknown>;
		const value = real[prop];
		return typeof value === 'function' ? (value as Function).bind(real) : value;
	}
});

/**
 * Runs `work` in a transaction, joining the caller's when `db` already is one, so domain
 * functions compose (a seed or a larger change can wrap several of them atomically).
 * On SQLite the transaction begins IMMEDIATE (see engine.ts): when another process holds the
 * write lock past the busy timeout it throws an error for which `isDatabaseBusy` is true. On
 * PostgreSQL transactions run at once (READ COMMITTED), so a read-modify-write inside one is a
 * guarded update, a unique constraint or a row lock (`lockingRows`), never a plain read then write.
 */
export function inTransaction<T>(db: DB, work: (trx: DB) => Promise<T>): Promise<T> {
	return db.isTransaction ? work(db) : db.transaction().execute(work);
}
