import { error, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { assessmentFromFields } from '$lib/server/evidence-upload';
import { failFrom } from '$lib/server/sign-off-forms';
import { assessSubmission, findSkill, getSubmission, mailAssessment, trainerMayAssess } from '$lib/server/sign-offs';
import { findUserById } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

/** The assessment screen: criteria, photos, readings with their key, outcome. */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer');
	const submission = await getSubmission(event.params.submission);
	if (!submission || !(await trainerMayAssess(me.id, submission.traineeId))) error(404, 'No such evidence.');
	const found = findSkill(submission.courseSlug, submission.skillId);
	if (!found) error(404, 'No such evidence.');
	const trainee = await findUserById(submission.traineeId);
	return {
		submission,
		own: submission.traineeId === me.id,
		trainee: { name: trainee?.name ?? trainee?.email ?? '', email: trainee?.email ?? '' },
		course: { slug: found.course.slug, title: found.course.title },
		skill: { id: found.skill.id, title: found.skill.title, criteria: found.skill.criteria },
		signatureName: me.name ?? '',
		today: new Date().toISOString().slice(0, 10)
	};
};

export const actions: Actions = {
	assess: async (event) => {
		const me = requireRole(event, 'trainer');
		const form = await event.request.formData().catch(() => null);
		if (!form) error(400, 'The form could not be read.');
		const fields = Object.fromEntries([...form].filter(([, v]) => typeof v === 'string')) as Record<string, string>;
		const submission = await getSubmission(event.params.submission);
		const found = submission && findSkill(submission.courseSlug, submission.skillId);
		if (!submission || !found) error(404, 'No such evidence.');
		let result;
		try {
			result = await assessSubmission(submission.id, me.id, assessmentFromFields(fields, found.skill.criteria.length));
		} catch (err) {
			return failFrom(err, fields);
		}
		await mailAssessment(result, event.url.origin);
		redirect(303, `/trainer/practicals?done=${encodeURIComponent(result.outcome)}`);
	}
};
