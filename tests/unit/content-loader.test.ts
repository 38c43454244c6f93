import { describe, expect, it } from 'vitest';
import { courses, getLesson } from '$lib/content';
import { lessonHtml } from '$lib/server/lesson-html';
import { questionsFor } from '$lib/server/question-bank';

describe('content loader', () => {
	it('indexes the three courses with lessons in order', () => {
		expect(courses.map((c) => c.slug).sort()).toEqual(['packer-pressure-safety', 'point-repair-installer', 'transition-patches']);
		for (const course of courses) {
			expect(course.lessons.length, course.slug).toBeGreaterThanOrEqual(6);
			expect(course.lessons.map((l) => l.order)).toEqual(course.lessons.map((_, i) => i + 1));
		}
	});

	it('renders a lesson body once, with its islands marked and its math noted', async () => {
		const lesson = getLesson('point-repair-installer', 'resin-quantity');
		expect(lesson?.href).toBe('/courses/point-repair-installer/resin-quantity');
		const first = lessonHtml(lesson!);
		expect(lessonHtml(lesson!)).toBe(first);
		const { html, math } = await first;
		expect(math).toBe(true);
		expect(html).toContain('data-island="calculator"');
		expect(html).toContain('data-island="check-yourself"');
		const props = [...html.matchAll(/data-island="calculator" data-props="([^"]*)"/g)].map((m) => JSON.parse(m[1].replaceAll('&quot;', '"')));
		expect(props[0]).toMatchObject({ id: 'resin-quantity', here: lesson!.href });
	});

	it('notes a lesson without math', async () => {
		const plain = courses.flatMap((c) => c.lessons).find((l) => l.slug === 'safety-first');
		expect((await lessonHtml(plain!)).math).toBe(false);
	});

	it('parses every question bank with the strict schema', () => {
		for (const course of courses) expect(questionsFor(course.slug).length, course.slug).toBeGreaterThanOrEqual(40);
	});
});
