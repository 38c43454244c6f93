import type { Kysely } from 'kysely';

/** Who may read a course's lessons and take its test. Seats and payment grant these later. */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('enrolment')
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('enrolled_at', 'text', (c) => c.notNull())
		.addColumn('source', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('enrolment_pk', ['user_id', 'course_slug'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('enrolment').execute();
}
