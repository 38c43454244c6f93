import { error } from '@sveltejs/kit';
import { loadCalculator } from '$lib/calc/load';
import { loadPicture } from '$lib/components/calc/pictures';

/** A universal load: the calculator's code runs in the browser too, so it works with no signal. */
export async function load({ params }) {
	const [calculator, picture] = await Promise.all([loadCalculator(params.id), loadPicture(params.id)]);
	if (!calculator) error(404, 'No such calculator');
	return { calculator, picture };
}
