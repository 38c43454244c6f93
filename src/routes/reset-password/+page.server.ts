import { resetRequestSchema } from '$lib/forms';
import { failWith, parseForm } from '$lib/server/form';
import { requestPasswordReset } from '$lib/server/password-reset';
import { hit } from '$lib/server/rate-limit';
import type { Actions } from './$types';

export const actions: Actions = {
	default: async (event) => {
		const parsed = await parseForm(event.request, resetRequestSchema);
		if (!parsed.ok) return parsed.failure;
		const { email } = parsed.data;
		if (!hit('reset-email', email, 3, 60 * 60 * 1000).ok || !hit('reset-ip', event.getClientAddress(), 30, 60 * 60 * 1000).ok) {
			return failWith(429, parsed.form, 'Too many reset requests. Wait an hour and try again.');
		}
		await requestPasswordReset(email, event.url.origin);
		return { sent: true, email };
	}
};
