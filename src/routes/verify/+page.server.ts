import { fail, redirect } from '@sveltejs/kit';
import { parseNumber } from '$lib/certificates/number';
import { chargeLookups, looksLikePdf, MAX_UPLOAD_BYTES, verifyJwt, verifyPdf } from '$lib/server/verification';
import type { Actions, PageServerLoad } from './$types';

/** `/verify?number=...` (the form without JavaScript) goes to the answer page when the number reads. */
export const load: PageServerLoad = ({ url }) => {
	const typed = url.searchParams.get('number');
	if (typed === null) return { typed: '', problem: null };
	const parsed = parseNumber(typed.slice(0, 64));
	if (parsed.ok) redirect(303, `/verify/${parsed.formatted}`);
	return { typed: typed.slice(0, 64), problem: parsed.message };
};

export const actions: Actions = {
	/** A certificate PDF (checked by hash) or a credential .jwt (checked against the published key). */
	upload: async (event) => {
		let file: FormDataEntryValue | null = null;
		try {
			file = (await event.request.formData()).get('file');
		} catch {
			return fail(400, { uploadProblem: 'The upload could not be read. Choose the file again.' });
		}
		if (!(file instanceof File) || file.size === 0) return fail(400, { uploadProblem: 'Choose a certificate PDF or a .jwt credential file.' });
		if (file.size > MAX_UPLOAD_BYTES) return fail(400, { uploadProblem: 'That file is larger than any certificate we issue (2 MB).' });
		const wait = await chargeLookups(event.getClientAddress());
		if (wait) return fail(429, { uploadProblem: `Too many checks from this address. Try again in ${wait} s.` });
		const bytes = new Uint8Array(await file.arrayBuffer());
		if (looksLikePdf(bytes)) return { verdict: await verifyPdf(bytes) };
		const text = new TextDecoder().decode(bytes).trim();
		if (/^[A-Za-z0-9_-]+\.[A-Za-z0-9_-]*\.[A-Za-z0-9_-]*$/.test(text)) return { verdict: await verifyJwt(text) };
		return fail(400, { uploadProblem: 'That file is neither a certificate PDF nor a .jwt credential.' });
	}
};
