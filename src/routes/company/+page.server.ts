import { error } from '@sveltejs/kit';
import { getCourse } from '$lib/content';
import { requireCompanyAdmin } from '$lib/server/authz';
import { crewProgress } from '$lib/server/dashboard';
import { listCertificatesOfCompany } from '$lib/server/certificates';
import { crewSignOffCounts } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireCompanyAdmin(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const wanted = event.url.searchParams.get('c');
	const company = wanted ? adminOf.find((c) => c.id === wanted) : adminOf[0];
	if (!company) error(403, 'Only a company admin can see this crew.');
	const [members, counts] = await Promise.all([crewProgress(company.id), crewSignOffCounts(company.id)]);
	const signOffs = counts.map((c) => ({
		name: members.find((m) => m.id === c.userId)?.name ?? '',
		courseTitle: getCourse(c.courseSlug)?.title ?? c.courseSlug,
		signedOff: c.signedOff,
		total: c.total
	}));
	return { company, companies: adminOf, members, signOffs, certificates: await listCertificatesOfCompany(company.id) };
};
