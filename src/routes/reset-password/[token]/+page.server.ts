import { redirect } from '@sveltejs/kit';
import { resetPasswordSchema } from '$lib/forms';
import { failWith, parseForm } from '$lib/server/form';
import { isResetTokenUsable, resetPassword } from '$lib/server/password-reset';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => ({
	usable: await isResetTokenUsable(params.token)
});

export const actions: Actions = {
	default: async ({ request, params }) => {
		const parsed = await parseForm(request, resetPasswordSchema);
		if (!parsed.ok) return parsed.failure;
		if (!(await resetPassword(params.token, parsed.data.password))) {
			return failWith(400, null, 'This reset link has expired or was already used. Ask for a new one.');
		}
		redirect(303, '/sign-in?reset=1');
	}
};
