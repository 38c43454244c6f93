import { gzipSync } from 'node:zlib';
import Negotiator from 'negotiator';

/**
 * Compression for answers stored once and sent many times (lesson pages): compressed when
 * stored, so each request only picks the right bytes. adapter-node compresses only the static
 * files it was built with; a lesson page of 80 KB goes to a phone on site as about a fifth of it.
 */

/** Whether the Accept-Encoding header takes gzip (RFC 9110 §12.5.3, q=0 refuses it), read by `negotiator`. */
export function acceptsGzip(acceptEncoding: string | undefined): boolean {
	if (!acceptEncoding) return false;
	return new Negotiator({ headers: { 'accept-encoding': acceptEncoding } }).encodings(['gzip'])[0] === 'gzip';
}

/** gzip at zlib's default level: done once per stored answer. */
export const gzipOnce = (bytes: Uint8Array): Uint8Array => gzipSync(bytes);
