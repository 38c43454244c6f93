import { sql, type Kysely } from 'kysely';

/**
 * Practical sign-offs and their evidence.
 *
 * - practical_submission: one piece of evidence for one skill (photos, note, readings),
 *   sent by the trainee or recorded by a trainer at an in-person assessment. Its status moves
 *   waiting -> withdrawn | returned | signed off; rows are never deleted, so the history stays.
 * - evidence_file: a stored upload (photo or PDF) of a submission; the bytes live in the file
 *   store under `storage_key`, the row keeps the original name, type, size and SHA-256.
 * - practical_assessment: a trainer's grading of a submission: per-criterion results (JSON),
 *   outcome, reasons, where and when the practical took place, and the typed signature.
 * - sign_off: the current standing of a skill for a person. Never deleted; a registrar voids
 *   one with a reason. At most one unvoided sign-off per person, course and skill.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('practical_submission')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('trainee_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('skill_id', 'text', (c) => c.notNull())
		.addColumn('submitted_by', 'text', (c) => c.notNull().references('User.id'))
		.addColumn('in_person', 'integer', (c) => c.notNull().check(sql`in_person in (0, 1)`))
		.addColumn('note', 'text', (c) => c.notNull())
		.addColumn('readings', 'text', (c) => c.notNull())
		.addColumn('status', 'text', (c) =>
			c.notNull().check(sql`status in ('waiting', 'withdrawn', 'returned', 'signed off')`)
		)
		.addColumn('submitted_at', 'text', (c) => c.notNull())
		.addColumn('closed_at', 'text')
		.execute();
	await db.schema
		.createIndex('practical_submission_trainee_index')
		.on('practical_submission')
		.columns(['trainee_id', 'course_slug', 'skill_id'])
		.execute();
	await db.schema
		.createIndex('practical_submission_queue_index')
		.on('practical_submission')
		.columns(['status', 'submitted_at'])
		.execute();
	await db.schema
		.createIndex('practical_submission_one_waiting_index')
		.unique()
		.on('practical_submission')
		.columns(['trainee_id', 'course_slug', 'skill_id'])
		.where(sql.ref('status'), '=', 'waiting')
		.execute();

	await db.schema
		.createTable('evidence_file')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('submission_id', 'text', (c) =>
			c.notNull().references('practical_submission.id').onDelete('cascade')
		)
		.addColumn('position', 'integer', (c) => c.notNull())
		.addColumn('storage_key', 'text', (c) => c.notNull().unique())
		.addColumn('thumbnail_key', 'text')
		.addColumn('original_name', 'text', (c) => c.notNull())
		.addColumn('media_type', 'text', (c) => c.notNull())
		.addColumn('size_bytes', 'integer', (c) => c.notNull())
		.addColumn('sha256', 'text', (c) => c.notNull())
		.addColumn('width_px', 'integer')
		.addColumn('height_px', 'integer')
		.addColumn('uploaded_by', 'text', (c) => c.notNull().references('User.id'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('evidence_file_submission_index').on('evidence_file').columns(['submission_id', 'position']).execute();

	await db.schema
		.createTable('practical_assessment')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('submission_id', 'text', (c) => c.notNull().unique().references('practical_submission.id'))
		.addColumn('trainer_id', 'text', (c) => c.notNull().references('User.id'))
		.addColumn('outcome', 'text', (c) => c.notNull().check(sql`outcome in ('signed off', 'returned')`))
		.addColumn('criteria', 'text', (c) => c.notNull())
		.addColumn('reasons', 'text', (c) => c.notNull())
		.addColumn('place', 'text', (c) => c.notNull())
		.addColumn('practical_date', 'text', (c) => c.notNull())
		.addColumn('signature_name', 'text', (c) => c.notNull())
		.addColumn('assessed_at', 'text', (c) => c.notNull())
		.execute();

	await db.schema
		.createTable('sign_off')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('skill_id', 'text', (c) => c.notNull())
		.addColumn('assessment_id', 'text', (c) => c.notNull().unique().references('practical_assessment.id'))
		.addColumn('trainer_id', 'text', (c) => c.notNull().references('User.id'))
		.addColumn('signed_off_at', 'text', (c) => c.notNull())
		.addColumn('voided_at', 'text')
		.addColumn('voided_by', 'text', (c) => c.references('User.id'))
		.addColumn('void_reason', 'text')
		.execute();
	await db.schema.createIndex('sign_off_user_course_index').on('sign_off').columns(['user_id', 'course_slug']).execute();
	await db.schema
		.createIndex('sign_off_one_current_index')
		.unique()
		.on('sign_off')
		.columns(['user_id', 'course_slug', 'skill_id'])
		.where(sql.ref('voided_at'), 'is', null)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('sign_off').execute();
	await db.schema.dropTable('practical_assessment').execute();
	await db.schema.dropTable('evidence_file').execute();
	await db.schema.dropTable('practical_submission').execute();
}
