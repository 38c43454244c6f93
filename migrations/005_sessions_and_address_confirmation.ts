import type { Kysely } from 'kysely';

/**
 * Server-side sessions: the session cookie names a row here, so signing out, a password reset,
 * a role removal or a registrar's "sign out everywhere" can end it at once. And address
 * confirmation links for accounts created with a password, which stays unusable until the
 * address is confirmed.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('user_session')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('last_seen_at', 'text', (c) => c.notNull())
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('ended_at', 'text')
		.addColumn('ended_why', 'text')
		.execute();
	await db.schema.createIndex('user_session_user_index').on('user_session').column('user_id').execute();

	await db.schema
		.createTable('address_confirmation')
		.addColumn('token_hash', 'text', (c) => c.primaryKey())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('used_at', 'text')
		.execute();
	await db.schema.createIndex('address_confirmation_user_index').on('address_confirmation').column('user_id').execute();
	await db.schema.createIndex('password_reset_user_index').on('password_reset').column('user_id').execute();
	await db.schema.createIndex('VerificationToken_identifier_index').on('VerificationToken').column('identifier').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropIndex('VerificationToken_identifier_index').execute();
	await db.schema.dropIndex('password_reset_user_index').execute();
	await db.schema.dropTable('address_confirmation').execute();
	await db.schema.dropTable('user_session').execute();
}
