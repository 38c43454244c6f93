import { error } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { requireUser } from '$lib/server/authz';
import { isEnrolled } from '$lib/server/enrolments';
import { practicalOverview } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

/** The signed-in person's practical skills in a course, each with its state. */
export const load: PageServerLoad = async (event) => {
	const me = requireUser(event);
	const course = getCourse(event.params.course);
	if (!course) error(404, 'No such course.');
	const enrolled = await isEnrolled(me.id, course.slug);
	const skills = enrolled ? await practicalOverview(me.id, course.slug) : [];
	return {
		course: { slug: course.slug, title: course.title, code: course.code },
		enrolled,
		skills: skills.map((s) => ({ id: s.id, title: s.title, state: s.state, signOff: s.signOff, reasons: s.state === 'returned' ? (s.history[0]?.assessment?.reasons ?? '') : '' }))
	};
};
