/**
 * What each role's dashboard shows: the person's real next step with what exists today.
 * One function per section, so a capability that lands adds its own (sign-offs, seats,
 * certificates) without touching the others.
 */
import { courses } from '$lib/content';
import type { CourseStanding } from '$lib/next-step';
import { listAttemptsForStaff, testStatus } from './attempts';
import { db as defaultDb, type DB } from './db';
import { listMembers } from './companies';
import { listEnrolledProgress } from './progress';

/** The trainee's courses with lesson progress and where they stand with the course test. */
export async function traineeStandings(userId: string, db: DB = defaultDb): Promise<CourseStanding[]> {
	const enrolled = await listEnrolledProgress(userId, db);
	return Promise.all(
		enrolled.map(async (c) => {
			const status = await testStatus(userId, c.slug, { db });
			const passedAttempt = status?.attempts.find((a) => a.passed);
			return {
				slug: c.slug,
				title: c.title,
				progress: { done: c.progress.done, total: c.progress.total, next: c.progress.next ? { href: c.progress.next.href, title: c.progress.next.title } : null },
				test: {
					passed: !!status?.passed,
					passedAt: passedAttempt?.submittedAt ?? null,
					open: !!status?.open,
					attemptsLeft: status?.attemptsLeft ?? 0,
					nextStartAt: status?.nextStartAt ?? null,
					blockedReason: status?.blocked?.reason ?? null
				}
			};
		})
	);
}

/** For a trainer or registrar (within their trainer scope): trainees waiting to retake, tests in progress, tests submitted in the last 7 days. */
export async function trainerDesk(viewerId: string, now = new Date(), db: DB = defaultDb) {
	const rows = await listAttemptsForStaff(viewerId, { db, now });
	const weekAgo = new Date(now.getTime() - 7 * 86_400_000).toISOString();
	return {
		waiting: rows.filter((r) => r.canWaiveWait).length,
		inProgress: rows.filter((r) => r.submittedAt === null).length,
		submittedThisWeek: rows.filter((r) => r.submittedAt !== null && r.submittedAt >= weekAgo).length
	};
}

/** A company's crew with each member's courses: lessons read and whether the test is passed. */
export async function crewProgress(companyId: string, db: DB = defaultDb) {
	const members = await listMembers(companyId, db);
	const ids = members.map((m) => m.id);
	const [enrolments, progress, passes] = ids.length
		? await Promise.all([
				db.selectFrom('enrolment').select(['user_id', 'course_slug']).where('user_id', 'in', ids).execute(),
				db.selectFrom('lesson_progress').select(['user_id', 'course_slug']).where('user_id', 'in', ids).execute(),
				db.selectFrom('test_attempt').select(['user_id', 'course_slug']).where('user_id', 'in', ids).where('passed', '=', 1).execute()
			])
		: [[], [], []];
	return members.map((m) => ({
		...m,
		courses: courses
			.filter((c) => enrolments.some((e) => e.user_id === m.id && e.course_slug === c.slug))
			.map((c) => ({
				slug: c.slug,
				code: c.code,
				title: c.title,
				lessonsDone: Math.min(c.lessons.length, progress.filter((p) => p.user_id === m.id && p.course_slug === c.slug).length),
				lessonsTotal: c.lessons.length,
				testPassed: passes.some((p) => p.user_id === m.id && p.course_slug === c.slug)
			}))
	}));
}

/** For the registrar: everyone with an account, and how many are in no course. */
export async function registrarCounts(db: DB = defaultDb) {
	const [people, enrolled] = await Promise.all([
		db.selectFrom('User').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow(),
		db.selectFrom('enrolment').select((eb) => eb.fn.count<number>('user_id').distinct().as('n')).executeTakeFirstOrThrow()
	]);
	return { people: Number(people.n), notEnrolled: Number(people.n) - Number(enrolled.n) };
}
