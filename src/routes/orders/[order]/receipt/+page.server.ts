import { error } from '@sveltejs/kit';
import { readerLocale } from '$lib/server/locale';
import { requireOrder } from '$lib/server/order-access';
import { orderView } from '$lib/server/orders';
import { receiptIssuer } from '$lib/server/receipts';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { order } = await requireOrder(event);
	if (!order.paid_at) error(404, 'This order has not been paid, so it has no receipt.');
	return { order: orderView(order), issuer: receiptIssuer(), locale: readerLocale(event.request.headers.get('accept-language')) };
};
