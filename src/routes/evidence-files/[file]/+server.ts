import { error } from '@sveltejs/kit';
import { Readable } from 'node:stream';
import { requireUser } from '$lib/server/authz';
import { evidenceFileFor } from '$lib/server/sign-offs';
import { fileStore, StorageUnavailableError } from '$lib/server/storage';
import type { RequestHandler } from './$types';

/**
 * An evidence file (or its thumbnail with ?size=thumb), only for those who may see the
 * trainee's evidence; anyone else gets the same 404 as for an unknown id. Served with the
 * stored type, never sniffed by the browser, and unable to run script.
 */
export const GET: RequestHandler = async (event) => {
	const me = requireUser(event);
	const file = await evidenceFileFor(event.params.file, me);
	if (!file) error(404, 'No such file.');
	const thumb = event.url.searchParams.get('size') === 'thumb' && file.thumbnailKey;
	const key = thumb ? file.thumbnailKey! : file.storageKey;
	const object = await fileStore()
		.get(key)
		.catch((err) => {
			if (!(err instanceof StorageUnavailableError)) throw err;
			console.error(err.message);
			error(503, StorageUnavailableError.readerMessage);
		});
	if (!object) {
		console.error(`Evidence file ${event.params.file}: stored object ${key} is missing`);
		error(404, 'This file is recorded but missing from storage. Ask the training provider to restore it.');
	}
	const type = thumb ? 'image/jpeg' : file.mediaType;
	const asciiName = file.originalName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
	const disposition = type === 'application/pdf' ? 'attachment' : 'inline';
	return new Response(Readable.toWeb(object.body) as ReadableStream, {
		headers: {
			'content-type': type,
			'content-length': String(object.sizeBytes),
			'x-content-type-options': 'nosniff',
			'content-disposition': `${disposition}; filename="${asciiName}"; filename*=UTF-8''${encodeURIComponent(file.originalName)}`,
			'content-security-policy': "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
			'cache-control': 'private, max-age=300',
			'cross-origin-resource-policy': 'same-origin'
		}
	});
};
