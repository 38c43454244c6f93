import { json } from '@sveltejs/kit';
import { apiCertificate, chargeLookups, lookUp } from '$lib/server/verification';
import type { RequestHandler } from './$types';

const notFound = { error: { code: 'not_found', message: 'No certificate has this number.' } };

/** One certificate's public status. No sign-in; limited per address; 404 looks the same for malformed and unknown numbers. */
export const GET: RequestHandler = async (event) => {
	const wait = await chargeLookups(event.getClientAddress());
	if (wait) return json({ error: { code: 'rate_limited', message: `Too many look-ups from this address. Try again in ${wait} s.` } }, { status: 429, headers: { 'Retry-After': String(wait) } });
	const found = await lookUp(event.params.number);
	const headers = { 'Cache-Control': 'no-store' };
	return found ? json(apiCertificate(found), { headers }) : json(notFound, { status: 404, headers });
};
