import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError, readJson } from '$lib/server/api';
import { saveAnswer } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import { refusal } from '../../../respond';
import type { RequestHandler } from './$types';

/** The answer's form depends on the item; `saveAnswer` validates it against the item. */
const anyAnswer = z.unknown();

/** Autosaves the answer to one item: {"choice": 1}, {"choices": [0, 2]}, {"value": true}, {"order": [2, 0, 1]} or {"value": "1.17", "unit": "kg"}. */
export const PUT: RequestHandler = async (event) => {
	const me = requireUser(event);
	if (!/^\d{1,4}$/.test(event.params.position)) return apiError(404, 'not_found', 'No item at that position.', undefined, { reason: 'no-such-item' });
	const read = await readJson(event.request, anyAnswer, { maxBytes: 4096 });
	if (!read.ok) return read.response;
	const out = await saveAnswer(me.id, event.params.attempt, Number(event.params.position), read.data);
	if (!out.ok) return refusal(out);
	return json({ savedAt: out.savedAt });
};
