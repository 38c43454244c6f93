import { error, json } from '@sveltejs/kit';
import { saveAnswer } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import { readJson, refusal } from '../../../respond';
import type { RequestHandler } from './$types';

/** Autosaves the answer to one item: {"choice": 1}, {"choices": [0, 2]}, {"value": true}, {"order": [2, 0, 1]} or {"value": "1.17", "unit": "kg"}. */
export const PUT: RequestHandler = async (event) => {
	const me = requireUser(event);
	if (!/^\d{1,4}$/.test(event.params.position)) error(404, 'No item at that position.');
	const read = await readJson(event.request);
	if (!read.ok) return read.response;
	const out = await saveAnswer(me.id, event.params.attempt, Number(event.params.position), read.body);
	if (!out.ok) return refusal(out);
	return json({ savedAt: out.savedAt });
};
