import { requireUser } from '$lib/server/authz';
import { crewProgress, registrarCounts, traineeStandings, trainerDesk } from '$lib/server/dashboard';
import { listOrdersFor, orderView } from '$lib/server/orders';
import { seatLedger } from '$lib/server/seats';
import { listCertificatesOf, listWaitingForOne } from '$lib/server/certificates';
import { crewExpiringSoon, expiringCertificatesOf } from '$lib/server/renewals';
import { config } from '$lib/server/config';
import { recentCrewChecks } from '$lib/server/crew-checks';
import { queueCount } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

/** Each role's section of the dashboard, loaded only for the roles the person holds. */
export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const staff = user.roles.includes('trainer') || user.roles.includes('registrar');
	const [standings, companies, desk, practicalQueue, counts, certificates, recentChecks, orders, expiring, waiting] = await Promise.all([
		traineeStandings(user.id),
		Promise.all(
			adminOf.map(async (c) => {
				const crew = await crewProgress(c.id);
				return {
					id: c.id,
					name: c.name,
					memberCount: crew.length,
					enrolledCount: crew.filter((m) => m.courses.length > 0).length,
					passedCount: crew.reduce((n, m) => n + m.courses.filter((k) => k.testPassed).length, 0),
					seats: await seatLedger(c.id),
					expiring: (await crewExpiringSoon(c.id)).map(({ userId, name, email, courseCode, expiresOn, daysLeft }) => ({ userId, name, email, courseCode, expiresOn, daysLeft }))
				};
			})
		),
		staff ? trainerDesk(user.id) : null,
		user.roles.includes('trainer') ? queueCount(user.id) : null,
		user.roles.includes('registrar') ? registrarCounts() : null,
		listCertificatesOf(user.id),
		user.roles.includes('inspector') ? recentCrewChecks(user.id, 3) : [],
		listOrdersFor(user).then((o) => o.slice(0, 3).map(orderView)),
		expiringCertificatesOf(user.id),
		user.roles.includes('registrar')
			? listWaitingForOne().then((w) => w.map(({ userId, name, email, courseTitle, missing }) => ({ userId, name, email, courseTitle, missing: { detail: missing.detail } })))
			: []
	]);
	return { user, standings, companies, desk, practicalQueue, counts, certificates, origin: config.origin, recentChecks, orders, expiring, waiting };
};
