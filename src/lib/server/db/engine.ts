import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import pg from 'pg';
import {
	CompiledQuery,
	Kysely,
	PostgresAdapter,
	PostgresDialect,
	SqliteDialect,
	SqliteDriver,
	sql,
	type ColumnDataType,
	type ColumnDefinitionBuilder,
	type DatabaseConnection,
	type Dialect,
	type Expression,
	type ExpressionBuilder,
	type RawBuilder,
	type SelectQueryBuilder,
	type SqlBool
} from 'kysely';
import type { Database as Schema } from './schema';

/**
 * The one place that knows which database engine runs under the app. Everything else (domain
 * modules, routes, migrations) writes one set of Kysely queries; what differs between engines
 * lives here:
 *
 * - opening: `DATABASE_URL=postgres://...` opens PostgreSQL through `pg`'s pool
 *   (Kysely's PostgresDialect); without it, SQLite under DATA_DIR through better-sqlite3;
 * - driver error codes (`isUniqueViolation`, `isDatabaseBusy`);
 * - migration pieces that have no common SQL: SQL defaults for ids and times, an
 *   auto-numbered key, floating-point columns and the append-only rule of a table;
 * - query pieces: case-blind text search, row locks, counts that `pg` returns as strings;
 * - the SQLite driver handle for prepared statements on hot paths (null on PostgreSQL).
 *
 * Values are portable by convention: integer 0/1 for booleans, UTC ISO strings for times (they
 * compare as text on both), JSON kept as text and parsed in the app, ids made in the app.
 */

export type Engine = 'sqlite' | 'postgres';

/** Which engine a Kysely instance (or transaction) talks to. PGlite counts as PostgreSQL. */
export function engineOf(db: Kysely<any>): Engine {
	return db.getExecutor().adapter instanceof PostgresAdapter ? 'postgres' : 'sqlite';
}

// ---------------------------------------------------------------- opening

/**
 * SQLite write transactions take the write lock when they begin (`begin immediate`), so a busy
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
	if (file !== ':memory:' && file !== '') readerFiles.set(db, { file, busyTimeoutMs });
	return db;
}

const readerFiles = new WeakMap<Kysely<Schema>, { file: string; busyTimeoutMs: number }>();
const readers = new WeakMap<Kysely<Schema>, Database.Database>();

/**
 * A second, read-only connection to a SQLite file, for prepared statements on hot read paths.
 * Statements on the app's own connection would run inside whatever transaction another request
 * has open on it (and so could see rows it later rolls back); with WAL this connection sees
 * only committed data and never waits for writers. Null for PostgreSQL and in-memory files.
 */
export function sqliteReader(db: Kysely<Schema>): Database.Database | null {
	let reader = readers.get(db);
	if (!reader) {
		const at = readerFiles.get(db);
		if (!at) return null;
		reader = new Database(at.file, { readonly: true, fileMustExist: true });
		reader.pragma(`busy_timeout = ${Math.max(0, Math.floor(at.busyTimeoutMs))}`);
		readers.set(db, reader);
	}
	return reader;
}

/**
 * Opens PostgreSQL through a `pg` pool. `lock_timeout` plays the part of SQLite's busy timeout:
 * a statement that waits longer than that for a row or table lock fails with 55P03
 * (`isDatabaseBusy`), and the request answers 503.
 */
export function openPostgres(connectionString: string, { poolSize = 10, lockTimeoutMs = 5000 } = {}): Kysely<Schema> {
	const pool = new pg.Pool({
		connectionString,
		max: poolSize,
		options: `-c lock_timeout=${Math.max(0, Math.floor(lockTimeoutMs))}`,
		types: { getTypeParser: numbersAsNumbers }
	});
	// An idle client that loses its connection must not crash the process; the pool replaces it.
	pool.on('error', (e) => console.error(`PostgreSQL pool: ${e.message}`));
	return new Kysely<Schema>({ dialect: new PostgresDialect({ pool }) });
}

const INT8_OID = 20;
const NUMERIC_OID = 1700;

/**
 * `pg` returns bigint (count(*), sums of integers, bigint columns) and numeric as strings, to
 * keep precision past 2^53; every such value here (counts, cents, seeds, epoch milliseconds) is
 * far below that, so they come back as numbers, as SQLite and PGlite return them.
 */
function numbersAsNumbers(oid: number, format?: 'text' | 'binary'): (value: string) => unknown {
	if (oid === INT8_OID || oid === NUMERIC_OID) return (value: string) => (value === null ? null : Number(value));
	return format === 'binary' ? pg.types.getTypeParser(oid, 'binary') : pg.types.getTypeParser(oid, 'text');
}

export interface DatabaseSettings {
	databaseUrl: string | null;
	databaseFile: string;
	dbBusyTimeoutMs: number;
	dbPoolSize: number;
}

/** The app's database as configured: PostgreSQL when DATABASE_URL is set, else the SQLite file. */
export function openConfigured(settings: DatabaseSettings): Kysely<Schema> {
	if (settings.databaseUrl) return openPostgres(settings.databaseUrl, { poolSize: settings.dbPoolSize });
	ensureWritableDir(path.dirname(settings.databaseFile));
	return openDatabase(settings.databaseFile, settings.dbBusyTimeoutMs);
}

/** The driver handle behind a SQLite database opened here, for prepared statements on hot paths; null for PostgreSQL. */
export function sqliteHandle(db: Kysely<Schema>): Database.Database | null {
	return handles.get(db) ?? null;
}

/**
 * A query that is built once and run many times with other parameters, for the hottest
 * look-ups (a certificate number on the public API): Kysely builds and compiles a query on
 * every call, and its SQLite driver prepares the statement each time. `build` makes the query
 * with stand-in values; each run passes the real ones, in the same order. On a SQLite file the
 * statement is prepared once on the read-only connection (`sqliteReader`); elsewhere (PostgreSQL,
 * an in-memory database, inside a transaction) the compiled text runs through Kysely's driver
 * with the new parameters. For reads only. Pass the database itself (`getDb()`): the lazy `db`
 * proxy of `db/index.ts` is not the opened instance, so it would take the slower path.
 */
export function reusableQuery<Row>(build: (db: Kysely<Schema>) => { compile(): CompiledQuery<Row> }) {
	const prepared = new WeakMap<Kysely<Schema>, (parameters: readonly unknown[]) => Promise<Row[]>>();
	return (db: Kysely<Schema>, parameters: readonly unknown[]): Promise<Row[]> => {
		let run = prepared.get(db);
		if (!run) {
			const compiled = build(db).compile();
			const count = compiled.parameters.length;
			const statement = sqliteReader(db)?.prepare(compiled.sql);
			run = (values) => {
				if (values.length !== count) throw new Error(`reusableQuery: ${values.length} parameters given, ${count} expected`);
				return statement ? Promise.resolve(statement.all(...values) as Row[]) : db.executeQuery(CompiledQuery.raw(compiled.sql, [...values])).then((r) => r.rows as Row[]);
			};
			prepared.set(db, run);
		}
		return run(parameters);
	};
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

// ---------------------------------------------------------------- driver errors

/**
 * Driver error codes behind one question, so domain code never matches an engine's message.
 * SQLite (better-sqlite3): `SQLITE_CONSTRAINT_UNIQUE` / `SQLITE_CONSTRAINT_PRIMARYKEY`;
 * PostgreSQL (pg, PGlite): SQLSTATE `23505` (unique_violation).
 */
export function isUniqueViolation(e: unknown): boolean {
	const code = (e as { code?: unknown } | null)?.code;
	return code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505';
}

/**
 * Another process holds the lock: SQLite `SQLITE_BUSY` (and its extended codes, such as
 * `SQLITE_BUSY_SNAPSHOT`); PostgreSQL SQLSTATE `55P03` (lock_not_available), `40001`
 * (serialization_failure) and `40P01` (deadlock_detected). The request may be tried again shortly.
 */
export function isDatabaseBusy(e: unknown): boolean {
	const code = (e as { code?: unknown } | null)?.code;
	return (typeof code === 'string' && code.startsWith('SQLITE_BUSY')) || code === '55P03' || code === '40001' || code === '40P01';
}

// ---------------------------------------------------------------- migrations

/**
 * SQL default for a text id of 32 hex digits (only the Auth.js tables rely on one; the app
 * makes its own ids). The SQLite form is the one migration 001 always had.
 */
export function idDefault(db: Kysely<any>): RawBuilder<string> {
	return engineOf(db) === 'postgres' ? sql`(replace(gen_random_uuid()::text, '-', ''))` : sql`(lower(hex(randomblob(16))))`;
}

/** SQL default for "now" as a UTC ISO string with milliseconds, like `new Date().toISOString()`. */
export function nowDefault(db: Kysely<any>): RawBuilder<string> {
	return engineOf(db) === 'postgres'
		? sql`(to_char(now() at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'))`
		: sql`(strftime('%Y-%m-%dT%H:%M:%fZ','now'))`;
}

/** An integer primary key the database numbers: SQLite `autoincrement`, PostgreSQL an identity column. */
export function serialPrimaryKey(db: Kysely<any>): (c: ColumnDefinitionBuilder) => ColumnDefinitionBuilder {
	return engineOf(db) === 'postgres' ? (c) => c.primaryKey().generatedByDefaultAsIdentity() : (c) => c.primaryKey().autoIncrement();
}

/** An integer column wider than 32 bits (random seeds, epoch milliseconds): SQLite `integer` holds 64 bits, PostgreSQL needs `bigint`. */
export function wideIntegerType(db: Kysely<any>): ColumnDataType {
	return engineOf(db) === 'postgres' ? 'bigint' : 'integer';
}

/** A floating-point column: SQLite `real` (8 bytes), PostgreSQL `double precision` (its `real` has 4). */
export function floatType(db: Kysely<any>): ColumnDataType {
	return engineOf(db) === 'postgres' ? 'double precision' : 'real';
}

/**
 * Makes a table append-only in the database itself: updates and deletions fail with
 * "<table> is append-only". SQLite: two triggers raising ABORT (their text is kept exactly as
 * migration 001 first wrote it, so existing databases and fresh ones have one schema);
 * PostgreSQL: a trigger function raising an exception.
 */
export async function appendOnly(db: Kysely<any>, table: string): Promise<void> {
	if (engineOf(db) === 'postgres') {
		await sql`create or replace function refuse_append_only_change() returns trigger language plpgsql as $$
			begin raise exception '% is append-only', tg_table_name using errcode = 'restrict_violation'; end $$`.execute(db);
		await sql`create trigger ${sql.id(`${table}_no_change`)} before update or delete on ${sql.table(table)}
			for each statement execute function refuse_append_only_change()`.execute(db);
		return;
	}
	for (const [suffix, verb] of [['no_update', 'update'], ['no_delete', 'delete']]) {
		await sql.raw(`create trigger ${table}_${suffix} before ${verb} on ${table}\n\t\tbegin select raise(abort, '${table} is append-only'); end`).execute(db);
	}
}

/** Undoes `appendOnly` for a down migration that keeps the table. */
export async function dropAppendOnly(db: Kysely<any>, table: string): Promise<void> {
	if (engineOf(db) === 'postgres') {
		await sql`drop trigger if exists ${sql.id(`${table}_no_change`)} on ${sql.table(table)}`.execute(db);
		return;
	}
	await sql.raw(`drop trigger if exists ${table}_no_update`).execute(db);
	await sql.raw(`drop trigger if exists ${table}_no_delete`).execute(db);
}

// ---------------------------------------------------------------- queries

/**
 * `column` contains `text`, ignoring letter case, on both engines (SQLite's LIKE ignores ASCII
 * case and PostgreSQL's does not, so both sides are lowered). `%`, `_` and `\` in `text` match
 * themselves.
 */
export function containsText<DB, TB extends keyof DB>(eb: ExpressionBuilder<DB, TB>, column: Expression<string | null>, text: string): Expression<SqlBool> {
	const pattern = `%${text.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
	return sql<SqlBool>`lower(${column}) like ${pattern} escape '\\'`;
}

/**
 * Locks the rows a select reads until the transaction ends (PostgreSQL `for update`), so two
 * transactions that read-modify-write one row take turns. SQLite needs none: a write
 * transaction there holds the whole database from its first statement (`begin immediate`).
 */
export function lockingRows<DB, TB extends keyof DB, O>(db: Kysely<any>, query: SelectQueryBuilder<DB, TB, O>): SelectQueryBuilder<DB, TB, O> {
	return engineOf(db) === 'postgres' ? query.forUpdate() : query;
}

/** A count or sum as a number: `pg` returns bigint and numeric results as strings. */
export function toNumber(value: string | number | bigint | null | undefined): number {
	return value === null || value === undefined ? 0 : Number(value);
}
