import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { fieldErrors } from '$lib/server/form';
import { requireUser } from '$lib/server/authz';
import { setLessonDone } from '$lib/server/progress';
import type { RequestHandler } from './$types';

const bodySchema = z.object({ done: z.boolean() }).strict();

/**
 * PUT {"done": true|false} marks the lesson done or not done for the signed-in person and
 * answers with the course progress. 400 bad body, 401 signed out, 403 not enrolled,
 * 404 unknown course or lesson.
 */
export const PUT: RequestHandler = async (event) => {
	const user = requireUser(event);
	let raw: unknown;
	try {
		raw = await event.request.json();
	} catch {
		return json({ message: 'The request body must be JSON: {"done": true} or {"done": false}.' }, { status: 400 });
	}
	const parsed = bodySchema.safeParse(raw);
	if (!parsed.success) {
		return json({ message: 'The request body must be {"done": true} or {"done": false}.', errors: fieldErrors(parsed.error) }, { status: 400 });
	}
	const change = await setLessonDone(user.id, event.params.course, event.params.lesson, parsed.data.done);
	if (!change.ok) {
		return change.reason === 'unknown-lesson'
			? json({ message: 'No such lesson.' }, { status: 404 })
			: json({ message: 'You are not enrolled in this course.' }, { status: 403 });
	}
	return json(change.progress);
};
