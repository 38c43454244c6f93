import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { extractText, getDocumentProxy } from 'unpdf';
import { describe, expect, it } from 'vitest';
import { renderReceiptPdf } from '$lib/server/receipts';
import { readerLocale } from '$lib/server/locale';

/** The receipt PDF, read back with a PDF parser (unpdf, pdf.js) and poppler's pdffonts. */
const order = {
	id: 'a5d0c1f2-0000-4000-8000-000000000001',
	number: 'PW-2026-7KQ3M9XA',
	state: 'paid' as const,
	stateLabel: 'Paid',
	course: { slug: 'transition-patches', title: 'Transition patches', code: 'TP-200' },
	product: 'course' as const,
	company: { id: 'c', name: 'Brindlewick Drainage' },
	buyer: { name: 'Jo Penhallow', email: 'admin@brindlewick.test' },
	quantity: 5,
	unitAmount: 49000,
	totalAmount: 245000,
	currency: 'EUR',
	refundedQuantity: 0,
	refundedAmount: 0,
	createdAt: '2026-12-02T17:00:00.000Z',
	paidAt: '2026-12-02T17:01:00.000Z',
	checkoutUrl: null
};

describe('receipt PDF', () => {
	it('carries the order number, buyer, course, quantity, unit price, total and payment date, in embedded Lora', async () => {
		const bytes = await renderReceiptPdf(order, 'en-GB');
		const { text } = await extractText(await getDocumentProxy(new Uint8Array(bytes)), { mergePages: true });
		for (const expected of ['Receipt', 'PW-2026-7KQ3M9XA', 'Jo Penhallow', 'admin@brindlewick.test', 'Brindlewick Drainage', 'Transition patches (TP-200)', '5 seats', '€490.00', '€2,450.00', '2026-12-02']) {
			expect(text).toContain(expected);
		}
		const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'pw-receipt-')), 'r.pdf');
		fs.writeFileSync(file, bytes);
		const fonts = execFileSync('pdffonts', [file], { encoding: 'utf8' });
		// pdffonts: both Lora faces embedded ("emb" yes). pdf-lib names subsets with a numeric suffix,
		// so the size bound is the subset check: one Lora TTF alone is over 100 KB.
		const lora = fonts.split('\n').filter((l) => /^Lora-(Bold|Regular)/.test(l));
		expect(lora).toHaveLength(2);
		for (const line of lora) expect(line).toMatch(/Identity-H\s+yes/);
		expect(bytes.length).toBeLessThan(60_000);
	});

	it('formats amounts for the reader: German readers see 2.450,00 €', async () => {
		const bytes = await renderReceiptPdf(order, readerLocale('de-DE,de;q=0.9,en;q=0.5'));
		const { text } = await extractText(await getDocumentProxy(new Uint8Array(bytes)), { mergePages: true });
		// Intl.NumberFormat (ECMA-402 with CLDR data) writes euro amounts this way for de-DE.
		expect(text.replace(/\u00a0/g, ' ')).toContain('2.450,00 €');
	});

	it('refuses an unpaid order', async () => {
		await expect(renderReceiptPdf({ ...order, paidAt: null }, 'en-GB')).rejects.toThrow(/paid/);
	});
});

describe('reader locale', () => {
	it('takes the first supported tag by quality, and falls back to en-GB', () => {
		expect(readerLocale('fr-CH, fr;q=0.9, en;q=0.8')).toBe('fr-CH');
		expect(readerLocale('en;q=0.2, nl-BE;q=0.9')).toBe('nl-BE');
		expect(readerLocale(null)).toBe('en-GB');
		expect(readerLocale('*')).toBe('en-GB');
		expect(readerLocale('<script>')).toBe('en-GB');
	});
});
