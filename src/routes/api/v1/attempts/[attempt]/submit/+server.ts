import { json } from '@sveltejs/kit';
import { submitAttempt } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import { refusal, resultUrl } from '../../respond';
import type { RequestHandler } from './$types';

/** Submits and grades the attempt. A second submit, or one after the time limit, is 409 and changes nothing. */
export const POST: RequestHandler = async (event) => {
	const me = requireUser(event);
	const out = await submitAttempt(me.id, event.params.attempt);
	if (!out.ok) return refusal(out);
	return json({ summary: out.summary, resultUrl: resultUrl(out.summary.courseSlug, out.summary.id) });
};
