import { error } from '@sveltejs/kit';
import { courses, getCourse } from '$lib/content';
import { requireRole } from '$lib/server/authz';
import { itemStatistics, MIN_ATTEMPTS } from '$lib/server/item-stats';
import type { PageServerLoad } from './$types';

/** Per question of one course's test: times drawn, share right, discrimination. */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer', 'registrar');
	const slug = event.url.searchParams.get('course') ?? courses[0].slug;
	const course = getCourse(slug);
	if (!course) error(404, 'No such course');
	const stats = await itemStatistics(me.id, slug);
	if (!stats) error(404, 'No such course');
	const lessons = Object.fromEntries(course.lessons.map((l) => [l.slug, l.title]));
	return {
		course: { slug, title: course.title },
		courses: courses.map((c) => ({ slug: c.slug, code: c.code })),
		lessons,
		minAttempts: MIN_ATTEMPTS,
		...stats
	};
};
