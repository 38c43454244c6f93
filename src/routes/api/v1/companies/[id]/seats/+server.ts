import { json } from '@sveltejs/kit';
import { requireCompanyAdmin } from '$lib/server/authz';
import { listOpenInvitations } from '$lib/server/invitations';
import { listAssignedSeats, seatLedger } from '$lib/server/seats';
import type { RequestHandler } from './$types';

/** The company's seat ledger per course, who holds each assigned seat, and open invitations. */
export const GET: RequestHandler = async (event) => {
	requireCompanyAdmin(event, event.params.id);
	const [ledger, seats, invitations] = await Promise.all([seatLedger(event.params.id), listAssignedSeats(event.params.id), listOpenInvitations(event.params.id)]);
	return json({
		ledger,
		seats: seats.map((s) => ({ id: s.id, courseSlug: s.course_slug, holder: { id: s.holder_id, name: s.holder_name, email: s.holder_email }, assignedAt: s.assigned_at, usedAt: s.used_at, inUse: !!s.used_at })),
		invitations: invitations.map((i) => ({ id: i.id, name: i.name, email: i.email, courseSlug: i.course_slug, createdAt: i.created_at, expiresAt: i.expires_at }))
	});
};
