import { redirect } from '@sveltejs/kit';
import { magicLinkSchema, signInSchema } from '$lib/forms';
import { failWith, parseForm } from '$lib/server/form';
import { requestContext } from '$lib/server/request-context';
import { safeNext, startSignIn } from '$lib/server/sign-in';
import { countLinkMail, verifySignIn, waitMinutes } from '$lib/server/sign-in-checks';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'), url.origin);
	if (locals.user) redirect(303, next);
	return { next };
};

export const actions: Actions = {
	password: async (event) => {
		const parsed = await parseForm(event.request, signInSchema);
		if (!parsed.ok) return parsed.failure;
		const { email, password } = parsed.data;
		// Checked (and counted) here as well as in Auth.js's authorize(), which then trusts this
		// request's verdict: Auth.js answers a refusal only with a redirect to its error page, and
		// the person should see the message on this form.
		const verdict = await verifySignIn(email, password, requestContext());
		if (verdict.outcome === 'limited') {
			return failWith(429, parsed.form, `Too many sign-in attempts. Wait ${waitMinutes(verdict.retryAfterSeconds)} and try again, or reset your password.`);
		}
		if (verdict.outcome === 'unconfirmed') {
			return failWith(403, parsed.form, 'This address is not confirmed yet. Follow the link in the e-mail we sent when the account was created, or sign in with an e-mail link below.');
		}
		if (verdict.outcome === 'wrong') {
			return failWith(400, parsed.form, 'That e-mail address and password do not match an account.', {
				password: 'Check the password, or sign in with an e-mail link instead.'
			});
		}
		return startSignIn(event, { providerId: 'credentials', email, password, redirectTo: safeNext(event.url.searchParams.get('next'), event.url.origin) });
	},
	link: async (event) => {
		const parsed = await parseForm(event.request, magicLinkSchema);
		if (!parsed.ok) return parsed.failure;
		const limited = await countLinkMail(parsed.data.email, requestContext());
		if (!limited.ok) {
			return failWith(429, parsed.form, `Too many sign-in links asked for. Wait ${waitMinutes(limited.retryAfterSeconds)} and try again.`);
		}
		return startSignIn(event, { providerId: 'nodemailer', email: parsed.data.email, redirectTo: safeNext(event.url.searchParams.get('next'), event.url.origin) });
	}
};
