import type { Kysely } from 'kysely';

/**
 * Certificates, their issued PDF files (hash of each), and inspectors' crew checks.
 * `slot` is `<user id>|<course slug>` on the one certificate that holds a person's place for a
 * course (issued, expired or revoked) and null on replaced ones; its unique index is what
 * keeps two racing issuances to one certificate on any engine.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('certificate')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('number', 'text', (c) => c.notNull().unique())
		.addColumn('slot', 'text', (c) => c.unique())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('holder_name', 'text', (c) => c.notNull())
		.addColumn('course_code', 'text', (c) => c.notNull())
		.addColumn('course_title', 'text', (c) => c.notNull())
		.addColumn('scope', 'text', (c) => c.notNull())
		.addColumn('diameter_min_mm', 'integer', (c) => c.notNull())
		.addColumn('diameter_max_mm', 'integer', (c) => c.notNull())
		.addColumn('practical_on', 'text', (c) => c.notNull())
		.addColumn('test_on', 'text', (c) => c.notNull())
		.addColumn('issued_at', 'text', (c) => c.notNull())
		.addColumn('issued_on', 'text', (c) => c.notNull())
		.addColumn('expires_on', 'text', (c) => c.notNull())
		.addColumn('trainers', 'text', (c) => c.notNull())
		.addColumn('issuer_name', 'text', (c) => c.notNull())
		.addColumn('credential_jwt', 'text', (c) => c.notNull())
		.addColumn('revoked_at', 'text')
		.addColumn('revoked_by', 'text')
		.addColumn('revocation_reason', 'text')
		.addColumn('replaces_id', 'text')
		.addColumn('replaced_by_id', 'text')
		.execute();
	await db.schema.createIndex('certificate_user_idx').on('certificate').columns(['user_id', 'course_slug']).execute();

	await db.schema
		.createTable('certificate_file')
		.addColumn('certificate_id', 'text', (c) => c.notNull().references('certificate.id').onDelete('cascade'))
		.addColumn('format', 'text', (c) => c.notNull())
		.addColumn('sha256', 'text', (c) => c.notNull())
		.addColumn('size_bytes', 'integer', (c) => c.notNull())
		.addColumn('storage_key', 'text', (c) => c.notNull())
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('certificate_file_pk', ['certificate_id', 'format'])
		.execute();
	await db.schema.createIndex('certificate_file_sha_idx').on('certificate_file').column('sha256').execute();

	await db.schema
		.createTable('crew_check')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('inspector_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('checked_at', 'text', (c) => c.notNull())
		.addColumn('label', 'text', (c) => c.notNull())
		.addColumn('results', 'text', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('crew_check_inspector_idx').on('crew_check').columns(['inspector_id', 'checked_at']).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('crew_check').execute();
	await db.schema.dropTable('certificate_file').execute();
	await db.schema.dropTable('certificate').execute();
}
