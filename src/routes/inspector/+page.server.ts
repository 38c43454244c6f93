import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { recentCrewChecks, runCrewCheck } from '$lib/server/crew-checks';
import type { Actions, PageServerLoad } from './$types';

const MAX_LIST_BYTES = 64 * 1024;

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'inspector');
	return { checks: await recentCrewChecks(user.id, 20) };
};

export const actions: Actions = {
	/** A pasted list and/or an uploaded CSV or text file of certificate numbers, up to 200. */
	check: async (event) => {
		const user = requireRole(event, 'inspector');
		let form: FormData;
		try {
			form = await event.request.formData();
		} catch {
			return fail(400, { message: 'The form could not be read.', numbers: '', label: '' });
		}
		const pasted = String(form.get('numbers') ?? '').slice(0, MAX_LIST_BYTES);
		const label = String(form.get('label') ?? '').replace(/[\u0000-\u001f\u007f]/g, ' ').slice(0, 120);
		const file = form.get('file');
		let fromFile = '';
		if (file instanceof File && file.size > 0) {
			if (file.size > MAX_LIST_BYTES) return fail(400, { message: 'That file is too large for a crew list (64 KB at most).', numbers: pasted, label });
			fromFile = await file.text();
		}
		const outcome = await runCrewCheck(user.id, `${pasted}\n${fromFile}`, label);
		if (!outcome.ok) return fail(400, { message: outcome.message, numbers: pasted, label });
		redirect(303, `/inspector/checks/${outcome.id}`);
	}
};
