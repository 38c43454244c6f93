import { error, json } from '@sveltejs/kit';
import { getAttempt, reviewAttempt } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import type { RequestHandler } from './$types';

/** The graded attempt: score, pass or fail, and per item the answer, the right one and why. Only after submission. */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const attempt = await getAttempt(me.id, event.params.attempt);
	if (!attempt) error(404, 'No such attempt.');
	if (attempt.status === 'open') return json({ error: 'This attempt is not submitted yet.', reason: 'open' }, { status: 409 });
	const review = await reviewAttempt(me.id, event.params.attempt);
	if (!review) error(404, 'No such attempt.');
	return json(review);
};
