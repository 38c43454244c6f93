import Database from 'better-sqlite3';
import { Kysely, SqliteDialect } from 'kysely';
import type { Database as Schema } from './schema';

/** Opens a SQLite file (or ':memory:') with WAL, foreign keys and a busy timeout. */
export function openDatabase(file: string): Kysely<Schema> {
	const sqlite = new Database(file);
	sqlite.pragma('journal_mode = WAL');
	sqlite.pragma('foreign_keys = ON');
	sqlite.pragma('busy_timeout = 5000');
	sqlite.pragma('synchronous = NORMAL');
	return new Kysely<Schema>({ dialect: new SqliteDialect({ database: sqlite }) });
}
