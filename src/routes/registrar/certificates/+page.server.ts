import { z } from 'zod';
import { requireRole } from '$lib/server/authz';
import { listCertificatesForRegistrar, listWaitingForOne, reissueWithName, revocationReasons, revokeCertificate } from '$lib/server/certificates';
import { failWith, parseForm } from '$lib/server/form';
import type { Actions, PageServerLoad } from './$types';

const numberField = z.string().trim().min(1, 'Give the certificate number.').max(64);
const revokeSchema = z.object({
	number: numberField,
	reason: z.enum(Object.keys(revocationReasons) as [keyof typeof revocationReasons, ...(keyof typeof revocationReasons)[]], { message: 'Choose a reason.' }),
	note: z.string().max(500, 'Keep the note under 500 characters.').default('')
});
const reissueSchema = z.object({
	number: numberField,
	name: z
		.string()
		.trim()
		.min(2, 'Give the corrected name.')
		.max(120, 'A name is at most 120 characters.')
		.refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'The name has characters that cannot be printed.')
});

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 100);
	const [certificates, waiting] = await Promise.all([listCertificatesForRegistrar(q), listWaitingForOne()]);
	return { q, certificates, waiting, reasons: revocationReasons };
};

export const actions: Actions = {
	revoke: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, revokeSchema);
		if (!parsed.ok) return parsed.failure;
		const outcome = await revokeCertificate(me.id, parsed.data.number, parsed.data.reason, parsed.data.note);
		if (!outcome.ok) return failWith(outcome.status, parsed.form, outcome.message);
		return { done: `Certificate ${outcome.certificate.number} revoked.` };
	},
	reissue: async (event) => {
		const me = requireRole(event, 'registrar');
		const parsed = await parseForm(event.request, reissueSchema);
		if (!parsed.ok) return parsed.failure;
		const outcome = await reissueWithName(me.id, parsed.data.number, parsed.data.name);
		if (!outcome.ok) return failWith(outcome.status, parsed.form, outcome.message);
		return { done: `Re-issued as ${outcome.certificate.number} for ${outcome.certificate.holder_name}; the old number now answers "replaced".` };
	}
};
