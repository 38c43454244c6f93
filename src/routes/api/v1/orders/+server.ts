import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiError, codeForStatus, readJson } from '$lib/server/api';
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
	const body = await readJson(event.request, orderBody, { maxBytes: 4 * 1024 });
	if (!body.ok) return body.response;
	try {
		const started = await startOrder(user, { courseSlug: body.data.course, quantity: body.data.quantity, companyId: body.data.companyId ?? null }, event.url.origin);
		const order = await getOrder(started.id);
		return json({ ...orderView(order!), checkoutUrl: started.checkout_url }, { status: 201, headers: { location: `/api/v1/orders/${started.id}` } });
	} catch (e) {
		if (e instanceof OrderRefused) {
			// The payment service not answering is ours to retry, not the caller's mistake.
			if (e.status === 502) return apiError(503, 'unavailable', e.message, undefined, { reason: 'payment-service' });
			return apiError(e.status, codeForStatus(e.status), e.message, e.field ? { [e.field]: e.message } : undefined);
		}
		throw e;
	}
};
