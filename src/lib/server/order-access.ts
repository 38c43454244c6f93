import { error, type RequestEvent } from '@sveltejs/kit';
import { requireUser } from './authz';
import { canSeeOrder, getOrder } from './orders';

/** The order named in the URL, for its buyer, its company's admins and registrars; 404 for everyone else. */
export async function requireOrder(event: Pick<RequestEvent, 'locals' | 'url' | 'params'>) {
	const user = requireUser(event);
	const id = (event.params as { order?: string; id?: string }).order ?? (event.params as { id?: string }).id ?? '';
	const order = /^[0-9a-f-]{36}$/.test(id) ? await getOrder(id) : undefined;
	// Someone else's order answers like a missing one, so ids cannot be probed.
	if (!order || !canSeeOrder(user, order)) error(404, 'No such order');
	return { user, order };
}
