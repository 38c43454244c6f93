import MiniSearch, { type Options, type SearchResult } from 'minisearch';
import type { Course } from './index';
import { headings, plainText, splitFrontMatter } from './text';

/**
 * Lesson search. The index is built once at build time (a prerendered JSON file) and loaded
 * in the browser, which searches it with the same options.
 */

export interface LessonDocument {
	/** The lesson's URL, `/courses/<course>/<lesson>`. */
	id: string;
	title: string;
	courseTitle: string;
	preview: boolean;
	objectives: string;
	headings: string;
	text: string;
}

export interface LessonHit {
	href: string;
	title: string;
	courseTitle: string;
	summary: string;
	preview: boolean;
}

export const searchOptions: Options<LessonDocument> = {
	fields: ['title', 'objectives', 'headings', 'text'],
	storeFields: ['title', 'courseTitle', 'summary', 'preview'],
	extractField: (doc, field) => (field === 'summary' ? doc.objectives.split('\n')[0] : (doc as unknown as Record<string, string>)[field]),
	searchOptions: { prefix: true, fuzzy: 0.2, combineWith: 'AND', boost: { title: 4, headings: 2, objectives: 1.5 } }
};

export interface LessonSource {
	href: string;
	title: string;
	courseTitle: string;
	preview: boolean;
	objectives: string[];
	raw: string;
}

export function lessonDocument(source: LessonSource): LessonDocument {
	return {
		id: source.href,
		title: source.title,
		courseTitle: source.courseTitle,
		preview: source.preview,
		objectives: source.objectives.join('\n'),
		headings: headings(splitFrontMatter(source.raw).body).join('\n'),
		text: plainText(source.raw)
	};
}

/**
 * One source per lesson, in catalogue order. `raw` holds the lesson files keyed by path
 * (`/content/courses/<course>/lessons/<lesson>.md`), as a raw `import.meta.glob` gives them.
 * The caller globs, so no lesson text reaches a browser bundle through this module.
 */
export function lessonSources(courses: Course[], raw: Record<string, string>): LessonSource[] {
	return courses.flatMap((course) =>
		course.lessons.map((lesson) => ({
			href: lesson.href,
			title: lesson.title,
			courseTitle: course.title,
			preview: lesson.preview,
			objectives: lesson.objectives,
			raw: raw[`/content/courses/${course.slug}/lessons/${lesson.slug}.md`] ?? ''
		}))
	);
}

/** The serialised index (MiniSearch's own JSON form). */
export function buildSearchIndex(sources: LessonSource[]): string {
	const index = new MiniSearch<LessonDocument>(searchOptions);
	index.addAll(sources.map(lessonDocument));
	return JSON.stringify(index);
}

export function loadSearchIndex(json: string): MiniSearch<LessonDocument> {
	return MiniSearch.loadJSON<LessonDocument>(json, searchOptions);
}

export function searchLessons(index: MiniSearch<LessonDocument>, query: string, limit = 8): LessonHit[] {
	if (!query.trim()) return [];
	return index
		.search(query)
		.slice(0, limit)
		.map((r: SearchResult) => ({ href: r.id, title: r.title, courseTitle: r.courseTitle, summary: r.summary, preview: r.preview === true }));
}
