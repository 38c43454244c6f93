import { redirect } from '@sveltejs/kit';
import { confirmAddress, isConfirmationUsable } from '$lib/server/address-confirmation';
import { failWith } from '$lib/server/form';
import type { Actions, PageServerLoad } from './$types';

// Opening the link only shows a button: mail scanners fetch links, and only a person should confirm.
export const load: PageServerLoad = async ({ params }) => ({
	usable: await isConfirmationUsable(params.token)
});

export const actions: Actions = {
	default: async ({ params }) => {
		if (!(await confirmAddress(params.token))) {
			return failWith(400, null, 'This confirmation link has expired or was already used. Sign in with an e-mail link instead.');
		}
		redirect(303, '/sign-in?confirmed=1');
	}
};
