import { redirect } from '@sveltejs/kit';
import { failWith } from '$lib/server/form';
import { requireOrder } from '$lib/server/order-access';
import { cancelOrder, OrderRefused, orderView } from '$lib/server/orders';
import type { Actions, PageServerLoad } from './$types';

/** Where the payment page's "cancel" leads. Leaving changes nothing; cancelling is a deliberate POST. */
export const load: PageServerLoad = async (event) => {
	const { order } = await requireOrder(event);
	return { order: orderView(order) };
};

export const actions: Actions = {
	default: async (event) => {
		const { user, order } = await requireOrder(event);
		try {
			await cancelOrder(user, order.id);
		} catch (e) {
			if (e instanceof OrderRefused) return failWith(e.status, null, e.message);
			throw e;
		}
		redirect(303, `/orders/${order.id}`);
	}
};
