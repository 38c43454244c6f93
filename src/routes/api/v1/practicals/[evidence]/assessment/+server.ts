import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { apiFailure, readJsonBody } from '$lib/server/sign-off-forms';
import { assessSubmission, mailAssessment } from '$lib/server/sign-offs';
import type { RequestHandler } from './$types';

/**
 * A trainer's assessment of waiting evidence: JSON `{ criteria: [{ result, remark }], outcome,
 * reasons, place, practicalDate, signatureName }`, one criterion per skill criterion in order.
 */
export const POST: RequestHandler = async (event) => {
	const me = requireRole(event, 'trainer');
	const read = await readJsonBody(event.request);
	if (!read.ok) return read.response;
	let result;
	try {
		result = await assessSubmission(event.params.evidence, me.id, read.body);
	} catch (err) {
		return apiFailure(err);
	}
	await mailAssessment(result, event.url.origin);
	return json({ id: result.submissionId, outcome: result.outcome, signOffId: result.signOffId }, { status: 201 });
};
