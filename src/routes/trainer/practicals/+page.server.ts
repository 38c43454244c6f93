import { courses } from '$lib/content';
import { requireRole } from '$lib/server/authz';
import { assessmentQueue, queueCompanies, queueFilterSchema } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

/** Evidence waiting for assessment in the trainer's scope, oldest first, with filters. */
export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'trainer');
	const filter = queueFilterSchema.parse(Object.fromEntries(event.url.searchParams));
	const [queue, companies] = await Promise.all([assessmentQueue(me.id, filter), queueCompanies(me.id)]);
	return {
		queue,
		filter,
		companies,
		courses: courses.map((c) => ({ slug: c.slug, title: c.title }))
	};
};
