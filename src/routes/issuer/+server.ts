import { json } from '@sveltejs/kit';
import { issuerProfile } from '$lib/server/credential';
import type { RequestHandler } from './$types';

/** The issuer profile (OB 3.0 `Profile`) that every credential's `issuer.id` names. */
export const GET: RequestHandler = async () =>
	json(await issuerProfile(), { headers: { 'Cache-Control': 'public, max-age=300', 'Access-Control-Allow-Origin': '*', 'Content-Type': 'application/ld+json' } });
