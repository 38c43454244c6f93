import { error } from '@sveltejs/kit';
import { loadCalculator } from '$lib/calc/load';

/** A universal load: the calculator's code runs in the browser too, so it works with no signal. */
export async function load({ params }) {
	const calculator = await loadCalculator(params.id);
	if (!calculator) error(404, 'No such calculator');
	return { calculator };
}
