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

const retakeSchema = z.object({ attemptId: z.string().min(1).max(100) });

export const actions: Actions = {
	/** Lifts the waiting time after a failed attempt; recorded in the audit log. */
	allowRetake: async (event) => {
		const me = requireRole(event, 'trainer', 'registrar');
		const parsed = await parseForm(event.request, retakeSchema);
		if (!parsed.ok) return parsed.failure;
		const out = await waiveWait(me.id, parsed.data.attemptId);
		if (!out.ok) return failWith(out.status, parsed.form, out.message);
		return { done: 'The trainee may start the next attempt now.' };
	}
};
