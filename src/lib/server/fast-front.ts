import { fastApi, type Middleware } from './fast-api';
import { fastLesson } from './lesson-page-store';
import { fastPage } from './page-cache';

/**
 * The built server's front door: adapter-node's entry point hands every request here first
 * (`scripts/adapter-fast-front.js` adds that to it), and what is answered here never becomes a
 * web Request for SvelteKit. Three things are: the hot JSON routes (`fast-api.ts`), pages
 * stored for visitors who are not signed in (`page-cache.ts`) and lesson pages stored for
 * readers in the same position (`lesson-page-store.ts`). The rest goes on to SvelteKit.
 */

export const FAST_FRONT_KEY = Symbol.for('patchwright.fast-front');

export const fastFront: Middleware = (req, res, next) => fastApi(req, res, () => fastPage(req, res, () => fastLesson(req, res, next)));

/** Makes the front door available to the built entry point; called once the server has started. */
export function publishFastFront(): void {
	(globalThis as Record<symbol, unknown>)[FAST_FRONT_KEY] = fastFront;
}
