import { json } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { isEnrolled } from '$lib/server/enrolments';
import { getCourseProgress } from '$lib/server/progress';
import type { RequestHandler } from './$types';

/** Progress through one course: 401 signed out, 404 unknown course, 403 not enrolled. */
export const GET: RequestHandler = async (event) => {
	const user = requireUser(event);
	const course = getCourse(event.params.course);
	if (!course) return json({ message: 'No such course.' }, { status: 404 });
	if (!(await isEnrolled(user.id, course.slug))) return json({ message: 'You are not enrolled in this course.' }, { status: 403 });
	return json(await getCourseProgress(user.id, course));
};
