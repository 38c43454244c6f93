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
	/**
	 * The shorter path that renews a certificate: the course test again and only the skills
	 * marked `renewal: true`. It may start `opensDaysBefore` days before expiry and up to
	 * `graceDays` after; the new certificate's validity continues from the old expiry date.
	 */
	renewal: z.object({
		priceCents: z.number().int().nonnegative(),
		opensDaysBefore: z.number().int().positive().max(365),
		graceDays: z.number().int().nonnegative().max(365)
	}),
	practicalSkills: z
		.array(
			z.object({
				id: z.string().min(1),
				title: z.string().min(1),
				criteria: z.array(z.string().min(1)).min(1),
				/** Shown again to a trainer at every renewal (pressure and safety skills, for instance). */
				renewal: z.boolean().default(false)
			})
		)
		.min(1)
		.refine((skills) => skills.some((s) => s.renewal), 'Mark at least one practical skill with renewal: true.')
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
