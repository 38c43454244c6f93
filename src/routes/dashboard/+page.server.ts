import { requireUser } from '$lib/server/authz';
import { crewProgress, registrarCounts, traineeStandings, trainerDesk } from '$lib/server/dashboard';
import { queueCount } from '$lib/server/sign-offs';
import type { PageServerLoad } from './$types';

/** Each role's section of the dashboard, loaded only for the roles the person holds. */
export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const adminOf = user.companies.filter((c) => c.role === 'admin');
	const staff = user.roles.includes('trainer') || user.roles.includes('registrar');
	const [standings, companies, desk, practicalQueue, counts] = await Promise.all([
		traineeStandings(user.id),
		Promise.all(
			adminOf.map(async (c) => {
				const crew = await crewProgress(c.id);
				return {
					id: c.id,
					name: c.name,
					memberCount: crew.length,
					enrolledCount: crew.filter((m) => m.courses.length > 0).length,
					passedCount: crew.reduce((n, m) => n + m.courses.filter((k) => k.testPassed).length, 0)
				};
			})
		),
		staff ? trainerDesk(user.id) : null,
		user.roles.includes('trainer') ? queueCount(user.id) : null,
		user.roles.includes('registrar') ? registrarCounts() : null
	]);
	return { standings, companies, desk, practicalQueue, counts };
};
