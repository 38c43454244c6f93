import { requireUser } from '$lib/server/authz';
import { readerLocale } from '$lib/server/locale';
import { listOrdersFor, orderView } from '$lib/server/orders';
import type { PageServerLoad } from './$types';

/** Orders the person placed and those of the companies they run. */
export const load: PageServerLoad = async (event) => {
	const user = requireUser(event);
	const orders = await listOrdersFor(user);
	return { orders: orders.map(orderView), locale: readerLocale(event.request.headers.get('accept-language')) };
};
