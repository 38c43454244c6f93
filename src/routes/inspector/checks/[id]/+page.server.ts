import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { getCrewCheck } from '$lib/server/crew-checks';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'inspector');
	const check = await getCrewCheck(user.id, event.params.id);
	if (!check) error(404, 'Not found');
	return { check };
};
