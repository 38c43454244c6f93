import type { Kysely } from 'kysely';

/**
 * Rate-limit counts in the main database, used when it is PostgreSQL (several app processes
 * then share one count per key). On SQLite the counts stay in their own file under DATA_DIR.
 * `expire_ms` is the end of the key's window in epoch milliseconds, wider than 32 bits.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('rate_limit_count')
		.addColumn('key', 'text', (c) => c.primaryKey())
		.addColumn('points', 'integer', (c) => c.notNull())
		.addColumn('expire_ms', 'bigint', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('rate_limit_count_expire_index').on('rate_limit_count').column('expire_ms').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('rate_limit_count').execute();
}
