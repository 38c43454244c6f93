import { courses } from '$lib/content';
import { hasRole, type Identity } from '$lib/roles';
import { listCertificatesOf } from './certificates';
import { db as defaultDb, type DB } from './db';
import { signOffsOfPerson } from './sign-offs';
import { trainerMaySee } from './trainer-scope';

/**
 * One crew member's record for their company admin (or a trainer whose scope covers them):
 * lessons, course test attempts (scores only: never the questions or answers), sign-offs and
 * certificates. Nobody else sees it; a person outside the viewer's reach is "not found".
 */

/** Whether the viewer may open the record at all: company admins, trainers and registrars. */
export function mayOpenCrewRecords(viewer: Identity): boolean {
	return viewer.companies.some((c) => c.role === 'admin') || hasRole(viewer, 'trainer') || hasRole(viewer, 'registrar');
}

/** An admin of a company the person belongs to, or a trainer (or registrar) whose scope covers them. */
export async function mayViewCrewRecord(viewer: Identity, personId: string, db: DB = defaultDb): Promise<{ ok: boolean; asAdmin: boolean }> {
	const adminOf = viewer.companies.filter((c) => c.role === 'admin').map((c) => c.id);
	if (adminOf.length) {
		const shared = await db.selectFrom('membership').select('user_id').where('user_id', '=', personId).where('company_id', 'in', adminOf).executeTakeFirst();
		if (shared) return { ok: true, asAdmin: true };
	}
	if ((hasRole(viewer, 'trainer') || hasRole(viewer, 'registrar')) && (await trainerMaySee(viewer.id, personId, db))) return { ok: true, asAdmin: false };
	return { ok: false, asAdmin: false };
}

export async function crewRecord(personId: string, { db = defaultDb, now = new Date() }: { db?: DB; now?: Date } = {}) {
	const person = await db.selectFrom('User').select(['id', 'name', 'email']).where('id', '=', personId).executeTakeFirst();
	if (!person) return null;
	const [enrolments, lessons, attempts, signOffs, certificates, companies] = await Promise.all([
		db.selectFrom('enrolment').select(['course_slug', 'enrolled_at']).where('user_id', '=', personId).execute(),
		db.selectFrom('lesson_progress').select(['course_slug', 'lesson_slug', 'completed_at']).where('user_id', '=', personId).execute(),
		db
			.selectFrom('test_attempt')
			.select(['id', 'course_slug', 'started_at', 'submitted_at', 'closed_by', 'item_count', 'correct_count', 'score_percent', 'pass_mark', 'passed'])
			.where('user_id', '=', personId)
			.orderBy('started_at', 'desc')
			.execute(),
		signOffsOfPerson(personId, db),
		listCertificatesOf(personId, { db, now }),
		db.selectFrom('membership').innerJoin('company', 'company.id', 'membership.company_id').select(['company.name', 'membership.role']).where('membership.user_id', '=', personId).orderBy('company.name').execute()
	]);
	const enrolledAt = new Map(enrolments.map((e) => [e.course_slug, e.enrolled_at]));
	const done = new Map(lessons.map((l) => [`${l.course_slug}|${l.lesson_slug}`, l.completed_at]));
	const touched = new Set([...enrolledAt.keys(), ...attempts.map((a) => a.course_slug), ...signOffs.map((s) => s.courseSlug), ...certificates.map((c) => c.course.code)]);
	return {
		person: { id: person.id, name: person.name?.trim() || person.email, email: person.email },
		companies: companies.map((c) => ({ name: c.name, role: c.role })),
		courses: courses
			.filter((c) => touched.has(c.slug) || touched.has(c.code))
			.map((c) => ({
				slug: c.slug,
				code: c.code,
				title: c.title,
				enrolledAt: enrolledAt.get(c.slug) ?? null,
				lessons: c.lessons.map((l) => ({ slug: l.slug, title: l.title, href: l.href, doneAt: done.get(`${c.slug}|${l.slug}`) ?? null })),
				attempts: attempts
					.filter((a) => a.course_slug === c.slug)
					.map((a) => ({
						id: a.id,
						startedAt: a.started_at,
						submittedAt: a.submitted_at,
						closedBy: a.closed_by,
						itemCount: a.item_count,
						correctCount: a.correct_count,
						scorePercent: a.score_percent,
						passMark: a.pass_mark,
						passed: a.passed === null ? null : a.passed === 1
					})),
				signOffs: signOffs
					.filter((s) => s.courseSlug === c.slug)
					.map((s) => ({
						id: s.id,
						skill: c.practicalSkills.find((k) => k.id === s.skillId)?.title ?? s.skillId,
						signedOffAt: s.signedOffAt,
						trainerName: s.trainerName,
						voidedAt: s.voidedAt
					})),
				skillsTotal: c.practicalSkills.length,
				certificates: certificates.filter((k) => k.course.code === c.code)
			}))
	};
}
