import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { getAttempt, reviewAttempt } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import type { RequestHandler } from './$types';

/** The graded attempt: score, pass or fail, and per item the answer, the right one and why. Only after submission. */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const attempt = await getAttempt(me.id, event.params.attempt);
	if (!attempt) return apiError(404, 'not_found', 'No such attempt.');
	if (attempt.status === 'open') return apiError(409, 'conflict', 'This attempt is not submitted yet.', undefined, { reason: 'open' });
	const review = await reviewAttempt(me.id, event.params.attempt);
	if (!review) return apiError(404, 'not_found', 'No such attempt.');
	return json(review);
};
