import { error } from '@sveltejs/kit';
import { getCourse, getLesson } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { hasRole } from '$lib/roles';
import { lessonHtml } from '$lib/server/lesson-html';
import { getCourseProgress, readingState } from '$lib/server/progress';
import { markSeatInUse } from '$lib/server/seats';
import type { PageServerLoad } from './$types';

/**
 * A lesson with its course outline. Preview lessons are open to everyone; the rest need an
 * enrolment: a visitor is sent to sign in, a signed-in person without one gets a 403.
 * Trainers and registrars may read every lesson. The body is server-rendered HTML (the same
 * for every reader, rendered once) and reaches only those who pass these checks.
 */
export const load: PageServerLoad = async (event) => {
	const { params, locals } = event;
	const course = getCourse(params.course);
	const lesson = getLesson(params.course, params.lesson);
	if (!course || !lesson) error(404, 'No such lesson');

	const state = await readingState(locals.user?.id ?? null, lesson);
	if (state === 'sign-in') requireUser(event);
	// Trainers and registrars read every lesson (to assess and to manage courses) without progress.
	const staff = hasRole(locals.user, 'trainer') || hasRole(locals.user, 'registrar');
	if (state === 'not-enrolled' && !staff) error(403, `This lesson is for trainees enrolled in ${course.title}.`);

	const outline = course.lessons.map(({ slug, title, order, minutes, preview, href }) => ({ slug, title, order, minutes, preview, href }));
	const at = outline.findIndex((l) => l.slug === lesson.slug);
	const enrolled = state === 'enrolled';
	const [body, doneLessons] = await Promise.all([
		lessonHtml(lesson),
		enrolled ? getCourseProgress(locals.user!.id, course).then((p) => p.doneLessons) : ([] as string[])
	]);
	// A full page gets the body from the lessonBody hook; client-side navigation gets it here.
	if (!event.isDataRequest) locals.lessonBody = body.bytes;
	// A seat counts as used from the first lesson opened beyond the free previews.
	if (enrolled && !lesson.preview) await markSeatInUse(locals.user!.id, course.slug);
	return {
		course: { slug: course.slug, title: course.title, code: course.code },
		lesson: { slug: lesson.slug, title: lesson.title, order: lesson.order, minutes: lesson.minutes, preview: lesson.preview, objectives: lesson.objectives },
		outline,
		previous: outline[at - 1] ?? null,
		next: outline[at + 1] ?? null,
		enrolled,
		doneLessons,
		body: { math: body.math, html: event.isDataRequest ? body.html : null }
	};
};
