import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { CompiledQuery, Kysely, SqliteDialect, SqliteDriver, type DatabaseConnection, type Dialect } from 'kysely';
import type { Database as Schema } from './schema';

/**
 * Write transactions take the write lock when they begin (`begin immediate`), so a busy
 * database is found before any work is done and never half-way through (SQLite, "Transactions":
 * a deferred transaction that later needs to write can fail with SQLITE_BUSY mid-way).
 */
class ImmediateSqliteDriver extends SqliteDriver {
	override async beginTransaction(connection: DatabaseConnection): Promise<void> {
		await connection.executeQuery(CompiledQuery.raw('begin immediate'));
	}
}

function immediateDialect(sqlite: Database.Database): Dialect {
	const base = new SqliteDialect({ database: sqlite });
	return {
		createAdapter: () => base.createAdapter(),
		createDriver: () => new ImmediateSqliteDriver({ database: sqlite }),
		createIntrospector: (db) => base.createIntrospector(db),
		createQueryCompiler: () => base.createQueryCompiler()
	};
}

const handles = new WeakMap<object, Database.Database>();

/**
 * Opens a SQLite file (or ':memory:') with WAL and foreign keys. The busy timeout is short on
 * purpose: better-sqlite3 waits for a lock synchronously, which stops the whole event loop, so
 * a write that cannot get the lock soon fails (and the request answers 503) instead.
 */
export function openDatabase(file: string, busyTimeoutMs = 100): Kysely<Schema> {
	const sqlite = new Database(file);
	sqlite.pragma('journal_mode = WAL');
	sqlite.pragma('foreign_keys = ON');
	sqlite.pragma(`busy_timeout = ${Math.max(0, Math.floor(busyTimeoutMs))}`);
	sqlite.pragma('synchronous = NORMAL');
	const db = new Kysely<Schema>({ dialect: immediateDialect(sqlite) });
	handles.set(db, sqlite);
	return db;
}

/** The driver handle behind a database opened here, for prepared statements on hot paths; null for other engines. */
export function sqliteHandle(db: Kysely<Schema>): Database.Database | null {
	return handles.get(db) ?? null;
}

export class DataDirError extends Error {}

/** Makes sure the data folder exists and can be written; throws a one-line DataDirError otherwise. */
export function ensureWritableDir(dir: string): void {
	const probe = path.join(dir, `.write-check-${process.pid}`);
	try {
		fs.mkdirSync(dir, { recursive: true });
		fs.writeFileSync(probe, '');
		fs.rmSync(probe);
	} catch (e) {
		const code = (e as NodeJS.ErrnoException).code ?? 'error';
		throw new DataDirError(`The data folder ${dir} cannot be written (${code}): set DATA_DIR to a writable folder.`);
	}
}
