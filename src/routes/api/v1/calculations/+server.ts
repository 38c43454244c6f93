import { json } from '@sveltejs/kit';
import { answerListing, CALCULATION_API_LIMIT } from '$lib/calc/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from '$lib/server/rate-limit';

/** Every calculator: id, title, inputs (name, unit, default, allowed range) and results. */
export const GET: RequestHandler = async (event) => {
	const refused = await refuseIfLimited(event, CALCULATION_API_LIMIT);
	if (refused) return refused;
	const { status, body } = answerListing();
	return json(body, { status });
};
