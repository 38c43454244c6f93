import { error } from '@sveltejs/kit';
import { requireCompanyAdmin } from '$lib/server/authz';
import { listMembers } from '$lib/server/companies';
import { listCertificatesOfCompany } from '$lib/server/certificates';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireCompanyAdmin(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const wanted = event.url.searchParams.get('c');
	const company = wanted ? adminOf.find((c) => c.id === wanted) : adminOf[0];
	if (!company) error(403, 'Only a company admin can see this crew.');
	return { company, companies: adminOf, members: await listMembers(company.id), certificates: await listCertificatesOfCompany(company.id) };
};
