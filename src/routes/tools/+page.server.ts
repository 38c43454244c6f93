import { listCalculators } from '$lib/calc';

/** Calculators grouped the way the job runs: materials, transitions, pressure, cure, testing, design. */
const GROUPS: { title: string; ids: string[] }[] = [
	{ title: 'Mat and resin', ids: ['resin-quantity', 'mat-size', 'mix-ratio', 'laminate-volume'] },
	{ title: 'Transitions', ids: ['transition-area'] },
	{ title: 'Packer pressure', ids: ['groundwater-head', 'pressure-window', 'end-thrust'] },
	{ title: 'Cure', ids: ['cure-time'] },
	{ title: 'Testing', ids: ['water-test', 'air-test'] },
	{ title: 'Liner design (ASTM F1216)', ids: ['f1216-partial', 'f1216-full'] }
];

/** Computed on the server: the registry of every calculator would otherwise ship to the browser (about 17 KB). */
export function load() {
	const byId = new Map(listCalculators().map((c) => [c.id, c]));
	return {
		groups: GROUPS.map((g) => ({
			title: g.title,
			calculators: g.ids.map((id) => {
				const { title, summary } = byId.get(id)!;
				return { id, title, summary };
			})
		}))
	};
}
