import fs from 'node:fs';
import path from 'node:path';

/**
 * adapter-node with one addition to the entry point it writes (`build/index.js`): before polka
 * (adapter-node's router, which defers every request to the next turn of the event loop with
 * setImmediate and then parses its URL), each request goes to the app's front door
 * (src/lib/server/fast-front.ts) when the app has published one; what the front door does not
 * answer goes on to polka and adapter-node's handler exactly as before.
 * The entry point keeps everything else of adapter-node's (settings, socket activation,
 * graceful shutdown). If a new adapter-node writes its entry point differently, the build
 * stops here with a message instead of silently leaving the fast path out.
 */

export const SERVER_LINE = 'polka({ server: httpServer }).use(handler)';

export const FRONT = `
/** Patchwright: the hot JSON routes are answered before SvelteKit builds a Request (src/lib/server/fast-front.ts). */
const fast_front = (req, res, next) => {
	const fast = globalThis[Symbol.for('patchwright.fast-front')];
	return fast ? fast(req, res, next) : next();
};
`;

/**
 * Lines after the server is made: the front door sees each request before polka does. A fault in
 * it must not take the process down (polka would have caught it): the request then goes on to
 * polka, unless the front door had already passed it on or begun the answer.
 */
export const FRONT_FIRST = `
const polka_attach = server.attach;
server.attach = (req, res) => {
	let passed = false;
	const next = () => {
		passed = true;
		polka_attach(req, res);
	};
	try {
		fast_front(req, res, next);
	} catch (error) {
		console.error('[front door]', error);
		if (!passed && !res.headersSent) next();
		else if (!res.writableEnded) res.destroy();
	}
};
`;

/**
 * adapter-node's entry point with the fast front added; throws when the expected line is missing.
 * @param {string} entry
 * @returns {string}
 */
export function addFastFront(entry) {
	if (entry.includes('fast_front')) return entry;
	const at = entry.indexOf(SERVER_LINE);
	if (at === -1) throw new Error(`adapter-fast-front: "${SERVER_LINE}" not found in adapter-node's index.js; update scripts/adapter-fast-front.js`);
	const lineStart = entry.lastIndexOf('\n', at) + 1;
	const lineEnd = entry.indexOf('\n', at) + 1;
	if (!entry.slice(lineStart, lineEnd).startsWith('const server = ')) throw new Error('adapter-fast-front: adapter-node no longer names its polka instance `server`; update scripts/adapter-fast-front.js');
	return entry.slice(0, lineStart) + FRONT + '\n' + entry.slice(lineStart, lineEnd) + FRONT_FIRST + entry.slice(lineEnd);
}

/**
 * @param {import('@sveltejs/kit').Adapter} base
 * @param {string} out
 * @returns {import('@sveltejs/kit').Adapter}
 */
export function withFastFront(base, out) {
	return {
		...base,
		name: `${base.name} + fast front`,
		/** @param {import('@sveltejs/kit').Builder} builder */
		async adapt(builder) {
			await base.adapt(builder);
			const entry = path.join(out, 'index.js');
			fs.writeFileSync(entry, addFastFront(fs.readFileSync(entry, 'utf8')));
		}
	};
}
