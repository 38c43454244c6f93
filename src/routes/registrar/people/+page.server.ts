import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { enrolSchema, personSchema, roleChangeSchema, trainerScopeSchema } from '$lib/server/role-forms';
import { signOutEverywhere } from '$lib/server/sessions';
import { enrol, enrolmentsByUser } from '$lib/server/enrolments';
import { courses } from '$lib/content';
import { listCompanies } from '$lib/server/companies';
import { grantRole, loadIdentity, revokeRole, rolesByUser, setTrainerScope } from '$lib/server/roles';
import { trainerCompanies } from '$lib/server/trainer-scope';
import { searchUsers } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 100);
	const found = await searchUsers(q);
	const ids = found.map((p) => p.id);
	const [roles, enrolments, trainerFor, companies] = await Promise.all([rolesByUser(ids), enrolmentsByUser(ids), trainerCompanies(ids), listCompanies()]);
	const people = found.map((p) => ({ ...p, roles: roles.get(p.id)!, enrolments: enrolments.get(p.id)!, trainerCompanyId: trainerFor.get(p.id) ?? null }));
	return { q, people, companies, courses: courses.map((c) => ({ slug: c.slug, title: c.title, code: c.code })) };
};

async function change(event: Parameters<Actions[string]>[0], kind: 'grant' | 'revoke') {
	const me = requireRole(event, 'registrar');
	const parsed = await parseForm(event.request, roleChangeSchema);
	if (!parsed.ok) return parsed.failure;
	const { userId, role } = parsed.data;
	if (!(await loadIdentity(userId))) error(404, 'No such person.');
	if (kind === 'revoke' && userId === me.id && role === 'registrar') {
		return failWith(409, parsed.form, 'You cannot remove your own registrar role: ask another registrar.');
	}
	await (kind === 'grant' ? grantRole(me.id, userId, role) : revokeRole(me.id, userId, role));
	return { done: `${kind === 'grant' ? 'Granted' : 'Removed'} ${role}.` };
}

export const actions: Actions = {
	enrol: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, enrolSchema);
		if (!parsed.ok) return parsed.failure;
		if (!(await loadIdentity(parsed.data.userId))) error(404, 'No such person.');
		await enrol(me.id, parsed.data.userId, parsed.data.course, 'registrar');
		return { done: 'Enrolled.' };
	},
	signOutEverywhere: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, personSchema);
		if (!parsed.ok) return parsed.failure;
		const person = await loadIdentity(parsed.data.userId);
		if (!person) error(404, 'No such person.');
		const ended = await signOutEverywhere(me.id, person.id);
		return { done: `Signed ${person.email} out everywhere (${ended} session${ended === 1 ? '' : 's'} ended).` };
	},
	/** Whose crew a trainer works with: everyone, or one company's crew only. */
	trainerScope: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, trainerScopeSchema);
		if (!parsed.ok) return parsed.failure;
		const { userId, companyId } = parsed.data;
		if (!(await loadIdentity(userId))) error(404, 'No such person.');
		if (!(await setTrainerScope(me.id, userId, companyId || null))) return failWith(400, parsed.form, 'Choose a company from the list.', { companyId: 'No such company' });
		return { done: companyId ? 'This trainer now works with that company’s crew only.' : 'This trainer now works with everyone.' };
	},
	grant: (event) => change(event, 'grant'),
	revoke: (event) => change(event, 'revoke')
};
