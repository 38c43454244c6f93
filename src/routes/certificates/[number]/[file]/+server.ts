import { Readable } from 'node:stream';
import { error } from '@sveltejs/kit';
import { decodeJwt } from 'jose';
import { requireUser } from '$lib/server/authz';
import { certificateByNumber } from '$lib/server/certificates';
import { IssuedFileMissingError, openIssuedDocument } from '$lib/server/certificate-documents';
import { mayDownload } from '$lib/server/certificate-access';
import { StorageUnavailableError } from '$lib/server/storage';
import type { RequestHandler } from './$types';

const pdfFormats = { 'a4.pdf': 'a4', 'letter.pdf': 'letter', 'card.pdf': 'card' } as const;

/** The holder's certificate files: PDFs (A4, US Letter, wallet card) and the credential as JWT or JSON. */
export const GET: RequestHandler = async (event) => {
	const user = requireUser(event);
	const row = await certificateByNumber(event.params.number);
	if (!row || !(await mayDownload(user, row))) error(404, 'Not found');
	const file = event.params.file;
	const base = `certificate-${row.number}`;
	const headers = (type: string, name: string) => ({ 'Content-Type': type, 'Content-Disposition': `attachment; filename="${name}"`, 'Cache-Control': 'private, no-store' });
	if (Object.hasOwn(pdfFormats, file)) {
		const format = pdfFormats[file as keyof typeof pdfFormats];
		const document = await openIssuedDocument(row, format).catch((err) => {
			if (err instanceof IssuedFileMissingError) {
				console.error(err.message);
				error(404, 'The issued PDF of this certificate is missing from storage. The certificate itself stands; ask the training provider to restore the file.');
			}
			if (err instanceof StorageUnavailableError) {
				console.error(err.message);
				error(503, StorageUnavailableError.readerMessage);
			}
			throw err;
		});
		return new Response(Readable.toWeb(document.body) as ReadableStream, {
			headers: { ...headers('application/pdf', `${base}-${format}.pdf`), 'Content-Length': String(document.sizeBytes) }
		});
	}
	if (file === 'credential.jwt') return new Response(row.credential_jwt, { headers: headers('application/jwt', `${base}.jwt`) });
	if (file === 'credential.json') {
		return new Response(JSON.stringify(decodeJwt(row.credential_jwt), null, 2), { headers: headers('application/json', `${base}.json`) });
	}
	error(404, 'Not found');
};
