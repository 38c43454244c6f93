import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { email as emailField } from '$lib/forms';
import { courses } from '$lib/content';
import { requireCompanyAdmin } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { checkInvitations, courseRefs, inviteCrew, listOpenInvitations, rowsFromInput, withdrawInvitation } from '$lib/server/invitations';
import { listAssignedSeats, renewalSeatLedger, seatLedger, takeBackSeat } from '$lib/server/seats';
import { crewExpiringSoon } from '$lib/server/renewals';
import { MAX_ROSTER_BYTES, parseRoster } from '$lib/roster';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

/** The company named by `?c=` (or the first the person runs), for its admins only. */
function companyFor(event: RequestEvent | Parameters<PageServerLoad>[0]) {
	const user = requireCompanyAdmin(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const wanted = event.url.searchParams.get('c');
	const company = wanted ? adminOf.find((c) => c.id === wanted) : adminOf[0];
	if (!company) error(403, 'Only a company admin can manage these seats.');
	return { user, company, adminOf };
}

export const load: PageServerLoad = async (event) => {
	const { company, adminOf } = companyFor(event);
	const [ledger, seats, invitations, renewalSeats, expiring] = await Promise.all([
		seatLedger(company.id),
		listAssignedSeats(company.id),
		listOpenInvitations(company.id),
		renewalSeatLedger(company.id),
		crewExpiringSoon(company.id, { days: 90 })
	]);
	const title = (slug: string) => courses.find((c) => c.slug === slug)?.title ?? slug;
	return {
		company: { id: company.id, name: company.name },
		companies: adminOf.map((c) => ({ id: c.id, name: c.name })),
		ledger,
		seats: seats.map((s) => ({ id: s.id, course: title(s.course_slug), name: s.holder_name, email: s.holder_email, inUse: !!s.used_at, assignedAt: s.assigned_at })),
		invitations: invitations.map((i) => ({ id: i.id, name: i.name, email: i.email, course: title(i.course_slug), expiresAt: i.expires_at })),
		courses: courses.map((c) => ({ slug: c.slug, title: c.title, code: c.code })),
		renewalSeats,
		expiring: expiring.map((e) => ({ userId: e.userId, name: e.name ?? e.email, courseCode: e.courseCode, expiresOn: e.expiresOn, daysLeft: e.daysLeft }))
	};
};

const inviteSchema = z.object({
	name: z.string({ error: 'Enter a name.' }).trim().min(1, 'Enter a name.').max(120, 'Use at most 120 characters.'),
	email: emailField,
	course: z.string().trim().min(1, 'Choose a course.').max(100)
});

async function rosterText(form: FormData): Promise<string | null> {
	const file = form.get('file');
	if (file instanceof File && file.size > 0) return file.size > MAX_ROSTER_BYTES ? null : await file.text();
	const text = form.get('roster');
	return typeof text === 'string' ? text : '';
}

export const actions: Actions = {
	invite: async (event) => {
		const { user, company } = companyFor(event);
		const parsed = await parseForm(event.request, inviteSchema);
		if (!parsed.ok) return parsed.failure;
		const result = await inviteCrew(user.id, company.id, rowsFromInput([parsed.data]), event.url.origin);
		if (!result.ok) return failWith(409, parsed.form, result.rows[0].errors[0] ?? 'The invitation could not be sent.');
		return { invited: `Invitation sent to ${parsed.data.email}.` };
	},
	preview: async (event) => {
		const { company } = companyFor(event);
		const form = await event.request.formData().catch(() => null);
		if (!form) return failWith(400, null, 'The form could not be read.');
		const text = await rosterText(form);
		if (text === null) return failWith(413, null, 'The file is larger than 2 MB.');
		if (!text.trim()) return failWith(400, null, 'Choose a CSV file or paste the roster.');
		const parsed = parseRoster(text, courseRefs);
		if (parsed.problems.length) return failWith(400, null, parsed.problems.join(' '));
		const rows = await checkInvitations(company.id, parsed.rows);
		// The roster goes back with the preview so that "Send" submits exactly what was checked.
		return { preview: { rows: rows.slice(0, 5000), roster: text, bad: rows.filter((r) => r.errors.length).length } };
	},
	send: async (event) => {
		const { user, company } = companyFor(event);
		const form = await event.request.formData().catch(() => null);
		const text = form ? await rosterText(form) : null;
		if (!text) return failWith(400, null, 'There is no roster to send.');
		const parsed = parseRoster(text, courseRefs);
		if (parsed.problems.length) return failWith(400, null, parsed.problems.join(' '));
		const result = await inviteCrew(user.id, company.id, parsed.rows, event.url.origin);
		if (!result.ok) return { preview: { rows: result.rows, roster: text, bad: result.rows.filter((r) => r.errors.length).length } };
		return { invited: `${result.sent.length} ${result.sent.length === 1 ? 'invitation' : 'invitations'} sent.` };
	},
	takeBack: async (event) => {
		const { user, company } = companyFor(event);
		const parsed = await parseForm(event.request, z.object({ seat: z.uuid() }));
		if (!parsed.ok) return parsed.failure;
		const result = await takeBackSeat(user.id, company.id, parsed.data.seat);
		if (!result.ok) return failWith(409, null, result.message);
		return { invited: 'Seat taken back: it is free to invite someone else.' };
	},
	withdraw: async (event) => {
		const { user, company } = companyFor(event);
		const parsed = await parseForm(event.request, z.object({ invitation: z.uuid() }));
		if (!parsed.ok) return parsed.failure;
		if (!(await withdrawInvitation(user.id, company.id, parsed.data.invitation))) return failWith(409, null, 'That invitation is no longer open.');
		return { invited: 'Invitation withdrawn: its seat is free again.' };
	}
};
