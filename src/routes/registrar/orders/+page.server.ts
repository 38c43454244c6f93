import { requireRole } from '$lib/server/authz';
import { readerLocale } from '$lib/server/locale';
import { listAllOrders, orderView } from '$lib/server/orders';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	return { orders: (await listAllOrders()).map(orderView), locale: readerLocale(event.request.headers.get('accept-language')) };
};
