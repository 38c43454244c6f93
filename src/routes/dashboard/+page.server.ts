import { requireUser } from '$lib/server/authz';
import { countPeople } from '$lib/server/users';
import { listMembers } from '$lib/server/companies';
import { listEnrolledProgress } from '$lib/server/progress';
import { listOrdersFor, orderView } from '$lib/server/orders';
import { seatLedger } from '$lib/server/seats';
import { listCertificatesOf } from '$lib/server/certificates';
import { config } from '$lib/server/config';
import { recentCrewChecks } from '$lib/server/crew-checks';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const companies = await Promise.all(
		adminOf.map(async (c) => ({ ...c, memberCount: (await listMembers(c.id)).length, seats: await seatLedger(c.id) }))
	);
	return {
		training: await listEnrolledProgress(user.id),
		orders: (await listOrdersFor(user)).slice(0, 3).map(orderView),
		companies,
		peopleCount: user.roles.includes('registrar') ? await countPeople() : null,
		certificates: await listCertificatesOf(user.id),
		origin: config.origin,
		recentChecks: user.roles.includes('inspector') ? await recentCrewChecks(user.id, 3) : []
	};
};
