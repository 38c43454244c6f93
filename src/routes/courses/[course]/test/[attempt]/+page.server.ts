import { error, redirect } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { getAttempt, reviewAttempt, testStatus } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import type { PageServerLoad } from './$types';

/** A graded attempt with every item reviewed. Only the person's own; an open one goes back to the runner. */
export const load: PageServerLoad = async (event) => {
	const course = getCourse(event.params.course);
	if (!course) error(404, 'No such course');
	const me = requireUser(event);
	const attempt = await getAttempt(me.id, event.params.attempt);
	if (!attempt || (attempt.status === 'open' ? attempt.course.slug : attempt.summary.courseSlug) !== course.slug) error(404, 'No such attempt');
	if (attempt.status === 'open') redirect(303, `/courses/${course.slug}/test`);
	const review = await reviewAttempt(me.id, event.params.attempt);
	if (!review) error(404, 'No such attempt');
	const status = await testStatus(me.id, course.slug);
	const lessons = Object.fromEntries(course.lessons.map((l) => [l.slug, { href: l.href, title: l.title }]));
	return { review, lessons, next: status && { attemptsLeft: status.attemptsLeft, blocked: status.blocked, nextStartAt: status.nextStartAt } };
};
