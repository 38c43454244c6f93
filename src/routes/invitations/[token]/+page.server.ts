import { error, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { getCourse } from '$lib/content';
import { newPassword } from '$lib/forms';
import { requireUser } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { acceptInvitation, findInvitation } from '$lib/server/invitations';
import { recordAudit } from '$lib/server/audit';
import { startSignIn } from '$lib/server/sign-in';
import { verifySignIn, waitMinutes } from '$lib/server/sign-in-checks';
import { requestContext } from '$lib/server/request-context';
import { createUser, EmailTakenError, findUserByEmail } from '$lib/server/users';
import type { Actions, PageServerLoad } from './$types';

/**
 * Accepting a seat from the invitation e-mail: the person signs up (the link confirms their
 * address) or signs in, joins the company as crew and is enrolled. The link works once.
 */
async function invitationOr404(token: string) {
	const invitation = await findInvitation(token);
	if (!invitation) error(404, 'This invitation link is not valid. Check that the whole link was copied.');
	return invitation;
}

export const load: PageServerLoad = async ({ params, locals }) => {
	const invitation = await invitationOr404(params.token);
	const course = getCourse(invitation.course_slug);
	return {
		invitation: {
			email: invitation.email,
			name: invitation.name,
			company: invitation.company_name,
			course: { slug: invitation.course_slug, title: course?.title ?? invitation.course_slug, code: course?.code ?? '' },
			expiresAt: invitation.expires_at,
			unusable: invitation.unusable
		},
		hasAccount: !!(await findUserByEmail(invitation.email)),
		signedInAs: locals.user?.email ?? null
	};
};

const signUpHere = z.object({
	name: z.string({ error: 'Enter your name.' }).trim().min(1, 'Enter your name.').max(120, 'Use at most 120 characters.'),
	password: newPassword
});
const signInHere = z.object({ password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200) });

export const actions: Actions = {
	accept: async (event) => {
		const user = requireUser(event);
		const result = await acceptInvitation(event.params.token, user.id);
		if (!result.ok) return failWith(409, null, result.message);
		redirect(303, `/courses/${result.courseSlug}?welcome=1`);
	},
	signup: async (event) => {
		const invitation = await invitationOr404(event.params.token);
		if (invitation.unusable) return failWith(409, null, invitation.unusable);
		const parsed = await parseForm(event.request, signUpHere);
		if (!parsed.ok) return parsed.failure;
		let userId: string;
		try {
			userId = (await createUser({ email: invitation.email, name: parsed.data.name, password: parsed.data.password, emailVerified: true })).id;
			await recordAudit({ actorId: userId, action: 'user.sign-up', subjectType: 'user', subjectId: userId, detail: { via: 'invitation' } });
		} catch (e) {
			if (e instanceof EmailTakenError) return failWith(409, parsed.form, 'This address already has an account: sign in below instead.');
			throw e;
		}
		const result = await acceptInvitation(event.params.token, userId);
		if (!result.ok) return failWith(409, parsed.form, `Your account is ready, but: ${result.message}`);
		return startSignIn(event, { providerId: 'credentials', email: invitation.email, password: parsed.data.password, redirectTo: `/courses/${result.courseSlug}?welcome=1` });
	},
	signin: async (event) => {
		const invitation = await invitationOr404(event.params.token);
		if (invitation.unusable) return failWith(409, null, invitation.unusable);
		const parsed = await parseForm(event.request, signInHere);
		if (!parsed.ok) return parsed.failure;
		const verdict = await verifySignIn(invitation.email, parsed.data.password, requestContext());
		if (verdict.outcome === 'limited') return failWith(429, parsed.form, `Too many sign-in attempts. Wait ${waitMinutes(verdict.retryAfterSeconds)} and try again, or reset your password.`);
		// An account whose address was never confirmed: this link confirms it, but only with the right password.
		if (verdict.outcome === 'wrong') return failWith(400, parsed.form, 'That password does not match the account.', { password: 'Check the password, or reset it from the sign-in page.' });
		const userId = verdict.outcome === 'ok' ? verdict.user.id : (await findUserByEmail(invitation.email))!.id;
		const result = await acceptInvitation(event.params.token, userId);
		if (!result.ok) return failWith(409, parsed.form, result.message);
		return startSignIn(event, { providerId: 'credentials', email: invitation.email, password: parsed.data.password, redirectTo: `/courses/${result.courseSlug}?welcome=1` });
	}
};
