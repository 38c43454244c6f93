import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { listEnrolledProgress } from '$lib/server/progress';
import type { RequestHandler } from './$types';

/** The signed-in person's enrolled courses with lessons done and where to carry on. */
export const GET: RequestHandler = async (event) => {
	const user = requireUser(event);
	return json({ courses: await listEnrolledProgress(user.id) });
};
