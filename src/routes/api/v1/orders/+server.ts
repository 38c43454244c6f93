import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError, readJsonBody } from '$lib/server/api-shim';
import { requireUser } from '$lib/server/authz';
import { getOrder, MAX_SEATS_PER_ORDER, OrderRefused, orderView, startOrder } from '$lib/server/orders';
import type { RequestHandler } from './$types';

const orderBody = z.strictObject({
	course: z.string().min(1).max(100),
	quantity: z.number().int().min(1).max(MAX_SEATS_PER_ORDER),
	companyId: z.uuid().nullable().optional()
});

/** Opens an order and its checkout; the answer carries `checkoutUrl`, where the buyer pays. */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event);
	const body = await readJsonBody(event.request, orderBody, 4 * 1024);
	if (!body.ok) return body.response;
	try {
		const started = await startOrder(user, { courseSlug: body.data.course, quantity: body.data.quantity, companyId: body.data.companyId ?? null }, event.url.origin);
		const order = await getOrder(started.id);
		return json({ ...orderView(order!), checkoutUrl: started.checkout_url }, { status: 201, headers: { location: `/api/v1/orders/${started.id}` } });
	} catch (e) {
		if (e instanceof OrderRefused) {
			const code = { 400: 'invalid_order', 403: 'forbidden', 404: 'not_found', 409: 'conflict', 502: 'payment_service' }[e.status];
			return apiError(e.status, code, e.message, e.field ? { [e.field]: e.message } : undefined);
		}
		throw e;
	}
};
