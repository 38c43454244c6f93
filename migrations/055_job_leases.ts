import type { Kysely } from 'kysely';

/**
 * Leases for scheduled jobs, so that with several app processes on one database each job runs
 * in one process per period. One row per job: who holds it and until when (UTC ISO text, set by
 * the app). Taken with a guarded update or a first insert; nothing engine-specific.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('job_lease')
		.addColumn('job_name', 'text', (c) => c.primaryKey())
		.addColumn('holder', 'text', (c) => c.notNull())
		.addColumn('lease_until', 'text', (c) => c.notNull())
		.addColumn('taken_at', 'text', (c) => c.notNull())
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('job_lease').execute();
}
