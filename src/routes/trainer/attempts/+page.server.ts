import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { courses, getCourse } from '$lib/content';
import { listAttemptsForStaff, waiveWait } from '$lib/server/attempts';
import { requireRole } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import type { Actions, PageServerLoad } from './$types';

/** Course test attempts per trainee, for trainers and registrars. */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer', 'registrar');
	const slug = event.url.searchParams.get('course');
	if (slug && !getCourse(slug)) error(404, 'No such course');
	const attempts = await listAttemptsForStaff(me.id, { courseSlug: slug ?? undefined });
	return {
		course: slug,
		courses: courses.map((c) => ({ slug: c.slug, title: c.title, code: c.code })),
		attempts
	};
};

const retakeSchema = z.object({
	attemptId: z.string().min(1).max(100),
	reason: z
		.string({ error: 'Say in a few words why the wait is lifted: it goes into the audit log.' })
		.trim()
		.min(5, 'Say in a few words why the wait is lifted: it goes into the audit log.')
		.max(500, 'At most 500 characters.')
		// Control characters would garble the audit log and its CSV.
		.refine((r) => !/[\u0000-\u0008\u000b-\u001f\u007f]/.test(r), 'Remove the control characters.'),
	confirm: z.literal('yes', { error: 'Tick the box to confirm.' })
});

export const actions: Actions = {
	/** Lifts the waiting time after a failed attempt; recorded in the audit log. */
	allowRetake: async (event) => {
		const me = requireRole(event, 'trainer', 'registrar');
		const parsed = await parseForm(event.request, retakeSchema);
		if (!parsed.ok) return parsed.failure;
		const out = await waiveWait(me.id, parsed.data.attemptId, parsed.data.reason);
		if (!out.ok) return failWith(out.status, parsed.form, out.message);
		const course = getCourse(out.courseSlug)?.title ?? out.courseSlug;
		return { done: `${out.person.name ?? out.person.email} may start the next attempt of ${course} now. Your reason is in the audit log.` };
	}
};
