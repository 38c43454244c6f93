import { json } from '@sveltejs/kit';
import { answerCheck } from '$lib/practice/api';
import type { RequestHandler } from './$types';
import { refuseIfLimited } from '../../limit';

/** Checks {"seed": N, "answer": {...}}: right or not, the expected answer and the worked steps. Practice never counts. */
export const POST: RequestHandler = async (event) => {
	const refused = refuseIfLimited(event);
	if (refused) return refused;
	const { status, body } = answerCheck(event.params.generator, await event.request.text());
	return json(body, { status });
};
