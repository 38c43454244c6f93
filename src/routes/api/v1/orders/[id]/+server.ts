import { json } from '@sveltejs/kit';
import { requireOrder } from '$lib/server/order-access';
import { orderView } from '$lib/server/orders';
import type { RequestHandler } from './$types';

/** An order's state and amounts (minor units); the success page polls this until the webhook lands. */
export const GET: RequestHandler = async (event) => {
	const { order } = await requireOrder(event);
	return json(orderView(order), { headers: { 'cache-control': 'no-store' } });
};
