import { config } from '$lib/server/config';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => ({
	user: locals.user,
	fakeInboxUrl: config.fakeInboxUrl,
	fakePaymentsUrl: config.fakePaymentsUrl
});
