import type { Component } from 'svelte';
import { render } from 'svelte/server';
import type { Lesson } from '$lib/content';
import { LESSON_HREF } from '$lib/components/lesson/islands';

/**
 * Lesson bodies as HTML, rendered on the server only. The compiled lessons are imported here
 * and nowhere in browser code, so no lesson text is in a public client file; the page sends
 * this HTML only to people who may read the lesson (the route decides) and mounts the
 * islands in it. A body is the same for every reader, so each is rendered once per process.
 */

export interface LessonHtml {
	html: string;
	/** The body has KaTeX formulas, so the page loads KaTeX's stylesheet and fonts. */
	math: boolean;
}

const bodies = import.meta.glob<{ default: Component }>('/content/courses/*/lessons/*.md');
const rendered = new Map<string, Promise<LessonHtml>>();

async function renderLesson(lesson: Lesson): Promise<LessonHtml> {
	const load = bodies[`/content/courses/${lesson.courseSlug}/lessons/${lesson.slug}.md`];
	if (!load) throw new Error(`No lesson file for ${lesson.href}`);
	const Body = (await load()).default;
	const { body } = render(Body, { context: new Map([[LESSON_HREF, lesson.href]]), idPrefix: `${lesson.slug}-` });
	return { html: body, math: body.includes('class="katex"') };
}

export function lessonHtml(lesson: Lesson): Promise<LessonHtml> {
	let html = rendered.get(lesson.href);
	if (!html) {
		html = renderLesson(lesson);
		rendered.set(lesson.href, html);
		html.catch(() => rendered.delete(lesson.href));
	}
	return html;
}
