import { json } from '@sveltejs/kit';
import { publishedJwks } from '$lib/server/credential';
import type { RequestHandler } from './$types';

/** The issuer's public signing key (RFC 7517 JWK Set), for checking certificate credentials. */
export const GET: RequestHandler = async () =>
	json(await publishedJwks(), { headers: { 'Cache-Control': 'public, max-age=300', 'Access-Control-Allow-Origin': '*' } });
