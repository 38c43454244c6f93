import { error } from '@sveltejs/kit';
import { readerLocale } from '$lib/server/locale';
import { requireOrder } from '$lib/server/order-access';
import { orderView } from '$lib/server/orders';
import { renderReceiptPdf } from '$lib/server/receipts';
import type { RequestHandler } from './$types';

/** The receipt as a PDF, for the people who may see the order. */
export const GET: RequestHandler = async (event) => {
	const { order } = await requireOrder(event);
	if (!order.paid_at) error(404, 'This order has not been paid, so it has no receipt.');
	const pdf = await renderReceiptPdf(orderView(order), readerLocale(event.request.headers.get('accept-language')));
	return new Response(pdf as BodyInit, {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="receipt-${order.number}.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};
