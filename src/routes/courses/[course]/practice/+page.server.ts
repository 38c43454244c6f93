import { error } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { listGenerators } from '$lib/practice';
import { lessonForGenerator, practiceGenerators } from '$lib/practice/course-lessons';
import type { PageServerLoad } from './$types';

/** The course's practice topics and the lesson that teaches each. Open to everyone: practice never counts. */
export const load: PageServerLoad = ({ params }) => {
	const course = getCourse(params.course);
	if (!course) error(404, 'No such course');
	const all = listGenerators();
	const topics = practiceGenerators(course.test.generators, all).map(({ id, extra }) => {
		const g = all.find((x) => x.id === id)!;
		const slug = lessonForGenerator(course.slug, id);
		const lesson = slug ? course.lessons.find((l) => l.slug === slug) : undefined;
		return { id, title: g.title, topic: g.topic, extra, lesson: lesson ? { href: lesson.href, title: lesson.title } : null };
	});
	return { course: { slug: course.slug, title: course.title, code: course.code }, topics };
};
