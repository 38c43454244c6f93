import { navigationFor, type NavLink } from '$lib/navigation';
import type { Identity } from '$lib/roles';
import { config } from './config';

/**
 * What every page's frame needs of the person reading it: whether someone is signed in and
 * the menu their roles give. Nothing that names the person (no id, name or e-mail) goes into
 * every page this way; a page that shows them (the dashboard) loads them itself. So a page's
 * data, and with it the rendered page, is the same for everyone in the same position, which
 * the lesson page store relies on (see lesson-page-store.ts).
 */
export interface Viewer {
	signedIn: boolean;
	links: NavLink[];
	fakeInboxUrl: string | null;
	fakePaymentsUrl: string | null;
}

export function viewerOf(user: Identity | null): Viewer {
	return { signedIn: user !== null, links: navigationFor(user), fakeInboxUrl: config.fakeInboxUrl, fakePaymentsUrl: config.fakePaymentsUrl };
}
