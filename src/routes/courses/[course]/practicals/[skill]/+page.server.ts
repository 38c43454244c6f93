import { error } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { isEnrolled } from '$lib/server/enrolments';
import { receiveEvidence } from '$lib/server/evidence-upload';
import { failFrom } from '$lib/server/sign-off-forms';
import { findSkill, practicalOverview, withdrawEvidence } from '$lib/server/sign-offs';
import { readingSpecs } from '$lib/practicals/readings';
import type { Actions, PageServerLoad } from './$types';

/** One practical skill for the signed-in trainee: criteria, state, evidence form and history. */
export const load: PageServerLoad = async (event) => {
	const me = requireUser(event);
	const found = findSkill(event.params.course, event.params.skill);
	if (!found) error(404, 'No such practical skill.');
	if (!(await isEnrolled(me.id, found.course.slug))) error(403, `Practical evidence is for people enrolled in ${found.course.title}.`);
	const skill = (await practicalOverview(me.id, found.course.slug)).find((s) => s.id === found.skill.id)!;
	return {
		course: { slug: found.course.slug, title: found.course.title },
		skill,
		readingSpecs: readingSpecs(found.course.slug, found.skill.id)
	};
};

export const actions: Actions = {
	send: async (event) => {
		const me = requireUser(event);
		try {
			await receiveEvidence(event.request, { traineeId: me.id, courseSlug: event.params.course, skillId: event.params.skill });
			return { sent: true };
		} catch (err) {
			return failFrom(err);
		}
	},
	withdraw: async (event) => {
		const me = requireUser(event);
		const form = await event.request.formData().catch(() => null);
		const id = form?.get('submission');
		if (typeof id !== 'string' || id.length > 64) error(400, 'Which evidence?');
		try {
			await withdrawEvidence(id, me.id);
			return { withdrawn: true };
		} catch (err) {
			return failFrom(err);
		}
	}
};
