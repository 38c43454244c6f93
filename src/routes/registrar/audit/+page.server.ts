import { requireRole } from '$lib/server/authz';
import { listAudit } from '$lib/server/audit';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	return { entries: await listAudit({ limit: 200 }) };
};
