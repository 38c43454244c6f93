import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { enrolSchema, roleChangeSchema } from '$lib/server/role-forms';
import { enrol, enrolmentsByUser } from '$lib/server/enrolments';
import { courses } from '$lib/content';
import { roleLabels } from '$lib/roles';
import { grantRole, loadIdentity, revokeRole, rolesByUser } from '$lib/server/roles';
import { searchUsers } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'registrar');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 100);
	const found = await searchUsers(q);
	const ids = found.map((p) => p.id);
	const [roles, enrolments] = await Promise.all([rolesByUser(ids), enrolmentsByUser(ids)]);
	const people = found.map((p) => ({ ...p, roles: roles.get(p.id)!, enrolments: enrolments.get(p.id)! }));
	return { q, me: me.id, people, courses: courses.map((c) => ({ slug: c.slug, title: c.title, code: c.code })) };
};

async function change(event: Parameters<Actions[string]>[0], kind: 'grant' | 'revoke') {
	const me = requireRole(event, 'registrar');
	const parsed = await parseForm(event.request, roleChangeSchema);
	if (!parsed.ok) return parsed.failure;
	const { userId, role } = parsed.data;
	const person = await loadIdentity(userId);
	if (!person) error(404, 'No such person.');
	if (kind === 'revoke' && userId === me.id && role === 'registrar') {
		return failWith(409, parsed.form, 'You cannot remove your own registrar role: ask another registrar.');
	}
	await (kind === 'grant' ? grantRole(me.id, userId, role) : revokeRole(me.id, userId, role));
	const whom = person.name ? `${person.name} (${person.email})` : person.email;
	const label = roleLabels[role].toLowerCase();
	return { done: kind === 'grant' ? `Granted the ${label} role to ${whom}.` : `Removed the ${label} role from ${whom}.` };
}

export const actions: Actions = {
	enrol: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, enrolSchema);
		if (!parsed.ok) return parsed.failure;
		const person = await loadIdentity(parsed.data.userId);
		if (!person) error(404, 'No such person.');
		await enrol(me.id, parsed.data.userId, parsed.data.course, 'registrar');
		const course = courses.find((c) => c.slug === parsed.data.course)?.title ?? parsed.data.course;
		return { done: `Enrolled ${person.name ?? person.email} in ${course}.` };
	},
	grant: (event) => change(event, 'grant'),
	revoke: (event) => change(event, 'revoke')
};
