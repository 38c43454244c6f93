import fs from 'node:fs';
import path from 'node:path';

/**
 * adapter-node with one addition to the entry point it writes (`build/index.js`): before
 * adapter-node's handler, a middleware hands each request to the app's front door
 * (src/lib/server/fast-front.ts) when the app has published one, and otherwise passes it on.
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
 * adapter-node's entry point with the fast front added; throws when the expected line is missing.
 * @param {string} entry
 * @returns {string}
 */
export function addFastFront(entry) {
	if (entry.includes('fast_front')) return entry;
	const at = entry.indexOf(SERVER_LINE);
	if (at === -1) throw new Error(`adapter-fast-front: "${SERVER_LINE}" not found in adapter-node's index.js; update scripts/adapter-fast-front.js`);
	const lineStart = entry.lastIndexOf('\n', at) + 1;
	return entry.slice(0, lineStart) + FRONT + '\n' + entry.slice(lineStart).replace(SERVER_LINE, 'polka({ server: httpServer }).use(fast_front, handler)');
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
