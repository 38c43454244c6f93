/**
 * The items of a course test: the draw, what the runner may show, answer shapes, grading
 * and review. Pure: the server stores the draw and calls these; nothing here sees a database.
 *
 * Contract: `runnerItem` never carries an answer, a seed or a calculator's inputs (a seed
 * would let the public practice check reveal the answer). Options of choice questions are
 * shown shuffled, and answers refer to the shown positions.
 */
import { z } from 'zod';
import { unitLabel } from '../calc/units';
import { gradeNumeric, formatAmount, unitChoices } from './grading';
import { checkAnswer, describeExpected, generateProblem, getGenerator, type Problem } from './index';
import { Rng } from './random';

/** A fixed question as the bank holds it (content/courses/<course>/questions.yaml). */
export type BankQuestion = { id: string; lesson: string; prompt: string; explanation: string } & (
	| { type: 'single'; options: string[]; answer: number }
	| { type: 'multiple'; options: string[]; answer: number[] }
	| { type: 'truefalse'; answer: boolean }
	| { type: 'order'; options: string[] }
	| { type: 'numeric'; answer: { value: number; unit: string; tolerancePercent: number } }
);

/** One drawn item as stored with the attempt (server-side only). */
export type DrawnItem =
	| { source: 'bank'; id: string; lesson: string; question: BankQuestion; shown?: number[] }
	| { source: 'computed'; generator: string; seed: number; lesson: string | null; problem: Problem };

export type ItemKind = 'single' | 'multiple' | 'truefalse' | 'order' | 'numeric';

/** What the test runner shows for one item. */
export interface RunnerItem {
	position: number;
	kind: ItemKind;
	prompt: string;
	options?: string[];
	/** Numeric items: the unit asked, and the units offered. */
	unit?: string;
	units?: string[];
	/** The lesson slug it belongs to, when in this course. */
	lesson: string | null;
}

/** An open attempt as the runner receives it: items without answers, and the person's own saved answers. */
export interface RunnerView {
	status: 'open';
	id: string;
	course: { slug: string; title: string };
	startedAt: string;
	deadlineAt: string | null;
	/** The server's clock, so the browser's timer can allow for its own being off. */
	serverNow: string;
	items: RunnerItem[];
	/** By position. */
	answers: Record<string, ItemAnswer>;
}

export interface TestSpec {
	/** Lesson slugs in course order. */
	lessons: string[];
	fixedItems: number;
	computedItems: number;
	generators: string[];
}

// ---------------------------------------------------------------- the draw

/**
 * Draws a test from the bank and the generators, reproducibly for `seed`. Fixed questions are
 * spread over the lessons round by round, so lesson counts differ by at most one where the bank
 * allows; computed items cycle through the generators. Items come in lesson order.
 */
export function drawTest(spec: TestSpec, bank: BankQuestion[], seed: number, lessonFor: (generator: string) => string | null): DrawnItem[] {
	const rng = new Rng(seed);
	const byLesson = new Map<string, BankQuestion[]>();
	for (const q of bank) byLesson.set(q.lesson, [...(byLesson.get(q.lesson) ?? []), q]);
	const queues = rng.shuffle([...byLesson.keys()]).map((lesson) => rng.shuffle(byLesson.get(lesson)!));

	const fixed: DrawnItem[] = [];
	while (fixed.length < spec.fixedItems && queues.some((q) => q.length > 0)) {
		for (const queue of rng.shuffle(queues)) {
			const q = queue.shift();
			if (!q || fixed.length >= spec.fixedItems) continue;
			fixed.push({ source: 'bank', id: q.id, lesson: q.lesson, question: q, ...shuffledOptions(q, rng) });
		}
	}

	const computed: DrawnItem[] = [];
	const gens = spec.generators.filter((g) => getGenerator(g));
	for (let round = 0; gens.length > 0 && computed.length < spec.computedItems; round++) {
		for (const generator of rng.shuffle(gens)) {
			if (computed.length >= spec.computedItems) break;
			const itemSeed = rng.seed();
			computed.push({ source: 'computed', generator, seed: itemSeed, lesson: lessonFor(generator), problem: generateProblem(generator, itemSeed) });
		}
	}

	const order = (item: DrawnItem) => {
		const i = item.lesson === null ? -1 : spec.lessons.indexOf(item.lesson);
		return (i === -1 ? spec.lessons.length : i) * 2 + (item.source === 'computed' ? 1 : 0);
	};
	return [...fixed, ...computed].map((item, i) => ({ item, i })).sort((a, b) => order(a.item) - order(b.item) || a.i - b.i).map(({ item }) => item);
}

function shuffledOptions(q: BankQuestion, rng: Rng): { shown?: number[] } {
	if (q.type !== 'single' && q.type !== 'multiple' && q.type !== 'order') return {};
	const identity = q.options.map((_, i) => i);
	let shown = rng.shuffle(identity);
	// Steps to put in order must never be shown already in order.
	if (q.type === 'order' && shown.every((v, i) => v === i)) shown = [...identity.slice(1), identity[0]];
	return { shown };
}

function shownOptions(item: DrawnItem & { source: 'bank' }): string[] | undefined {
	const q = item.question;
	if (q.type !== 'single' && q.type !== 'multiple' && q.type !== 'order') return undefined;
	const shown = item.shown ?? q.options.map((_, i) => i);
	return shown.map((i) => q.options[i]);
}

// ---------------------------------------------------------------- what the runner shows

export function runnerItem(item: DrawnItem, position: number): RunnerItem {
	if (item.source === 'computed') {
		const p = item.problem;
		if (p.kind === 'choice') return { position, kind: 'single', prompt: p.prompt, options: p.choices!.map((c) => c.label), lesson: item.lesson };
		return { position, kind: 'numeric', prompt: p.prompt, unit: p.unit, units: unitChoices(p.unit), lesson: item.lesson };
	}
	const q = item.question;
	const base = { position, prompt: q.prompt, lesson: item.lesson };
	switch (q.type) {
		case 'truefalse':
			return { ...base, kind: 'truefalse' };
		case 'numeric':
			return { ...base, kind: 'numeric', unit: q.answer.unit, units: unitChoices(q.answer.unit) };
		default:
			return { ...base, kind: q.type, options: shownOptions(item) };
	}
}

// ---------------------------------------------------------------- answers

export type ItemAnswer =
	| { choice: number }
	| { choices: number[] }
	| { value: boolean }
	| { order: number[] }
	| { value: string | number; unit: string };

const index = (n: number) => z.number().int('Must be a whole number').min(0, 'Not one of the options').max(n - 1, 'Not one of the options');

/** The zod schema an answer to this item must satisfy; messages name the field. */
export function answerSchema(item: RunnerItem): z.ZodType<ItemAnswer> {
	const n = item.options?.length ?? 0;
	switch (item.kind) {
		case 'single':
			return z.strictObject({ choice: index(n) });
		case 'multiple':
			return z.strictObject({
				choices: z.array(index(n)).max(n).refine((a) => new Set(a).size === a.length, 'Each option at most once')
			});
		case 'truefalse':
			return z.strictObject({ value: z.boolean('Must be true or false') });
		case 'order':
			return z.strictObject({
				order: z
					.array(index(n))
					.length(n, `Must list all ${n} steps`)
					.refine((a) => new Set(a).size === a.length, 'Each step exactly once')
			});
		case 'numeric':
			return z.strictObject({
				value: z.union([z.number(), z.string().max(40, 'Too long')], 'Must be a number or text'),
				unit: z.string().max(20, 'Too long')
			});
	}
}

/** Whether an answer says anything (an empty number or no choices counts as unanswered). */
export function isAnswered(answer: ItemAnswer | undefined): boolean {
	if (!answer) return false;
	if ('choices' in answer) return answer.choices.length > 0;
	if ('unit' in answer) return String(answer.value).trim() !== '';
	return true;
}

// ---------------------------------------------------------------- grading and review

export interface ItemGrade {
	correct: boolean;
	answered: boolean;
	hint?: string;
}

const sameSet = (a: number[], b: number[]) => a.length === b.length && [...a].sort().every((v, i) => v === [...b].sort()[i]);

function original(item: DrawnItem & { source: 'bank' }, shownIndex: number): number {
	return item.shown ? item.shown[shownIndex] : shownIndex;
}

/**
 * Grades one item on the server. Unanswered items are wrong. Never throws: a stored answer
 * that cannot be graded (one saved before a rule tightened) counts as answered and wrong, so
 * that one odd answer cannot block the attempt from closing.
 */
export function gradeItem(item: DrawnItem, answer: ItemAnswer | undefined): ItemGrade {
	try {
		return gradeOrThrow(item, answer);
	} catch {
		let answered = true;
		try {
			answered = isAnswered(answer);
		} catch {
			// An answer too odd to read still counts as given.
		}
		return { correct: false, answered };
	}
}

function gradeOrThrow(item: DrawnItem, answer: ItemAnswer | undefined): ItemGrade {
	const answered = isAnswered(answer);
	if (!answered || !answer) return { correct: false, answered: false };
	if (item.source === 'computed') {
		const p = item.problem;
		const check =
			p.kind === 'choice'
				? checkAnswer(p, { choice: 'choice' in answer ? p.choices![answer.choice]?.value : undefined })
				: checkAnswer(p, 'unit' in answer ? { value: answer.value, unit: answer.unit } : null);
		return { correct: check.correct, answered, ...(check.hint ? { hint: check.hint } : {}) };
	}
	const q = item.question;
	switch (q.type) {
		case 'single':
			return { correct: 'choice' in answer && original(item, answer.choice) === q.answer, answered };
		case 'multiple':
			return { correct: 'choices' in answer && sameSet(answer.choices.map((c) => original(item, c)), q.answer), answered };
		case 'truefalse':
			return { correct: 'value' in answer && answer.value === q.answer, answered };
		case 'order':
			return { correct: 'order' in answer && answer.order.every((c, i) => original(item, c) === i), answered };
		case 'numeric':
			return { correct: 'unit' in answer && gradeNumeric(q.answer, answer, q.answer.tolerancePercent).correct, answered };
	}
}

export interface ReviewItem extends RunnerItem {
	correct: boolean;
	/** The person's answer, one line per part (empty when unanswered). */
	given: string[];
	/** The right answer, one line per part. */
	expected: string[];
	explanation?: string;
	steps?: string[];
	hint?: string;
}

function describeAnswer(item: RunnerItem, answer: ItemAnswer | undefined): string[] {
	if (!answer || !isAnswered(answer)) return [];
	const opts = item.options ?? [];
	if ('choice' in answer) return [opts[answer.choice] ?? '?'];
	if ('choices' in answer) return answer.choices.map((c) => opts[c] ?? '?');
	if ('order' in answer) return answer.order.map((c) => opts[c] ?? '?');
	if ('unit' in answer) return [`${String(answer.value).trim()} ${unitLabel(answer.unit)}`.trim()];
	return [answer.value ? 'True' : 'False'];
}

/** The review of one item after submission: the answer given, the right one and why. */
export function reviewItem(item: DrawnItem, position: number, answer: ItemAnswer | undefined, grade: ItemGrade): ReviewItem {
	const shown = runnerItem(item, position);
	const base = { ...shown, correct: grade.correct, given: describeAnswer(shown, answer), ...(grade.hint ? { hint: grade.hint } : {}) };
	if (item.source === 'computed') {
		const check = checkAnswer(item.problem, null);
		return { ...base, expected: [describeExpected(check.expected)], steps: check.steps };
	}
	const q = item.question;
	const expected =
		q.type === 'single'
			? [q.options[q.answer]]
			: q.type === 'multiple'
				? q.answer.map((i) => q.options[i])
				: q.type === 'order'
					? [...q.options]
					: q.type === 'truefalse'
						? [q.answer ? 'True' : 'False']
						: [formatAmount(q.answer, 4)];
	return { ...base, expected, explanation: q.explanation };
}

/** The key an item is counted under in item statistics: the question id, or the generator. */
export function itemKey(item: DrawnItem): string {
	return item.source === 'bank' ? item.id : `computed:${item.generator}`;
}

/** A short label for item statistics. */
export function itemLabel(item: DrawnItem): string {
	return item.source === 'bank' ? item.question.prompt : `${getGenerator(item.generator)?.title ?? item.generator} (computed)`;
}
