import { redirect } from '@sveltejs/kit';
import { magicLinkSchema, signInSchema } from '$lib/forms';
import { failWith, parseForm } from '$lib/server/form';
import { forgetSignInAttempts, limitSignIn, safeNext, startSignIn } from '$lib/server/sign-in';
import { checkPassword } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next')));
	return { next: safeNext(url.searchParams.get('next')) };
};

export const actions: Actions = {
	password: async (event) => {
		const parsed = await parseForm(event.request, signInSchema);
		if (!parsed.ok) return parsed.failure;
		const { email, password } = parsed.data;
		const limited = limitSignIn(event, email);
		if (limited) return failWith(429, parsed.form, limited);
		// Checked here as well as in Auth.js's authorize(): Auth.js answers a wrong password only
		// with a redirect to its error page, and the person should see the message on this form.
		if (!(await checkPassword(email, password))) {
			return failWith(400, parsed.form, 'That e-mail address and password do not match an account.', {
				password: 'Check the password, or sign in with an e-mail link instead.'
			});
		}
		forgetSignInAttempts(email);
		return startSignIn(event, { providerId: 'credentials', email, password, redirectTo: safeNext(event.url.searchParams.get('next')) });
	},
	link: async (event) => {
		const parsed = await parseForm(event.request, magicLinkSchema);
		if (!parsed.ok) return parsed.failure;
		const limited = limitSignIn(event, parsed.data.email);
		if (limited) return failWith(429, parsed.form, limited);
		return startSignIn(event, { providerId: 'nodemailer', email: parsed.data.email, redirectTo: safeNext(event.url.searchParams.get('next')) });
	}
};
