import { redirect } from '@sveltejs/kit';
import { signUpSchema } from '$lib/forms';
import { sendAddressConfirmation } from '$lib/server/address-confirmation';
import { recordAudit } from '$lib/server/audit';
import { failWith, parseForm } from '$lib/server/form';
import { hit, scaledLimit } from '$lib/server/rate-limit';
import { requestContext } from '$lib/server/request-context';
import { startSignIn } from '$lib/server/sign-in';
import { countLinkMail, waitMinutes } from '$lib/server/sign-in-checks';
import { EmailTakenError, signUp } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	if (locals.user) redirect(303, '/dashboard');
};

export const actions: Actions = {
	default: async (event) => {
		const parsed = await parseForm(event.request, signUpSchema);
		if (!parsed.ok) return parsed.failure;
		const { name, email, password } = parsed.data;
		if (!(await hit('sign-up-ip', event.getClientAddress(), scaledLimit(20), 60 * 60 * 1000)).ok) {
			return failWith(429, parsed.form, 'Too many new accounts from this network. Try again in an hour.');
		}
		let user: Awaited<ReturnType<typeof signUp>>;
		try {
			user = await signUp({ name, email, password });
		} catch (e) {
			if (e instanceof EmailTakenError) {
				return failWith(409, parsed.form, e.message, { email: 'This address already has an account: sign in instead.' });
			}
			throw e;
		}
		if (user.isNew) await recordAudit({ actorId: user.id, action: 'user.sign-up', subjectType: 'user', subjectId: user.id });
		const mail = await countLinkMail(email, requestContext());
		if (!mail.ok) {
			return failWith(429, parsed.form, `Too many e-mails asked for this address. Wait ${waitMinutes(mail.retryAfterSeconds)} and sign in with an e-mail link.`);
		}
		if (!password) return startSignIn(event, { providerId: 'nodemailer', email, redirectTo: '/dashboard' });
		await sendAddressConfirmation(user, event.url.origin);
		redirect(303, '/sign-up/check-email');
	}
};
