import { readerLocale } from '$lib/server/locale';
import { requireOrder } from '$lib/server/order-access';
import { orderView } from '$lib/server/orders';
import type { PageServerLoad } from './$types';

/** An order's state. After the payment page it waits for the webhook; it never grants seats itself. */
export const load: PageServerLoad = async (event) => {
	const { order } = await requireOrder(event);
	return {
		order: orderView(order),
		returnedFromPayment: event.url.searchParams.get('paid') === '1',
		locale: readerLocale(event.request.headers.get('accept-language'))
	};
};
