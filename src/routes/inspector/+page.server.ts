import { requireRole } from '$lib/server/authz';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requireRole(event, 'inspector');
};
