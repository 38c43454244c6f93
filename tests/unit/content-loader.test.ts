import { describe, expect, it } from 'vitest';
import { courses, getLesson, loadLessonBody } from '$lib/content';
import { questionsFor } from '$lib/server/question-bank';

describe('content loader', () => {
	it('indexes the three courses with lessons in order', () => {
		expect(courses.map((c) => c.slug).sort()).toEqual(['packer-pressure-safety', 'point-repair-installer', 'transition-patches']);
		for (const course of courses) {
			expect(course.lessons.length, course.slug).toBeGreaterThanOrEqual(6);
			expect(course.lessons.map((l) => l.order)).toEqual(course.lessons.map((_, i) => i + 1));
		}
	});

	it('loads a lesson body as a component', async () => {
		const lesson = getLesson('point-repair-installer', 'wet-out');
		expect(lesson?.href).toBe('/courses/point-repair-installer/wet-out');
		expect(typeof (await loadLessonBody(lesson!))).toBe('function');
	});

	it('parses every question bank with the strict schema', () => {
		for (const course of courses) expect(questionsFor(course.slug).length, course.slug).toBeGreaterThanOrEqual(40);
	});
});
