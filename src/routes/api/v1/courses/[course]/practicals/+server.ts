import { json } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { isEnrolled } from '$lib/server/enrolments';
import { apiError } from '$lib/server/sign-off-forms';
import { practicalOverview } from '$lib/server/sign-offs';
import type { RequestHandler } from './$types';

/** The caller's practical skills in a course, each with its state, sign-off and history. */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const course = getCourse(event.params.course);
	if (!course) return apiError(404, 'No such course.');
	if (!(await isEnrolled(me.id, course.slug))) return apiError(403, `You are not enrolled in ${course.title}.`);
	const skills = await practicalOverview(me.id, course.slug);
	return json({
		course: course.slug,
		skills: skills.map((s) => ({
			id: s.id,
			title: s.title,
			criteria: s.criteria,
			state: s.state,
			signOff: s.signOff ? { signedOffAt: s.signOff.signedOffAt, trainerName: s.signOff.trainerName } : null,
			history: s.history.map((h) => ({
				id: h.id,
				status: h.status,
				inPerson: h.inPerson,
				submittedAt: h.submittedAt,
				note: h.note,
				readings: h.readings,
				files: h.files.map((f) => ({ id: f.id, name: f.originalName, mediaType: f.mediaType, sizeBytes: f.sizeBytes, url: `/evidence-files/${f.id}` })),
				assessment: h.assessment
			}))
		}))
	});
};
