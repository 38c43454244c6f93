import { courses } from '$lib/content';
import { listEnrolledProgress } from '$lib/server/progress';
import { shareWhenAnonymous } from '$lib/server/page-cache';
import type { PageServerLoad } from './$types';

/** The public catalogue; a signed-in person also sees their progress in each enrolled course. */
export const load: PageServerLoad = async (event) => {
	const { locals } = event;
	shareWhenAnonymous(event);
	const enrolled = locals.user ? await listEnrolledProgress(locals.user.id) : [];
	const progress = new Map(enrolled.map((e) => [e.slug, e.progress]));
	return {
		courses: courses.map((course) => ({
			slug: course.slug,
			title: course.title,
			code: course.code,
			level: course.level,
			summary: course.summary,
			priceCents: course.priceCents,
			currency: course.currency,
			validityMonths: course.validityMonths,
			lessonCount: course.lessons.length,
			minutes: course.lessons.reduce((sum, l) => sum + l.minutes, 0),
			prerequisites: course.prerequisites.map((slug) => courses.find((c) => c.slug === slug)?.title ?? slug),
			progress: progress.get(course.slug) ?? null
		}))
	};
};
