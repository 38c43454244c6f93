import { error } from '@sveltejs/kit';
import { getCalculator } from '$lib/calc';

export function load({ params }) {
	const calc = getCalculator(params.id);
	if (!calc) error(404, 'No such calculator');
	return { id: calc.id, title: calc.title, summary: calc.summary };
}
