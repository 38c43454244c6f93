import { json } from '@sveltejs/kit';
import { answerCalculation } from '$lib/calc/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from '../limit';

/** Runs one calculator on {"inputs": {...}}; no sign-in, limited per client address. */
export const POST: RequestHandler = async (event) => {
	const refused = refuseIfLimited(event);
	if (refused) return refused;
	const { status, body } = answerCalculation(event.params.id, await event.request.text());
	return json(body, { status });
};
