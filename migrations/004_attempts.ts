import { sql, type Kysely } from 'kysely';
import { floatType, wideIntegerType } from '../src/lib/server/db/engine';

/**
 * Course test attempts. The draw (items with their seeds and question snapshots) and the
 * autosaved answers are JSON text; grading fills the score and the per-item results.
 * At most one open (unsubmitted) attempt per person and course, enforced here.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('test_attempt')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('started_at', 'text', (c) => c.notNull())
		.addColumn('deadline_at', 'text')
		.addColumn('submitted_at', 'text')
		.addColumn('closed_by', 'text', (c) => c.check(sql`closed_by in ('person', 'time limit')`))
		.addColumn('draw_seed', wideIntegerType(db), (c) => c.notNull())
		.addColumn('items', 'text', (c) => c.notNull())
		.addColumn('answers', 'text', (c) => c.notNull().defaultTo('{}'))
		.addColumn('item_count', 'integer', (c) => c.notNull())
		.addColumn('pass_mark', floatType(db), (c) => c.notNull())
		.addColumn('correct_count', 'integer')
		.addColumn('score_percent', floatType(db))
		.addColumn('passed', 'integer', (c) => c.check(sql`passed in (0, 1)`))
		.addColumn('results', 'text')
		.addColumn('wait_waived_at', 'text')
		.addColumn('wait_waived_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.execute();
	await db.schema.createIndex('test_attempt_user_course_index').on('test_attempt').columns(['user_id', 'course_slug']).execute();
	await db.schema.createIndex('test_attempt_course_index').on('test_attempt').columns(['course_slug', 'submitted_at']).execute();
	await db.schema
		.createIndex('test_attempt_one_open_index')
		.unique()
		.on('test_attempt')
		.columns(['user_id', 'course_slug'])
		.where(sql.ref('submitted_at'), 'is', null)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('test_attempt').execute();
}
