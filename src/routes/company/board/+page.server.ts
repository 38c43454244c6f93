import { boardQuery, cellStates, cellText, expiryWindows, stateLabels, validCertificates } from '$lib/compliance/board';
import { boardFor, catalogue } from '$lib/server/company-board';
import { CREW_LIST_CAPACITY } from '$lib/server/pdf/crew-list';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const board = await boardFor(event);
	const { view, filter } = board;
	const query = boardQuery(filter);
	query.set('c', board.company.id);
	return {
		company: board.company,
		companies: board.companies,
		filter,
		notices: board.notices,
		query: query.toString(),
		columns: view.columns.map((c) => ({ slug: c.slug, code: c.code, title: c.title })),
		rows: view.rows.map((r) => ({
			id: r.id,
			name: r.name,
			email: r.email,
			role: r.role,
			cells: r.cells.map((c) => ({ state: c.state, ...cellText(c) }))
		})),
		total: view.total,
		counts: view.counts,
		crewList: { count: validCertificates(view).length, capacity: CREW_LIST_CAPACITY },
		choices: {
			courses: catalogue.map((c) => ({ value: c.slug, label: `${c.code} ${c.title}` })),
			states: cellStates.map((s) => ({ value: s, label: stateLabels[s] })),
			windows: [...expiryWindows]
		}
	};
};
