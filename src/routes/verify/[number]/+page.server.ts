import { error } from '@sveltejs/kit';
import { parseNumber } from '$lib/certificates/number';
import { findCertificate } from '$lib/server/certificates';
import { chargeLookups } from '$lib/server/verification';
import type { PageServerLoad } from './$types';

/** The answer page a certificate's QR code opens. No sign-in; limited per address like the API. */
export const load: PageServerLoad = async (event) => {
	const wait = await chargeLookups(event.getClientAddress());
	if (wait) error(429, `Too many checks from this address. Try again in ${wait} s.`);
	event.setHeaders({ 'Cache-Control': 'no-store' });
	const input = event.params.number.slice(0, 64);
	const parsed = parseNumber(input);
	if (!parsed.ok) return { number: input, problem: parsed.message, certificate: null };
	return { number: parsed.formatted, problem: null, certificate: await findCertificate(parsed.formatted) };
};
