import http from 'node:http';
import type { AddressInfo } from 'node:net';

/** Status the stand-in for SvelteKit answers with, so a test sees what the front door passed on. */
export const FELL_THROUGH = 299;

/**
 * A real node:http server running one front-door middleware, with a stand-in for SvelteKit
 * behind it (it answers FELL_THROUGH). Returns its base address and a way to close it.
 */
export async function serveMiddleware(
	middleware: (req: http.IncomingMessage, res: http.ServerResponse, next: () => void) => void
): Promise<{ base: string; close: () => Promise<void> }> {
	const server = http.createServer((req, res) =>
		middleware(req, res, () => {
			res.statusCode = FELL_THROUGH;
			res.end('fell through');
		})
	);
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	return {
		base: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
		close: () => new Promise<void>((resolve) => server.close(() => resolve()))
	};
}
