import { redirect } from '@sveltejs/kit';
import { signOut } from '$lib/server/auth';
import { endSession } from '$lib/server/sessions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	// The server-side session ends first, so the cookie is worthless even if the browser keeps it.
	default: async (event) => {
		if (event.locals.sessionId) await endSession(event.locals.sessionId, 'sign-out');
		return signOut(event);
	}
};
