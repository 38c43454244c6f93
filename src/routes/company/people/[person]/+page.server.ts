import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { hasRole } from '$lib/roles';
import { requireUser } from '$lib/server/authz';
import { crewRecord, mayOpenCrewRecords, mayViewCrewRecord } from '$lib/server/crew-record';
import type { PageServerLoad } from './$types';

const personId = z.uuid();

export const load: PageServerLoad = async (event) => {
	const viewer = requireUser(event);
	if (!mayOpenCrewRecords(viewer)) error(403, 'Only a company admin or a trainer can see a crew member’s record.');
	const id = personId.safeParse(event.params.person);
	if (!id.success) error(404, 'Not found');
	const access = await mayViewCrewRecord(viewer, id.data);
	if (!access.ok) error(404, 'Not found');
	const record = await crewRecord(id.data);
	if (!record) error(404, 'Not found');
	const wanted = event.url.searchParams.get('c');
	const backTo = viewer.companies.find((c) => c.role === 'admin' && c.id === wanted) ?? null;
	return {
		...record,
		// certificate files open for company admins and registrars (see certificate-access), review pages for trainers
		mayDownload: access.asAdmin || hasRole(viewer, 'registrar'),
		mayReviewAttempts: hasRole(viewer, 'trainer') || hasRole(viewer, 'registrar'),
		board: access.asAdmin ? `/company/board${backTo ? `?c=${backTo.id}` : ''}` : null
	};
};
