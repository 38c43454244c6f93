import { PDFDocument, rgb } from 'pdf-lib';
import { formatMoney } from '$lib/money';
import { embedLora } from './pdf';
import type { orderView } from './orders';

type OrderView = ReturnType<typeof orderView>;

/** Who issues receipts; set with RECEIPT_ISSUER (a name and address on one line). */
export function receiptIssuer(): string {
	return process.env.RECEIPT_ISSUER || 'Patchwright training provider';
}

const ink = rgb(0.09, 0.12, 0.15);
const clay = rgb(0.6, 0.27, 0.16);
const muted = rgb(0.27, 0.34, 0.4);

/**
 * A one-page A4 receipt for a paid order, set in the app's own Lora (embedded as a subset, so
 * the text stays extractable). Amounts come from the order in minor units, never floats.
 */
export async function renderReceiptPdf(order: OrderView, locale = 'en-GB'): Promise<Uint8Array> {
	if (!order.paidAt) throw new Error('Only a paid order has a receipt');
	const doc = await PDFDocument.create();
	doc.setTitle(`Receipt ${order.number}`);
	doc.setAuthor(receiptIssuer());
	doc.setCreator('Patchwright');
	doc.setProducer('Patchwright (pdf-lib)');
	doc.setCreationDate(new Date(order.paidAt));
	const fonts = await embedLora(doc, ['regular', 'bold'] as const);
	const page = doc.addPage([595.28, 841.89]);
	const left = 56;
	let y = 841.89 - 72;
	const money = (minor: number) => formatMoney(minor, order.currency, locale);

	page.drawText('Patchwright', { x: left, y, size: 22, font: fonts.bold, color: clay });
	page.drawRectangle({ x: left, y: y - 10, width: 595.28 - 2 * left, height: 3, color: clay });
	y -= 48;
	page.drawText('Receipt', { x: left, y, size: 28, font: fonts.bold, color: ink });
	y -= 28;
	page.drawText(receiptIssuer(), { x: left, y, size: 11, font: fonts.regular, color: muted });
	y -= 36;

	const rows: [string, string][] = [
		['Order number', order.number],
		['Payment date', `${order.paidAt.slice(0, 10)} (UTC)`],
		['Buyer', `${order.buyer.name ?? ''} <${order.buyer.email}>`.trim()],
		...(order.company ? ([['Company', order.company.name ?? '']] as [string, string][]) : []),
		['Course', `${order.course.title} (${order.course.code})`],
		['Quantity', `${order.quantity} ${order.product === 'renewal' ? 'renewal ' : ''}${order.quantity === 1 ? 'seat' : 'seats'}`],
		['Unit price', money(order.unitAmount)],
		['Total paid', money(order.totalAmount)]
	];
	if (order.refundedAmount > 0) rows.push(['Refunded', `${money(order.refundedAmount)} (${order.refundedQuantity} ${order.refundedQuantity === 1 ? 'seat' : 'seats'})`]);
	for (const [label, value] of rows) {
		page.drawText(label, { x: left, y, size: 12, font: fonts.regular, color: muted });
		page.drawText(value, { x: left + 140, y, size: 12, font: label.startsWith('Total') ? fonts.bold : fonts.regular, color: ink });
		y -= 24;
	}
	y -= 24;
	page.drawText('Paid by card through the payment service. Keep this receipt for your records.', { x: left, y, size: 10, font: fonts.regular, color: muted });
	return doc.save();
}
