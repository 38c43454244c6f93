import { json } from '@sveltejs/kit';
import { answerCalculation, CALCULATION_API_LIMIT } from '$lib/calc/api';
import type { RequestHandler } from './$types';
import { readJsonText } from '$lib/server/api';
import { refuseIfLimited } from '$lib/server/rate-limit';

/** Runs one calculator on {"inputs": {...}}; no sign-in, limited per client address. */
export const POST: RequestHandler = async (event) => {
	const refused = await refuseIfLimited(event, CALCULATION_API_LIMIT);
	if (refused) return refused;
	const read = await readJsonText(event.request);
	if (!read.ok) return read.response;
	const { status, body } = answerCalculation(event.params.id, read.text);
	return json(body, { status });
};
