import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { courses } from '$lib/content';
import { questionsFor } from '$lib/server/question-bank';
import { generatorLessonEntries, lessonForGenerator, practiceGenerators } from './course-lessons';
import { expectedAmount, expectedChoice, listGenerators } from './index';
import { answerSchema, drawTest, gradeItem, isAnswered, itemKey, reviewItem, runnerItem, type BankQuestion, type DrawnItem, type TestSpec } from './test-items';

function specOf(slug: string): TestSpec {
	const course = courses.find((c) => c.slug === slug)!;
	return { lessons: course.lessons.map((l) => l.slug), ...course.test };
}

describe('the lesson that teaches each computed problem', () => {
	it('is a lesson of that course which embeds the calculator', () => {
		for (const [course, generator, lesson] of generatorLessonEntries()) {
			const text = readFileSync(join(process.cwd(), 'content', 'courses', course, 'lessons', `${lesson}.md`), 'utf8');
			expect(text, `${course}/${lesson}`).toContain(`<Calculator id="${generator}"`);
		}
	});

	it('exists for every generator a course test lists', () => {
		for (const course of courses) {
			for (const g of course.test.generators) expect(lessonForGenerator(course.slug, g), `${course.slug} ${g}`).not.toBeNull();
		}
	});

	it('practice drills the test generators and offers the advanced ones as extras', () => {
		const list = practiceGenerators(['cure-time'], listGenerators());
		expect(list[0]).toEqual({ id: 'cure-time', extra: false });
		expect(list).toContainEqual({ id: 'f1216-partial', extra: true });
	});
});

for (const course of courses) {
	describe(`the test draw for ${course.slug}`, () => {
		const spec = specOf(course.slug);
		const bank = questionsFor(course.slug);
		const lessonFor = (g: string) => lessonForGenerator(course.slug, g);
		const draws = [1, 2, 3, 99, 123456].map((seed) => drawTest(spec, bank, seed, lessonFor));

		it('is the same for the same seed and differs between seeds', () => {
			expect(drawTest(spec, bank, 1, lessonFor)).toEqual(draws[0]);
			expect(draws[1].map(itemKey)).not.toEqual(draws[0].map(itemKey));
		});

		it('holds the set numbers of fixed and computed items, each question once', () => {
			for (const draw of draws) {
				const fixed = draw.filter((i) => i.source === 'bank');
				expect(fixed).toHaveLength(spec.fixedItems);
				expect(draw.filter((i) => i.source === 'computed')).toHaveLength(spec.computedItems);
				expect(new Set(fixed.map(itemKey)).size).toBe(fixed.length);
			}
		});

		it('spreads fixed questions over the lessons and computed items over the generators', () => {
			for (const draw of draws) {
				const perLesson = spec.lessons.map((l) => draw.filter((i) => i.source === 'bank' && i.lesson === l).length);
				expect(Math.max(...perLesson) - Math.min(...perLesson), perLesson.join(',')).toBeLessThanOrEqual(1);
				const perGenerator = spec.generators.map((g) => draw.filter((i) => i.source === 'computed' && i.generator === g).length);
				expect(Math.max(...perGenerator) - Math.min(...perGenerator)).toBeLessThanOrEqual(1);
			}
		});

		it('comes in lesson order', () => {
			for (const draw of draws) {
				const positions = draw.map((i) => spec.lessons.indexOf(i.lesson ?? ''));
				expect(positions).toEqual([...positions].sort((a, b) => a - b));
			}
		});

		it('shows the runner no answers, explanations, seeds or inputs', () => {
			for (const draw of draws) {
				draw.forEach((item, position) => {
					const shown = runnerItem(item, position);
					expect(Object.keys(shown).every((k) => ['position', 'kind', 'prompt', 'options', 'unit', 'units', 'lesson'].includes(k)), Object.keys(shown).join()).toBe(true);
					const text = JSON.stringify(shown);
					if (item.source === 'bank') {
						expect(text).not.toContain(item.question.explanation.slice(0, 30));
					} else {
						expect(text).not.toContain(String(item.seed));
						// The answer may equal a figure of the prompt (60 min at 20 °C is 30 min at 30 °C); outside it, never.
						const { prompt: _, ...rest } = shown;
						if (item.problem.kind === 'numeric') expect(JSON.stringify(rest)).not.toContain(String(expectedAmount(item.problem).value));
					}
				});
			}
		});
	});
}

describe('questions to put in order', () => {
	it('are never shown already in order', () => {
		const q: BankQuestion = { id: 'x', lesson: 'a', prompt: 'Order', explanation: 'e', type: 'order', options: ['one', 'two'] };
		for (let seed = 0; seed < 50; seed++) {
			const [item] = drawTest({ lessons: ['a'], fixedItems: 1, computedItems: 0, generators: [] }, [q], seed, () => null);
			expect(runnerItem(item, 0).options).toEqual(['two', 'one']);
		}
	});
});

describe('answers and grading', () => {
	const single: DrawnItem = {
		source: 'bank',
		id: 's',
		lesson: 'a',
		shown: [2, 0, 1],
		question: { id: 's', lesson: 'a', prompt: 'Pick', explanation: 'Because', type: 'single', options: ['right', 'wrong 1', 'wrong 2'], answer: 0 }
	};
	const multiple: DrawnItem = {
		source: 'bank',
		id: 'm',
		lesson: 'a',
		shown: [1, 2, 0],
		question: { id: 'm', lesson: 'a', prompt: 'Pick all', explanation: 'e', type: 'multiple', options: ['A', 'B', 'C'], answer: [0, 2] }
	};
	const order: DrawnItem = {
		source: 'bank',
		id: 'o',
		lesson: 'a',
		shown: [2, 0, 1],
		question: { id: 'o', lesson: 'a', prompt: 'Order', explanation: 'e', type: 'order', options: ['first', 'second', 'third'] }
	};
	const truefalse: DrawnItem = { source: 'bank', id: 't', lesson: 'a', question: { id: 't', lesson: 'a', prompt: 'T?', explanation: 'e', type: 'truefalse', answer: false } };
	const numeric: DrawnItem = {
		source: 'bank',
		id: 'n',
		lesson: 'a',
		question: { id: 'n', lesson: 'a', prompt: 'How much?', explanation: 'e', type: 'numeric', answer: { value: 1.17, unit: 'kg', tolerancePercent: 2 } }
	};

	it('grades by the option shown, through the shuffle', () => {
		expect(runnerItem(single, 0).options).toEqual(['wrong 2', 'right', 'wrong 1']);
		expect(gradeItem(single, { choice: 1 }).correct).toBe(true);
		expect(gradeItem(single, { choice: 0 }).correct).toBe(false);
		expect(gradeItem(multiple, { choices: [2, 1] }).correct).toBe(true);
		expect(gradeItem(multiple, { choices: [2] }).correct).toBe(false);
		expect(gradeItem(multiple, { choices: [0, 1, 2] }).correct).toBe(false);
		// Shown: third, first, second. In order: first (1), second (2), third (0).
		expect(gradeItem(order, { order: [1, 2, 0] }).correct).toBe(true);
		expect(gradeItem(order, { order: [0, 1, 2] }).correct).toBe(false);
		expect(gradeItem(truefalse, { value: false }).correct).toBe(true);
		expect(gradeItem(truefalse, { value: true }).correct).toBe(false);
		expect(gradeItem(numeric, { value: '1170', unit: 'g' }).correct).toBe(true);
		expect(gradeItem(numeric, { value: '1.3', unit: 'kg' }).correct).toBe(false);
	});

	it('counts an empty answer as unanswered and wrong', () => {
		expect(gradeItem(numeric, { value: ' ', unit: 'kg' })).toEqual({ correct: false, answered: false });
		expect(gradeItem(multiple, { choices: [] })).toEqual({ correct: false, answered: false });
		expect(gradeItem(single, undefined)).toEqual({ correct: false, answered: false });
		expect(isAnswered({ value: false })).toBe(true);
	});

	it('refuses answers of the wrong shape with a message per field', () => {
		const schema = answerSchema(runnerItem(single, 0));
		expect(schema.safeParse({ choice: 2 }).success).toBe(true);
		expect(schema.safeParse({ choice: 3 }).success).toBe(false);
		expect(schema.safeParse({ choice: 1.5 }).success).toBe(false);
		expect(schema.safeParse({ choice: 1, extra: 1 }).success).toBe(false);
		expect(answerSchema(runnerItem(multiple, 0)).safeParse({ choices: [1, 1] }).success).toBe(false);
		expect(answerSchema(runnerItem(order, 0)).safeParse({ order: [0, 1] }).success).toBe(false);
		expect(answerSchema(runnerItem(order, 0)).safeParse({ order: [0, 0, 1] }).success).toBe(false);
		expect(answerSchema(runnerItem(truefalse, 0)).safeParse({ value: 'yes' }).success).toBe(false);
		expect(answerSchema(runnerItem(numeric, 0)).safeParse({ value: '1.2', unit: 'kg' }).success).toBe(true);
		expect(answerSchema(runnerItem(numeric, 0)).safeParse({ value: 'x'.repeat(41), unit: 'kg' }).success).toBe(false);
	});

	it('grades computed items with the calculation library, decisions by the choice shown', () => {
		const draw = drawTest({ lessons: [], fixedItems: 0, computedItems: 40, generators: ['pressure-window', 'resin-quantity'] }, [], 5, () => null);
		for (const item of draw) {
			if (item.source !== 'computed') continue;
			if (item.problem.kind === 'choice') {
				const right = item.problem.choices!.findIndex((c) => c.value === expectedChoice(item.problem).value);
				expect(gradeItem(item, { choice: right }).correct).toBe(true);
				expect(gradeItem(item, { choice: (right + 1) % 4 }).correct).toBe(false);
			} else {
				const e = expectedAmount(item.problem);
				expect(gradeItem(item, { value: e.value, unit: e.unit }).correct).toBe(true);
				expect(gradeItem(item, { value: String(e.value * 2), unit: e.unit }).correct).toBe(false);
			}
		}
	});

	it('reviews with the given answer, the right one and the explanation or worked steps', () => {
		const r = reviewItem(single, 0, { choice: 0 }, gradeItem(single, { choice: 0 }));
		expect(r).toMatchObject({ correct: false, given: ['wrong 2'], expected: ['right'], explanation: 'Because' });
		expect(reviewItem(order, 0, undefined, { correct: false, answered: false })).toMatchObject({ given: [], expected: ['first', 'second', 'third'] });
		expect(reviewItem(numeric, 0, { value: '1170', unit: 'g' }, { correct: true, answered: true }).given).toEqual(['1170 g']);
		const [computed] = drawTest({ lessons: [], fixedItems: 0, computedItems: 1, generators: ['resin-quantity'] }, [], 8, () => null);
		const review = reviewItem(computed, 0, { value: '1', unit: 'kg' }, gradeItem(computed, { value: '1', unit: 'kg' }));
		expect(review.steps!.length).toBeGreaterThan(2);
		expect(review.expected[0]).toMatch(/kg|g$/);
	});
});
