import { requireRole } from '$lib/server/authz';
import { queueCount } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer');
	return { practicalQueue: await queueCount(me.id) };
};
