import { recordAudit } from './audit';
import { issueIfEarned } from './certificates';
import { db as defaultDb, inTransaction, type DB } from './db';

/** The enrolment row of a person in a course, if any (shared by `isEnrolled` and the lesson view's prepared read). */
export const enrolmentRow = (db: DB, userId: string, courseSlug: string) =>
	db.selectFrom('enrolment').select('user_id').where('user_id', '=', userId).where('course_slug', '=', courseSlug);

export async function isEnrolled(userId: string, courseSlug: string, db: DB = defaultDb): Promise<boolean> {
	return !!(await enrolmentRow(db, userId, courseSlug).executeTakeFirst());
}

export async function listEnrolments(userId: string, db: DB = defaultDb) {
	return db
		.selectFrom('enrolment')
		.select(['course_slug', 'enrolled_at', 'source'])
		.where('user_id', '=', userId)
		.orderBy('enrolled_at')
		.execute();
}

/** Enrols a person in a course; does nothing when already enrolled. */
export async function enrol(actorId: string | null, userId: string, courseSlug: string, source: string, db: DB = defaultDb) {
	await inTransaction(db, async (trx) => {
		const result = await trx
			.insertInto('enrolment')
			.values({ user_id: userId, course_slug: courseSlug, enrolled_at: new Date().toISOString(), source })
			.onConflict((oc) => oc.doNothing())
			.executeTakeFirst();
		if (Number(result.numInsertedOrUpdatedRows ?? 0) > 0) {
			await recordAudit({ actorId, action: 'enrolment.create', subjectType: 'user', subjectId: userId, detail: { courseSlug, source } }, trx);
			// a late enrolment can be the last requirement met
			await issueIfEarned(userId, courseSlug, { db: trx, actorId });
		}
	});
}

/** Enrolled course slugs for many people at once, keyed by user id. */
export async function enrolmentsByUser(userIds: string[], db: DB = defaultDb): Promise<Map<string, string[]>> {
	const byUser = new Map<string, string[]>(userIds.map((id) => [id, []]));
	if (userIds.length === 0) return byUser;
	const rows = await db
		.selectFrom('enrolment')
		.select(['user_id', 'course_slug'])
		.where('user_id', 'in', userIds)
		.orderBy('enrolled_at')
		.execute();
	for (const row of rows) byUser.get(row.user_id)?.push(row.course_slug);
	return byUser;
}
