import { error } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { reviewAttemptForStaff } from '$lib/server/attempts';
import { requireRole } from '$lib/server/authz';
import type { PageServerLoad } from './$types';

/** One trainee's attempt with every answer, for trainers and registrars. Nothing is shown before submission. */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer', 'registrar');
	const found = await reviewAttemptForStaff(me.id, event.params.attempt);
	if (!found) error(404, 'No such attempt');
	const course = getCourse(found.summary.courseSlug);
	const lessons = Object.fromEntries((course?.lessons ?? []).map((l) => [l.slug, { href: l.href, title: l.title }]));
	return { ...found, courseTitle: course?.title ?? found.summary.courseSlug, lessons };
};
