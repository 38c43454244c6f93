import { buildBoard, type BoardCourse, type BoardFacts, type BoardRow } from '../compliance/board';
import { db as defaultDb, type DB } from './db';

/**
 * The compliance board's reads: six queries for a whole company, whatever its size (never one
 * per person or cell). Each restricts to the company's members through a subquery, so no list
 * of ids is bound as parameters. Counts come back as numbers or strings depending on the
 * engine and are read with Number(). Relative imports only: `npm run bench` loads this file
 * outside Vite, with the course catalogue passed in.
 */

/** Lesson slugs (or skill ids) still in each course: rows for anything since removed are not counted. */
function inCatalogue(catalogue: readonly BoardCourse[], column: 'lesson_slug' | 'skill_id', pick: (c: BoardCourse) => string[]) {
	return (eb: any) =>
		eb.or(
			catalogue
				.filter((c) => pick(c).length > 0)
				.map((c) => eb.and([eb('course_slug', '=', c.slug), eb(column, 'in', pick(c))]))
		);
}

export async function readBoardFacts(companyId: string, catalogue: readonly BoardCourse[], db: DB = defaultDb): Promise<BoardFacts> {
	const members = db.selectFrom('membership').select('membership.user_id').where('membership.company_id', '=', companyId);
	const [people, enrolments, lessons, tests, signOffs, certificates] = await Promise.all([
		db
			.selectFrom('membership')
			.innerJoin('User', 'User.id', 'membership.user_id')
			.select(['User.id', 'User.name', 'User.email', 'membership.role'])
			.where('membership.company_id', '=', companyId)
			.execute(),
		db.selectFrom('enrolment').select(['user_id', 'course_slug']).where('user_id', 'in', members).execute(),
		db
			.selectFrom('lesson_progress')
			.select((eb) => ['user_id', 'course_slug', eb.fn.countAll().as('n')])
			.where('user_id', 'in', members)
			.where(inCatalogue(catalogue, 'lesson_slug', (c) => c.lessons))
			.groupBy(['user_id', 'course_slug'])
			.execute(),
		db
			.selectFrom('test_attempt')
			.select((eb) => ['user_id', 'course_slug', eb.fn.max('submitted_at').as('passed_at')])
			.where('user_id', 'in', members)
			.where('passed', '=', 1)
			.groupBy(['user_id', 'course_slug'])
			.execute(),
		db
			.selectFrom('sign_off')
			.select((eb) => ['user_id', 'course_slug', eb.fn.countAll().as('n')])
			.where('user_id', 'in', members)
			.where('voided_at', 'is', null)
			.where(inCatalogue(catalogue, 'skill_id', (c) => c.skills))
			.groupBy(['user_id', 'course_slug'])
			.execute(),
		db
			.selectFrom('certificate')
			.select(['id', 'number', 'user_id', 'course_slug', 'issued_at', 'expires_on', 'revoked_at'])
			.where('user_id', 'in', members)
			.where('replaced_by_id', 'is', null)
			.execute()
	]);
	return {
		people: people.map((p) => ({ id: p.id, name: p.name, email: p.email, role: p.role })),
		enrolments: enrolments.map((e) => ({ userId: e.user_id, courseSlug: e.course_slug })),
		lessonsDone: lessons.map((l) => ({ userId: l.user_id, courseSlug: l.course_slug, done: Number(l.n) })),
		testsPassed: tests.map((t) => ({ userId: t.user_id, courseSlug: t.course_slug, passedAt: String(t.passed_at) })),
		signOffs: signOffs.map((s) => ({ userId: s.user_id, courseSlug: s.course_slug, signedOff: Number(s.n) })),
		certificates: certificates.map((c) => ({
			id: c.id,
			number: c.number,
			userId: c.user_id,
			courseSlug: c.course_slug,
			issuedAt: c.issued_at,
			expiresOn: c.expires_on,
			revokedAt: c.revoked_at
		}))
	};
}

/** Every member of the company with a cell per course of `catalogue`, as of `now` (UTC day). */
export async function companyBoard(companyId: string, catalogue: readonly BoardCourse[], { db = defaultDb, now = new Date() }: { db?: DB; now?: Date } = {}): Promise<BoardRow[]> {
	return buildBoard(await readBoardFacts(companyId, catalogue, db), catalogue, now.toISOString().slice(0, 10));
}
