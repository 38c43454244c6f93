import { courses } from '$lib/content';
import { buildSearchIndex, lessonSources } from '$lib/content/search';
import type { RequestHandler } from './$types';

/** Built once at build time; the catalogue's search box loads it in the browser. */
export const prerender = true;

const raw = import.meta.glob<string>('/content/courses/*/lessons/*.md', { query: '?raw', import: 'default', eager: true });

export const GET: RequestHandler = () =>
	new Response(buildSearchIndex(lessonSources(courses, raw)), { headers: { 'content-type': 'application/json' } });
