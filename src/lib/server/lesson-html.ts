import type { Component } from 'svelte';
import { render } from 'svelte/server';
import type { Lesson } from '$lib/content';
import { allPictures } from '$lib/components/calc/pictures';
import { LESSON_HREF, LESSON_BODY_SLOT, LESSON_PICTURES } from '$lib/components/lesson/islands';

/**
 * Lesson bodies as HTML, rendered on the server only. The compiled lessons are imported here
 * and nowhere in browser code, so no lesson text is in a public client file; the page sends
 * this HTML only to people who may read the lesson (the route decides) and mounts the
 * islands in it. A body is the same for every reader, so each is rendered once per process.
 *
 * On a full page load the body is not part of the page data (which would send it twice and
 * escape it character by character on every request): the page renders LESSON_BODY_SLOT and
 * the `lessonBody` hook puts the body there. Svelte keeps server-rendered `{@html}` content
 * as it is when the page hydrates. Client-side navigation gets the body in the data instead.
 */

export interface LessonHtml {
	html: string;
	/** `html` as UTF-8, encoded once: a full page is put together from bytes (see `pageWithBody`). */
	bytes: Uint8Array;
	/** The body has KaTeX formulas, so the page loads KaTeX's stylesheet and fonts. */
	math: boolean;
}

const bodies = import.meta.glob<{ default: Component }>('/content/courses/*/lessons/*.md');
const rendered = new Map<string, Promise<LessonHtml>>();
const encoder = new TextEncoder();

async function renderLesson(lesson: Lesson): Promise<LessonHtml> {
	const load = bodies[`/content/courses/${lesson.courseSlug}/lessons/${lesson.slug}.md`];
	if (!load) throw new Error(`No lesson file for ${lesson.href}`);
	const [{ default: Body }, pictures] = await Promise.all([load(), allPictures()]);
	const context = new Map<string, unknown>([
		[LESSON_HREF, lesson.href],
		[LESSON_PICTURES, pictures]
	]);
	const { body } = render(Body, { context, idPrefix: `${lesson.slug}-` });
	// Svelte's hydration markers are comments; the body is static HTML (islands mount afresh), and
	// an empty comment inside `{@html}` would end the block early when the page hydrates.
	const html = body.replace(/<!--[\s\S]*?-->/g, '');
	return { html, bytes: encoder.encode(html), math: html.includes('class="katex"') };
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

/**
 * The page with a lesson body the load function has allowed (`locals.lessonBody`) in its slot,
 * as bytes: the page around the slot is encoded per request, the body was encoded once.
 * A page without the slot comes back as it is.
 */
export function pageWithBody(page: string, body: Uint8Array): Uint8Array<ArrayBuffer> {
	const at = page.indexOf(LESSON_BODY_SLOT);
	if (at === -1) return encoder.encode(page);
	const before = encoder.encode(page.slice(0, at));
	const after = encoder.encode(page.slice(at + LESSON_BODY_SLOT.length));
	const bytes = new Uint8Array(before.byteLength + body.byteLength + after.byteLength);
	bytes.set(before, 0);
	bytes.set(body, before.byteLength);
	bytes.set(after, before.byteLength + body.byteLength);
	return bytes;
}
