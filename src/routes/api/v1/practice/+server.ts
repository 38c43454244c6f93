import { json } from '@sveltejs/kit';
import { answerListing } from '$lib/practice/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from './limit';

/** Every practice problem generator; no sign-in, limited per client address. */
export const GET: RequestHandler = (event) => {
	const refused = refuseIfLimited(event);
	if (refused) return refused;
	const { status, body } = answerListing();
	return json(body, { status });
};
