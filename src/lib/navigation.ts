import { hasRole, isCompanyAdmin, type Identity } from './roles';

export interface NavLink {
	href: string;
	label: string;
}

/** The main navigation for a person (or a visitor when `user` is null). */
export function navigationFor(user: Identity | null): NavLink[] {
	const links: NavLink[] = [];
	if (user) links.push({ href: '/dashboard', label: 'Dashboard' });
	links.push({ href: '/courses', label: 'Courses' }, { href: '/tools', label: 'Calculators' }, { href: '/verify', label: 'Verify a certificate' });
	if (hasRole(user, 'trainer')) links.push({ href: '/trainer', label: 'Trainer desk' });
	if (isCompanyAdmin(user)) links.push({ href: '/company', label: 'Company' }, { href: '/company/board', label: 'Compliance board' });
	if (hasRole(user, 'inspector')) links.push({ href: '/inspector', label: 'Inspector' });
	if (hasRole(user, 'registrar')) links.push({ href: '/registrar', label: 'Registrar' });
	return links;
}
