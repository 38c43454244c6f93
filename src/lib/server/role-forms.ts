import { z } from 'zod';
import { platformRoles } from '$lib/roles';
import { courses } from '$lib/content';

export const roleChangeSchema = z.object({
	userId: z.uuid('Choose a person from the list.'),
	role: z.enum(platformRoles, { error: 'Choose trainer, inspector or registrar.' })
});

export const personSchema = z.object({
	userId: z.uuid('Choose a person from the list.')
});

export const enrolSchema = z.object({
	userId: z.uuid('Choose a person from the list.'),
	course: z.string().refine((slug) => courses.some((c) => c.slug === slug), 'Choose a course from the list.')
});

/** An empty company means the training provider's trainer, who works with everyone. */
export const trainerScopeSchema = z.object({
	userId: z.uuid('Choose a person from the list.'),
	companyId: z.union([z.literal(''), z.uuid('Choose a company from the list.')], { error: 'Choose a company from the list.' })
});
