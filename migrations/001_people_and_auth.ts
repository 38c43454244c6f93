import { sql, type Kysely } from 'kysely';
import { appendOnly, idDefault, nowDefault, serialPrimaryKey } from '../src/lib/server/db/engine';

/**
 * People, Auth.js tables (names and columns as @auth/kysely-adapter expects),
 * platform roles, companies with memberships, password reset tokens and the
 * append-only audit log.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('User')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('name', 'text')
		.addColumn('email', 'text', (c) => c.notNull().unique())
		.addColumn('emailVerified', 'text')
		.addColumn('image', 'text')
		.addColumn('passwordHash', 'text')
		.addColumn('createdAt', 'text', (c) => c.notNull().defaultTo(nowDefault(db)))
		.execute();

	await db.schema
		.createTable('Account')
		.addColumn('id', 'text', (c) => c.primaryKey().defaultTo(idDefault(db)))
		.addColumn('userId', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('type', 'text', (c) => c.notNull())
		.addColumn('provider', 'text', (c) => c.notNull())
		.addColumn('providerAccountId', 'text', (c) => c.notNull())
		.addColumn('refresh_token', 'text')
		.addColumn('access_token', 'text')
		.addColumn('expires_at', 'integer')
		.addColumn('token_type', 'text')
		.addColumn('scope', 'text')
		.addColumn('id_token', 'text')
		.addColumn('session_state', 'text')
		.execute();
	await db.schema.createIndex('Account_userId_index').on('Account').column('userId').execute();

	await db.schema
		.createTable('Session')
		.addColumn('id', 'text', (c) => c.primaryKey().defaultTo(idDefault(db)))
		.addColumn('userId', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('sessionToken', 'text', (c) => c.notNull().unique())
		.addColumn('expires', 'text', (c) => c.notNull())
		.execute();

	await db.schema
		.createTable('VerificationToken')
		.addColumn('identifier', 'text', (c) => c.notNull())
		.addColumn('token', 'text', (c) => c.notNull().unique())
		.addColumn('expires', 'text', (c) => c.notNull())
		.execute();

	await db.schema
		.createTable('user_role')
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('trainer', 'inspector', 'registrar')`))
		.addColumn('granted_at', 'text', (c) => c.notNull())
		.addColumn('granted_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addPrimaryKeyConstraint('user_role_pk', ['user_id', 'role'])
		.execute();

	await db.schema
		.createTable('company')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('created_at', 'text', (c) => c.notNull())
		.execute();

	await db.schema
		.createTable('membership')
		.addColumn('company_id', 'text', (c) => c.notNull().references('company.id').onDelete('cascade'))
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('role', 'text', (c) => c.notNull().check(sql`role in ('admin', 'member')`))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('membership_pk', ['company_id', 'user_id'])
		.execute();
	await db.schema.createIndex('membership_user_index').on('membership').column('user_id').execute();

	await db.schema
		.createTable('password_reset')
		.addColumn('token_hash', 'text', (c) => c.primaryKey())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('used_at', 'text')
		.execute();

	await db.schema
		.createTable('audit_log')
		.addColumn('id', 'integer', serialPrimaryKey(db))
		.addColumn('at', 'text', (c) => c.notNull())
		.addColumn('actor_id', 'text')
		.addColumn('action', 'text', (c) => c.notNull())
		.addColumn('subject_type', 'text', (c) => c.notNull())
		.addColumn('subject_id', 'text', (c) => c.notNull())
		.addColumn('detail', 'text', (c) => c.notNull().defaultTo('{}'))
		.execute();
	await db.schema.createIndex('audit_log_subject_index').on('audit_log').columns(['subject_type', 'subject_id']).execute();

	// The audit log is append-only: the database itself refuses edits and deletions.
	await appendOnly(db, 'audit_log');
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of ['audit_log', 'password_reset', 'membership', 'company', 'user_role', 'VerificationToken', 'Session', 'Account', 'User']) {
		await db.schema.dropTable(table).execute();
	}
}
