/** Roles shared by server and pages. Everyone signed in is a trainee. */
export const platformRoles = ['trainer', 'inspector', 'registrar'] as const;
export type PlatformRole = (typeof platformRoles)[number];
export type Role = 'trainee' | PlatformRole;

export interface CompanyMembership {
	id: string;
	name: string;
	role: 'admin' | 'member';
}

/** What a page may know about the signed-in person. */
export interface Identity {
	id: string;
	email: string;
	name: string | null;
	roles: Role[];
	companies: CompanyMembership[];
}

export const roleLabels: Record<Role, string> = {
	trainee: 'Trainee',
	trainer: 'Trainer',
	inspector: 'Inspector',
	registrar: 'Registrar'
};

export function hasRole(identity: Identity | null | undefined, role: Role): boolean {
	return !!identity && identity.roles.includes(role);
}

export function isCompanyAdmin(identity: Identity | null | undefined, companyId?: string): boolean {
	return (
		!!identity &&
		identity.companies.some((c) => c.role === 'admin' && (companyId === undefined || c.id === companyId))
	);
}

/**
 * The parts a person actually plays, in words: "Trainee" only when enrolled in a course
 * (everyone may train, but an inspector who takes no course is not a trainee), then the
 * platform roles, then the company parts.
 */
export function workingRoles(person: { roles: Role[]; companies?: CompanyMembership[] }, enrolled: boolean): string[] {
	const parts = person.roles.filter((r) => r !== 'trainee' || enrolled).map((r) => roleLabels[r]);
	for (const c of person.companies ?? []) parts.push(`${c.role === 'admin' ? 'Company admin' : 'Crew member'} at ${c.name}`);
	return parts;
}
