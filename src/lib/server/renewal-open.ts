import type { DB } from './db';

/**
 * The person's renewal in progress for a course, if any. A leaf module: the test runner,
 * certificates and renewals all read it, so it imports nothing of theirs.
 */
export function openRenewalOf(userId: string, courseSlug: string, db: DB) {
	return db
		.selectFrom('renewal')
		.selectAll()
		.where('user_id', '=', userId)
		.where('course_slug', '=', courseSlug)
		.where('completed_at', 'is', null)
		.executeTakeFirst();
}

/** Attempts and sign-offs that count: those since the open renewal started (all of them when none is open). */
export async function countsSince(userId: string, courseSlug: string, db: DB): Promise<string | null> {
	return (await openRenewalOf(userId, courseSlug, db))?.started_at ?? null;
}
