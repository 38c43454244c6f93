import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { receiveEvidence } from '$lib/server/evidence-upload';
import { apiFailure } from '$lib/server/sign-off-forms';
import type { RequestHandler } from './$types';

/** Sends evidence for a skill: multipart with `photos` (up to 8 files), `note`, `reading.<name>` and `reading.<name>.unit`. */
export const POST: RequestHandler = async (event) => {
	const me = requireUser(event);
	try {
		const { submissionId } = await receiveEvidence(event.request, { traineeId: me.id, courseSlug: event.params.course, skillId: event.params.skill });
		return json({ id: submissionId, status: 'waiting' }, { status: 201 });
	} catch (err) {
		return apiFailure(err);
	}
};
