import type { Kysely } from 'kysely';

/**
 * Lessons a person has marked as done, one row per person and lesson. Lessons live in
 * `content/`, so course and lesson are slugs, not foreign keys.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('lesson_progress')
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('lesson_slug', 'text', (c) => c.notNull())
		.addColumn('completed_at', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('lesson_progress_pk', ['user_id', 'course_slug', 'lesson_slug'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('lesson_progress').execute();
}
