import { requireRole } from '$lib/server/authz';
import type { LayoutServerLoad } from './$types';

// Each page and action below checks again; this only keeps the section's shared data safe.
export const load: LayoutServerLoad = (event) => {
	requireRole(event, 'registrar');
};
