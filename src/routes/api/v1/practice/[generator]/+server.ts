import { json } from '@sveltejs/kit';
import { answerProblem, PRACTICE_API_LIMIT } from '$lib/practice/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from '$lib/server/rate-limit';

/** One problem for ?seed=N (the same seed, the same problem), without its answer. */
export const GET: RequestHandler = async (event) => {
	const refused = await refuseIfLimited(event, PRACTICE_API_LIMIT);
	if (refused) return refused;
	const { status, body } = answerProblem(event.params.generator, event.url.searchParams.get('seed'));
	return json(body, { status });
};
