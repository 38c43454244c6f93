import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { hasRole, isCompanyAdmin, type Identity, type Role } from '$lib/roles';

/**
 * Authorisation helpers, called in every load, action and API route that needs them.
 * Pages redirect an anonymous visitor to sign-in; API routes answer 401.
 */
export function requireUser(event: Pick<RequestEvent, 'locals' | 'url'>): Identity {
	const user = event.locals.user;
	if (user) return user;
	if (event.url.pathname.startsWith('/api/')) error(401, 'Sign in first.');
	redirect(303, `/sign-in?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
}

export function requireRole(event: Pick<RequestEvent, 'locals' | 'url'>, ...roles: Role[]): Identity {
	const user = requireUser(event);
	if (!roles.some((role) => hasRole(user, role))) error(403, 'Your account does not have access to this page.');
	return user;
}

/** A company admin of the given company (or of any company when none is named). */
export function requireCompanyAdmin(event: Pick<RequestEvent, 'locals' | 'url'>, companyId?: string): Identity {
	const user = requireUser(event);
	if (!isCompanyAdmin(user, companyId)) error(403, 'Only a company admin can do this.');
	return user;
}
