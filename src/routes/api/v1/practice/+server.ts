import { json } from '@sveltejs/kit';
import { answerListing, PRACTICE_API_LIMIT } from '$lib/practice/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from '$lib/server/rate-limit';

/** Every practice problem generator; no sign-in, limited per client address. */
export const GET: RequestHandler = async (event) => {
	const refused = await refuseIfLimited(event, PRACTICE_API_LIMIT);
	if (refused) return refused;
	const { status, body } = answerListing();
	return json(body, { status });
};
