import type { Kysely } from 'kysely';

/**
 * Expiry reminders already claimed or sent: one row per certificate, threshold (days before
 * expiry) and recipient address. The unique index is what makes a second run, or a second
 * process, skip a reminder that is already taken. `sent_at` stays null between the claim and
 * the hand-over to the mail server; a claim left that way past its lease is taken again.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('certificate_reminder')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('certificate_id', 'text', (c) => c.notNull().references('certificate.id').onDelete('cascade'))
		.addColumn('threshold_days', 'integer', (c) => c.notNull())
		.addColumn('recipient_email', 'text', (c) => c.notNull())
		.addColumn('recipient_id', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('recipient_role', 'text', (c) => c.notNull())
		.addColumn('claimed_at', 'text', (c) => c.notNull())
		.addColumn('sent_at', 'text')
		.addColumn('attempts', 'integer', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('certificate_reminder_once_index')
		.unique()
		.on('certificate_reminder')
		.columns(['certificate_id', 'threshold_days', 'recipient_email'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('certificate_reminder').execute();
}
