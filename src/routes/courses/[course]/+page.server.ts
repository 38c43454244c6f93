import { error } from '@sveltejs/kit';
import { courses, getCourse } from '$lib/content';
import { isEnrolled } from '$lib/server/enrolments';
import { getCourseProgress } from '$lib/server/progress';
import { testStatus } from '$lib/server/attempts';
import { readerLocale } from '$lib/server/locale';
import { shareWhenAnonymous } from '$lib/server/page-cache';
import type { PageServerLoad } from './$types';

/** A course's outline, what its certificate proves, price and validity; progress when enrolled. */
export const load: PageServerLoad = async (event) => {
	const { params, locals, request } = event;
	const course = getCourse(params.course);
	if (!course) error(404, 'No such course');
	shareWhenAnonymous(event);
	const enrolled = locals.user ? await isEnrolled(locals.user.id, course.slug) : false;
	const { lessons, prerequisites, ...meta } = course;
	return {
		course: {
			...meta,
			prerequisites: prerequisites.map((slug) => ({ slug, title: courses.find((c) => c.slug === slug)?.title ?? slug })),
			minutes: lessons.reduce((sum, l) => sum + l.minutes, 0)
		},
		outline: lessons.map(({ slug, title, order, minutes, preview, href }) => ({ slug, title, order, minutes, preview, href })),
		enrolled,
		locale: readerLocale(request.headers.get('accept-language')),
		canBuyForCompany: !!locals.user?.companies.some((c) => c.role === 'admin'),
		progress: enrolled ? await getCourseProgress(locals.user!.id, course) : null,
		test: enrolled ? await summariseTest(locals.user!.id, course.slug) : null
	};
};

async function summariseTest(userId: string, courseSlug: string) {
	const status = await testStatus(userId, courseSlug);
	if (!status) return null;
	return {
		passed: status.passed,
		open: !!status.open,
		attemptsLeft: status.attemptsLeft,
		blocked: status.blocked?.message ?? null
	};
}
