import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { listAudit } from '$lib/server/audit';
import { requireRole } from '$lib/server/authz';
import { failWith, parseForm } from '$lib/server/form';
import { readerLocale } from '$lib/server/locale';
import { getOrder, OrderRefused, orderView, refundableSeats, requestRefund } from '$lib/server/orders';
import type { Actions, PageServerLoad } from './$types';

async function orderOr404(id: string) {
	const order = /^[0-9a-f-]{36}$/.test(id) ? await getOrder(id) : undefined;
	if (!order) error(404, 'No such order');
	return order;
}

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'registrar');
	const order = await orderOr404(event.params.order);
	return {
		order: orderView(order),
		refundable: await refundableSeats(order.id),
		history: (await listAudit({ subjectType: 'order', subjectId: order.id })).map((a) => ({ id: a.id, at: a.at, action: a.action, actor: a.actor_email, detail: a.detail })),
		locale: readerLocale(event.request.headers.get('accept-language'))
	};
};

const refundSchema = z.object({
	scope: z.enum(['all', 'some'], { error: 'Choose a full refund or a number of seats.' }),
	seats: z.string().optional()
});

export const actions: Actions = {
	refund: async (event) => {
		const user = requireRole(event, 'registrar');
		const order = await orderOr404(event.params.order);
		const parsed = await parseForm(event.request, refundSchema);
		if (!parsed.ok) return parsed.failure;
		const seats = parsed.data.scope === 'all' ? 'all' : Number(parsed.data.seats);
		if (seats !== 'all' && (!Number.isSafeInteger(seats) || seats < 1)) return failWith(400, parsed.form, 'Enter how many seats to refund.', { seats: 'Enter a whole number of seats, 1 or more.' });
		try {
			const refund = await requestRefund(user.id, order.id, seats);
			return { requested: `Refund of ${refund.seats} ${refund.seats === 1 ? 'seat' : 'seats'} sent to the payment service. The seats are released when it confirms.` };
		} catch (e) {
			if (e instanceof OrderRefused) return failWith(e.status, parsed.form, e.message, e.field ? { [e.field]: e.message } : {});
			throw e;
		}
	}
};
