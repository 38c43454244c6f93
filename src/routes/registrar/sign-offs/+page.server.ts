import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/authz';
import { failFrom } from '$lib/server/sign-off-forms';
import { findSkill, signOffsOfPerson, voidSignOff } from '$lib/server/sign-offs';
import { findUserByEmail } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

/** A person's sign-offs, found by e-mail, each with a way to void it with a reason. */
export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	const email = z.string().trim().max(254).catch('').parse(event.url.searchParams.get('email') ?? '');
	if (!email) return { email, person: null, signOffs: [] };
	const person = await findUserByEmail(email);
	if (!person) return { email, person: null, signOffs: [], notFound: true };
	const signOffs = (await signOffsOfPerson(person.id)).map((s) => {
		const found = findSkill(s.courseSlug, s.skillId);
		return { ...s, courseTitle: found?.course.title ?? s.courseSlug, skillTitle: found?.skill.title ?? s.skillId };
	});
	return { email, person: { id: person.id, name: person.name, email: person.email }, signOffs };
};

export const actions: Actions = {
	void: async (event) => {
		const me = requireRole(event, 'registrar');
		const form = await event.request.formData().catch(() => null);
		const id = form?.get('signOff');
		const reason = form?.get('reason');
		if (typeof id !== 'string' || typeof reason !== 'string' || id.length > 64) error(400, 'Which sign-off, and why?');
		try {
			await voidSignOff(id, me.id, reason);
		} catch (err) {
			return failFrom(err, { signOff: id, reason });
		}
		return { voided: id };
	}
};
