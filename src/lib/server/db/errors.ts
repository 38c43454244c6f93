/**
 * Driver error codes behind one question, so domain code never matches an engine's message.
 * SQLite (better-sqlite3): `SQLITE_CONSTRAINT_UNIQUE` / `SQLITE_CONSTRAINT_PRIMARYKEY`;
 * PostgreSQL (pg): SQLSTATE `23505` (unique_violation).
 */
export function isUniqueViolation(e: unknown): boolean {
	const code = (e as { code?: unknown } | null)?.code;
	return code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505';
}

/**
 * Another process holds the write lock: SQLite `SQLITE_BUSY` (and its extended codes, such as
 * `SQLITE_BUSY_SNAPSHOT`); PostgreSQL SQLSTATE `55P03` (lock_not_available). The request
 * may be tried again shortly.
 */
export function isDatabaseBusy(e: unknown): boolean {
	const code = (e as { code?: unknown } | null)?.code;
	return (typeof code === 'string' && code.startsWith('SQLITE_BUSY')) || code === '55P03';
}
