import { json } from '@sveltejs/kit';
import { answerListing } from '$lib/calc/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from './limit';

/** Every calculator: id, title, inputs (name, unit, default, allowed range) and results. */
export const GET: RequestHandler = (event) => {
	const refused = refuseIfLimited(event);
	if (refused) return refused;
	const { status, body } = answerListing();
	return json(body, { status });
};
