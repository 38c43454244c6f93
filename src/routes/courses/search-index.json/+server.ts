import { courses } from '$lib/content';
import { buildSearchIndex } from '$lib/content/search';
import type { RequestHandler } from './$types';

/** Built once at build time; the catalogue's search box loads it in the browser. */
export const prerender = true;

const raw = import.meta.glob<string>('/content/courses/*/lessons/*.md', { query: '?raw', import: 'default', eager: true });

export const GET: RequestHandler = () => {
	const sources = courses.flatMap((course) =>
		course.lessons.map((lesson) => ({
			href: lesson.href,
			title: lesson.title,
			courseTitle: course.title,
			preview: lesson.preview,
			objectives: lesson.objectives,
			raw: raw[`/content/courses/${course.slug}/lessons/${lesson.slug}.md`] ?? ''
		}))
	);
	return new Response(buildSearchIndex(sources), { headers: { 'content-type': 'application/json' } });
};
