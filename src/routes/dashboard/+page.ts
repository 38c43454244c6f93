import { hasRole } from '$lib/roles';
import type { PageLoad } from './$types';

/**
 * The staff and company sections are imported only for the people who see them, so a
 * trainee's dashboard ships none of their code. The page shows a section when it is here.
 */
export const load: PageLoad = async ({ data }) => {
	const has = (role: Parameters<typeof hasRole>[1]) => hasRole(data.user, role);
	const [trainerDesk, companyCrew, seatsPanel, inspectorDesk, registrarDesk] = await Promise.all([
		has('trainer') && data.desk ? import('$lib/components/dashboard/TrainerDesk.svelte') : null,
		data.companies.length ? import('$lib/components/dashboard/CompanyCrew.svelte') : null,
		data.companies.length ? import('$lib/components/seats/SeatsPanel.svelte') : null,
		has('inspector') ? import('$lib/components/dashboard/InspectorDesk.svelte') : null,
		has('registrar') && data.counts ? import('$lib/components/dashboard/RegistrarDesk.svelte') : null
	]);
	return {
		...data,
		sections: {
			TrainerDesk: trainerDesk?.default,
			CompanyCrew: companyCrew?.default,
			SeatsPanel: seatsPanel?.default,
			InspectorDesk: inspectorDesk?.default,
			RegistrarDesk: registrarDesk?.default
		}
	};
};
