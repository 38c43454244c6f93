import { error, fail } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { renewalView, startRenewal } from '$lib/server/renewals';
import type { Actions, PageServerLoad } from './$types';

/** The holder's renewal of one of their certificates (the reminder e-mail links here). Another person's number is "not found". */
export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const view = await renewalView(user.id, event.params.number);
	if (!view) error(404, 'You hold no certificate with this number.');
	const course = getCourse(view.courseSlug)!;
	return {
		renewal: view,
		renewalSkills: course.practicalSkills.filter((s) => s.renewal).map((s) => ({ id: s.id, title: s.title })),
		standingSkills: course.practicalSkills.filter((s) => !s.renewal).length,
		validityMonths: course.validityMonths,
		companyAdmin: user.companies.some((c) => c.role === 'admin')
	};
};

export const actions: Actions = {
	start: async (event) => {
		const user = requireUser(event);
		const outcome = await startRenewal(user.id, event.params.number);
		if (!outcome.ok) return fail(outcome.status === 404 ? 404 : 409, { message: outcome.message });
		return { started: true };
	}
};
