import { resetRequestSchema } from '$lib/forms';
import { failWith, parseForm } from '$lib/server/form';
import { requestPasswordReset } from '$lib/server/password-reset';
import { hit, scaledLimit } from '$lib/server/rate-limit';
import type { Actions } from './$types';

export const actions: Actions = {
	default: async (event) => {
		const parsed = await parseForm(event.request, resetRequestSchema);
		if (!parsed.ok) return parsed.failure;
		const { email } = parsed.data;
		const byEmail = await hit('reset-email', email, scaledLimit(3), 60 * 60 * 1000);
		const byIp = await hit('reset-ip', event.getClientAddress(), scaledLimit(30), 60 * 60 * 1000);
		if (!byEmail.ok || !byIp.ok) {
			return failWith(429, parsed.form, 'Too many reset requests. Wait an hour and try again.');
		}
		await requestPasswordReset(email, event.url.origin);
		return { sent: true, email };
	}
};
