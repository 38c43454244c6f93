import { z } from 'zod';

/** Front matter of `content/courses/<slug>/course.md`. */
export const courseSchema = z.object({
	title: z.string().min(1),
	code: z.string().min(1),
	summary: z.string().min(1),
	level: z.enum(['foundation', 'intermediate', 'advanced']),
	priceCents: z.number().int().nonnegative(),
	currency: z.string().length(3),
	validityMonths: z.number().int().positive(),
	passMark: z.number().min(1).max(100),
	prerequisites: z.array(z.string()).default([]),
	certificateScope: z.string().min(1),
	diameterRangeMm: z.tuple([z.number().positive(), z.number().positive()]),
	test: z.object({
		fixedItems: z.number().int().nonnegative(),
		computedItems: z.number().int().nonnegative(),
		timeLimitMinutes: z.number().int().positive().nullable(),
		attemptsAllowed: z.number().int().positive(),
		waitHours: z.number().nonnegative(),
		generators: z.array(z.string()).min(1)
	}),
	practicalSkills: z
		.array(z.object({ id: z.string().min(1), title: z.string().min(1), criteria: z.array(z.string().min(1)).min(1) }))
		.min(1)
});

/** Front matter of `content/courses/<slug>/lessons/<lesson>.md`. */
export const lessonSchema = z.object({
	title: z.string().min(1),
	order: z.number().int().positive(),
	minutes: z.number().int().positive(),
	preview: z.boolean().default(false),
	objectives: z.array(z.string().min(1)).min(1)
});

export type CourseMeta = z.infer<typeof courseSchema>;
export type LessonMeta = z.infer<typeof lessonSchema>;
