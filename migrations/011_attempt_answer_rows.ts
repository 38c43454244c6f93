import { sql, type Kysely } from 'kysely';

/**
 * Answers and per-item results of test attempts in their own rows, one per attempt and item
 * position, so that two saves to different items never overwrite each other and a save is one
 * guarded upsert. Existing attempts move forward without loss: the JSON columns
 * `test_attempt.answers` and `test_attempt.results` are copied into rows (their time of saving
 * was not kept, so the rows take the time the attempt closed, or started while open). The old
 * columns stay, unused, for the down migration.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('test_answer')
		.addColumn('attempt_id', 'text', (c) => c.notNull().references('test_attempt.id').onDelete('cascade'))
		.addColumn('position', 'integer', (c) => c.notNull())
		.addColumn('answer', 'text', (c) => c.notNull())
		.addColumn('saved_at', 'text', (c) => c.notNull())
		.addPrimaryKeyConstraint('test_answer_pk', ['attempt_id', 'position'])
		.execute();
	await db.schema
		.createTable('test_item_result')
		.addColumn('attempt_id', 'text', (c) => c.notNull().references('test_attempt.id').onDelete('cascade'))
		.addColumn('position', 'integer', (c) => c.notNull())
		.addColumn('correct', 'integer', (c) => c.notNull().check(sql`correct in (0, 1)`))
		.addColumn('answered', 'integer', (c) => c.notNull().check(sql`answered in (0, 1)`))
		.addColumn('hint', 'text')
		.addPrimaryKeyConstraint('test_item_result_pk', ['attempt_id', 'position'])
		.execute();

	const attempts = await db.selectFrom('test_attempt').select(['id', 'started_at', 'submitted_at', 'answers', 'results']).execute();
	for (const a of attempts) {
		const savedAt = a.submitted_at ?? a.started_at;
		const answers = parse(a.answers) as Record<string, unknown> | null;
		const answerRows = Object.entries(answers ?? {})
			.filter(([position]) => /^\d+$/.test(position))
			.map(([position, answer]) => ({ attempt_id: a.id, position: Number(position), answer: JSON.stringify(answer), saved_at: savedAt }));
		if (answerRows.length > 0) await db.insertInto('test_answer').values(answerRows).execute();
		const results = parse(a.results) as { correct?: boolean; answered?: boolean; hint?: string }[] | null;
		const resultRows = (Array.isArray(results) ? results : []).map((r, position) => ({
			attempt_id: a.id,
			position,
			correct: r?.correct ? 1 : 0,
			answered: r?.answered ? 1 : 0,
			hint: typeof r?.hint === 'string' ? r.hint : null
		}));
		if (resultRows.length > 0) await db.insertInto('test_item_result').values(resultRows).execute();
	}
}

function parse(text: unknown): unknown {
	if (typeof text !== 'string') return null;
	try {
		return JSON.parse(text);
	} catch {
		return null;
	}
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('test_item_result').execute();
	await db.schema.dropTable('test_answer').execute();
}
