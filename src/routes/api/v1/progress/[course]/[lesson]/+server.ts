import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError, readJson } from '$lib/server/api';
import { requireUser } from '$lib/server/authz';
import { setLessonDone } from '$lib/server/progress';
import type { RequestHandler } from './$types';

const bodySchema = z.object({ done: z.boolean() }).strict();

/**
 * PUT {"done": true|false} marks the lesson done or not done for the signed-in person and
 * answers with the course progress. 400 bad body, 401 signed out, 403 not enrolled,
 * 404 unknown course or lesson, 413/415 as for every API body.
 */
export const PUT: RequestHandler = async (event) => {
	const user = requireUser(event);
	const read = await readJson(event.request, bodySchema, { maxBytes: 1024, hint: 'Send {"done": true} or {"done": false}.' });
	if (!read.ok) return read.response;
	const change = await setLessonDone(user.id, event.params.course, event.params.lesson, read.data.done);
	if (!change.ok) {
		return change.reason === 'unknown-lesson'
			? apiError(404, 'not_found', 'No such lesson.')
			: apiError(403, 'forbidden', 'You are not enrolled in this course.');
	}
	return json(change.progress);
};
