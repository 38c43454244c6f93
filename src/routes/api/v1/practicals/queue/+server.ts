import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { assessmentQueue, queueFilterSchema } from '$lib/server/sign-offs';
import type { RequestHandler } from './$types';

/** Evidence waiting for the calling trainer, oldest first. Filters: `course`, `company`, `olderThanDays`. */
export const GET: RequestHandler = async (event) => {
	const me = requireRole(event, 'trainer');
	const filter = queueFilterSchema.parse(Object.fromEntries(event.url.searchParams));
	const queue = await assessmentQueue(me.id, filter);
	return json({ count: queue.length, items: queue.map(({ traineeEmail: _e, ...rest }) => rest) });
};
