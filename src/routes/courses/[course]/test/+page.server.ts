import { error } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { testStatus } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import type { PageServerLoad } from './$types';

/** The course test: its rules and the person's attempts. The runner itself fetches from /api/v1. */
export const load: PageServerLoad = async (event) => {
	const course = getCourse(event.params.course);
	if (!course) error(404, 'No such course');
	const me = requireUser(event);
	const status = await testStatus(me.id, course.slug);
	if (!status) error(404, 'No such course');
	return { status };
};
