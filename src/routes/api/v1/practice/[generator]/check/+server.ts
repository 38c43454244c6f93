import { json } from '@sveltejs/kit';
import { answerCheck, PRACTICE_API_LIMIT } from '$lib/practice/api';
import type { RequestHandler } from './$types';
import { readJsonText } from '$lib/server/api';
import { refuseIfLimited } from '$lib/server/rate-limit';

/** Checks {"seed": N, "answer": {...}}: right or not, the expected answer and the worked steps. Practice never counts. */
export const POST: RequestHandler = async (event) => {
	const refused = await refuseIfLimited(event, PRACTICE_API_LIMIT);
	if (refused) return refused;
	const read = await readJsonText(event.request);
	if (!read.ok) return read.response;
	const { status, body } = answerCheck(event.params.generator, read.text);
	return json(body, { status });
};
