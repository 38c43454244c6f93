import { json } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { apiError } from '$lib/server/api';
import { requireUser } from '$lib/server/authz';
import { isEnrolled } from '$lib/server/enrolments';
import { getCourseProgress } from '$lib/server/progress';
import type { RequestHandler } from './$types';

/** Progress through one course: 401 signed out, 404 unknown course, 403 not enrolled. */
export const GET: RequestHandler = async (event) => {
	const user = requireUser(event);
	const course = getCourse(event.params.course);
	if (!course) return apiError(404, 'not_found', 'No such course.');
	if (!(await isEnrolled(user.id, course.slug))) return apiError(403, 'forbidden', 'You are not enrolled in this course.');
	return json(await getCourseProgress(user.id, course));
};
