import { parse } from 'yaml';
import { z } from 'zod';
import { courses } from '$lib/content';
import { tradeTypography } from '$lib/practice/typography';

/**
 * The fixed question banks, `content/courses/<slug>/questions.yaml`. Server-only: these
 * hold the answers. Malformed banks fail loudly with the file's path.
 */
const numericAnswer = z.object({ value: z.number(), unit: z.string().min(1), tolerancePercent: z.number().positive() });

const base = { id: z.string().min(1), lesson: z.string().min(1), prompt: z.string().min(1), explanation: z.string().min(1) };
export const questionSchema = z.discriminatedUnion('type', [
	z.object({ ...base, type: z.literal('single'), options: z.array(z.string()).min(2), answer: z.number().int().nonnegative() }),
	z.object({ ...base, type: z.literal('multiple'), options: z.array(z.string()).min(2), answer: z.array(z.number().int().nonnegative()).min(1) }),
	z.object({ ...base, type: z.literal('truefalse'), answer: z.boolean() }),
	z.object({ ...base, type: z.literal('order'), options: z.array(z.string()).min(2) }),
	z.object({ ...base, type: z.literal('numeric'), answer: numericAnswer })
]);
export type FixedQuestion = z.infer<typeof questionSchema> & { courseSlug: string };

const files = import.meta.glob<string>('/content/courses/*/questions.yaml', { eager: true, query: '?raw', import: 'default' });

function loadBanks(): Map<string, FixedQuestion[]> {
	const banks = new Map<string, FixedQuestion[]>();
	for (const course of courses) {
		const file = `/content/courses/${course.slug}/questions.yaml`;
		const text = files[file];
		if (text === undefined) {
			banks.set(course.slug, []);
			continue;
		}
		const parsed = z.array(questionSchema).safeParse(parse(text));
		if (!parsed.success) {
			const issue = parsed.error.issues[0];
			throw new Error(`Bad question bank ${file}: ${issue.path.join('.')}: ${issue.message}`);
		}
		banks.set(
			course.slug,
			parsed.data.map((q) => ({
				...q,
				prompt: tradeTypography(q.prompt),
				explanation: tradeTypography(q.explanation),
				...('options' in q ? { options: q.options.map(tradeTypography) } : {}),
				courseSlug: course.slug
			}) as FixedQuestion)
		);
	}
	return banks;
}

const banks = loadBanks();

export function questionsFor(courseSlug: string): FixedQuestion[] {
	return banks.get(courseSlug) ?? [];
}

export function findQuestion(courseSlug: string, id: string): FixedQuestion | undefined {
	return questionsFor(courseSlug).find((q) => q.id === id);
}
