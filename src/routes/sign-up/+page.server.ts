import { redirect } from '@sveltejs/kit';
import { signUpSchema } from '$lib/forms';
import { recordAudit } from '$lib/server/audit';
import { failWith, parseForm } from '$lib/server/form';
import { hit } from '$lib/server/rate-limit';
import { startSignIn } from '$lib/server/sign-in';
import { createUser, EmailTakenError } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	if (locals.user) redirect(303, '/dashboard');
};

export const actions: Actions = {
	default: async (event) => {
		const parsed = await parseForm(event.request, signUpSchema);
		if (!parsed.ok) return parsed.failure;
		const { name, email, password } = parsed.data;
		if (!hit('sign-up-ip', event.getClientAddress(), 20, 60 * 60 * 1000).ok) {
			return failWith(429, parsed.form, 'Too many new accounts from this network. Try again in an hour.');
		}
		try {
			const user = await createUser({ name, email, password });
			await recordAudit({ actorId: user.id, action: 'user.sign-up', subjectType: 'user', subjectId: user.id });
		} catch (e) {
			if (e instanceof EmailTakenError) {
				return failWith(409, parsed.form, e.message, { email: 'This address already has an account: sign in instead.' });
			}
			throw e;
		}
		return password
			? startSignIn(event, { providerId: 'credentials', email, password, redirectTo: '/dashboard' })
			: startSignIn(event, { providerId: 'nodemailer', email, redirectTo: '/dashboard' });
	}
};
