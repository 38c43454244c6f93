import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { getAttempt } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import { resultUrl } from '../respond';
import type { RequestHandler } from './$types';

/** The runner's view of the person's own open attempt (no answers), or where its result is once closed. */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const attempt = await getAttempt(me.id, event.params.attempt);
	if (!attempt) return apiError(404, 'not_found', 'No such attempt.');
	if (attempt.status === 'submitted') return json({ ...attempt, resultUrl: resultUrl(attempt.summary.courseSlug, attempt.summary.id) });
	return json(attempt);
};
