import { json } from '@sveltejs/kit';
import { apiError } from '$lib/server/api';
import { startAttempt, testStatus } from '$lib/server/attempts';
import { requireUser } from '$lib/server/authz';
import { refusal } from '../../../attempts/respond';
import type { RequestHandler } from './$types';

/** Where the signed-in person stands with this course's test: rules, attempts, what is possible now. */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const status = await testStatus(me.id, event.params.course);
	if (!status) return apiError(404, 'not_found', 'No such course.');
	return json(status);
};

/** Starts a test attempt (201), or resumes the open one (200). The items carry no answers. */
export const POST: RequestHandler = async (event) => {
	const me = requireUser(event);
	const out = await startAttempt(me.id, event.params.course);
	if (!out.ok) return refusal(out);
	return json({ resumed: out.resumed, attempt: out.attempt }, { status: out.resumed ? 200 : 201 });
};
