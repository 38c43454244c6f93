import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { lessonHtml } from '$lib/server/lesson-html';
import { lessonView } from '$lib/server/lesson-view';
import { rememberLessonPage } from '$lib/server/lesson-page-store';
import { markSeatInUse } from '$lib/server/seats';
import type { PageServerLoad } from './$types';

/**
 * A lesson with its course outline, for those `lessonView` lets read it. The body is
 * server-rendered HTML (the same for every reader, rendered once) and reaches only them.
 */
export const load: PageServerLoad = async (event) => {
	const { params, locals } = event;
	const view = await lessonView(locals.user, params.course, params.lesson);
	if (view.kind === 'not-found') error(404, 'No such lesson');
	if (view.kind === 'not-enrolled') error(403, `This lesson is for trainees enrolled in ${view.courseTitle}.`);
	if (view.kind === 'sign-in') {
		requireUser(event); // sends the visitor to sign in
		error(401, 'Sign in first.');
	}

	const body = await lessonHtml(view.lesson);
	if (view.markSeat) await markSeatInUse(locals.user!.id, params.course);
	// A full page gets the body from the lessonBody hook; client-side navigation gets it here.
	if (!event.isDataRequest) {
		locals.lessonBody = body.bytes;
		rememberLessonPage(event, view.data);
	}
	return { ...view.data, body: { math: body.math, html: event.isDataRequest ? body.html : null } };
};
