/**
 * Driver error codes behind one question, so domain code never matches an engine's message.
 * SQLite (better-sqlite3): `SQLITE_CONSTRAINT_UNIQUE` / `SQLITE_CONSTRAINT_PRIMARYKEY`;
 * PostgreSQL (pg): SQLSTATE `23505` (unique_violation).
 */
export function isUniqueViolation(e: unknown): boolean {
	const code = (e as { code?: unknown } | null)?.code;
	return code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505';
}
