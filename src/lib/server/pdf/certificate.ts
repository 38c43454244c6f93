import { PDFDocument, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import { embedLora } from './fonts';
import { drawQr } from './qr';
import { drawWrapped } from './text';
import { longDate } from '$lib/certificates/status';

/** What a certificate document shows; all of it comes from the certificate row. */
export interface CertificateDocument {
	number: string;
	holderName: string;
	courseCode: string;
	courseTitle: string;
	scope: string;
	diameterMinMm: number;
	diameterMaxMm: number;
	testOn: string;
	practicalOn: string;
	issuedOn: string;
	expiresOn: string;
	trainers: string[];
	issuerName: string;
	verifyUrl: string;
	checkUrl: string;
	credentialJwt: string;
	issuedAt: string;
}

export const documentFormats = ['a4', 'letter', 'card'] as const;
export type DocumentFormat = (typeof documentFormats)[number];

/** Page sizes in PDF points (1/72 in): ISO 216 A4 210 x 297 mm, ANSI Letter 8.5 x 11 in, ISO/IEC 7810 ID-1 85.60 x 53.98 mm. */
const mm = 72 / 25.4;
export const pageSizes: Record<DocumentFormat, [number, number]> = {
	a4: [210 * mm, 297 * mm],
	letter: [8.5 * 72, 11 * 72],
	card: [85.6 * mm, 53.98 * mm]
};

const ink = rgb(0x17 / 255, 0x1f / 255, 0x27 / 255);
const muted = rgb(0x45 / 255, 0x57 / 255, 0x66 / 255);
const clay = rgb(0x9a / 255, 0x46 / 255, 0x28 / 255);

type Fonts = Record<'regular' | 'semibold' | 'bold', PDFFont>;

function drawPage(page: PDFPage, fonts: Fonts, c: CertificateDocument) {
	const { width, height } = page.getSize();
	const margin = 56;
	const text = (s: string, x: number, y: number, size: number, font: PDFFont = fonts.regular, color = ink) =>
		page.drawText(s, { x, y, size, font, color });
	page.drawRectangle({ x: 24, y: 24, width: width - 48, height: height - 48, borderColor: clay, borderWidth: 1.5 });
	let y = height - margin - 20;
	text(c.issuerName, margin, y, 13, fonts.semibold, clay);
	y -= 44;
	text('Certificate of competence', margin, y, 28, fonts.bold);
	y -= 36;
	text('This certifies that', margin, y, 12, fonts.regular, muted);
	y -= 34;
	text(c.holderName, margin, y, 26, fonts.bold);
	y -= 30;
	text('has met every requirement of the course', margin, y, 12, fonts.regular, muted);
	y -= 26;
	y = drawWrapped(page, `${c.courseCode} ${c.courseTitle}`, { x: margin, y, font: fonts.semibold, size: 18, maxWidth: width - 2 * margin, lineHeight: 22 });
	y -= 10;
	text('Scope', margin, y, 10, fonts.semibold, muted);
	y -= 16;
	y = drawWrapped(page, c.scope, { x: margin, y, font: fonts.regular, size: 12, maxWidth: width - 2 * margin, lineHeight: 16 });
	y = drawWrapped(page, `Pipe internal diameters ${c.diameterMinMm} mm to ${c.diameterMaxMm} mm (DN${c.diameterMinMm} to DN${c.diameterMaxMm}).`, {
		x: margin, y, font: fonts.regular, size: 12, maxWidth: width - 2 * margin, lineHeight: 16
	});
	y -= 14;
	const rows: [string, string][] = [
		['Course test passed', longDate(c.testOn)],
		['Practical skills signed off', longDate(c.practicalOn)],
		['Issued', longDate(c.issuedOn)],
		['Valid until', longDate(c.expiresOn)]
	];
	for (const [label, value] of rows) {
		text(label, margin, y, 12, fonts.regular, muted);
		text(value, margin + 190, y, 12, fonts.semibold);
		y -= 20;
	}
	if (c.trainers.length) {
		y -= 4;
		y = drawWrapped(page, `Practical skills signed off by ${c.trainers.join(', ')}.`, { x: margin, y, font: fonts.regular, size: 11, maxWidth: width - 2 * margin, lineHeight: 15, color: muted });
	}
	const qrSize = 132;
	const bottom = margin + 8;
	drawQr(page, c.verifyUrl, width - margin - qrSize, bottom, qrSize);
	text('Certificate number', margin, bottom + 96, 10, fonts.semibold, muted);
	text(c.number, margin, bottom + 70, 22, fonts.bold);
	drawWrapped(page, `Check it: scan the code, or open ${c.checkUrl} and type the number. This file also carries the signed credential (Open Badges 3.0).`, {
		x: margin, y: bottom + 44, font: fonts.regular, size: 9.5, maxWidth: width - 2 * margin - qrSize - 16, lineHeight: 12.5, color: muted
	});
}

function drawCard(page: PDFPage, fonts: Fonts, c: CertificateDocument) {
	const { width, height } = page.getSize();
	const pad = 9;
	const qrSize = 70;
	const textWidth = width - 2 * pad - qrSize - 4;
	const text = (s: string, x: number, y: number, size: number, font: PDFFont = fonts.regular, color = ink) =>
		page.drawText(s, { x, y, size, font, color });
	page.drawRectangle({ x: 0, y: height - 4, width, height: 4, color: clay });
	let y = height - pad - 10;
	text(c.issuerName, pad, y, 6.5, fonts.semibold, clay);
	y -= 13;
	y = drawWrapped(page, c.holderName, { x: pad, y, font: fonts.bold, size: 10.5, maxWidth: textWidth, lineHeight: 12 });
	y = drawWrapped(page, `${c.courseCode} ${c.courseTitle}`, { x: pad, y, font: fonts.semibold, size: 7, maxWidth: textWidth, lineHeight: 8.5 });
	y = drawWrapped(page, `${c.scope} DN${c.diameterMinMm}-DN${c.diameterMaxMm}.`, { x: pad, y: y - 1, font: fonts.regular, size: 4.6, maxWidth: textWidth, lineHeight: 5.6, color: muted });
	text(`Issued ${longDate(c.issuedOn)} · valid until ${longDate(c.expiresOn)}`, pad, pad + 18, 5.4, fonts.regular, ink);
	text(c.number, pad, pad + 8, 8.5, fonts.bold);
	text(`Check: ${c.checkUrl}`, pad, pad, 4.6, fonts.regular, muted);
	drawQr(page, c.verifyUrl, width - pad - qrSize + 4, pad - 4, qrSize);
}

/**
 * Renders one certificate document. The signed credential rides along as an embedded file
 * (PDF 1.7, ISO 32000-1 §7.11.4), so one file is both the paper and the proof.
 */
export async function renderCertificatePdf(c: CertificateDocument, format: DocumentFormat): Promise<Uint8Array> {
	const doc = await PDFDocument.create({ updateMetadata: false });
	const issued = new Date(c.issuedAt);
	doc.setTitle(`Certificate ${c.number}: ${c.holderName}, ${c.courseCode} ${c.courseTitle}`);
	doc.setAuthor(c.issuerName);
	doc.setSubject(`Certificate of competence ${c.number}`);
	doc.setCreator('Patchwright');
	doc.setProducer('Patchwright (pdf-lib)');
	doc.setCreationDate(issued);
	doc.setModificationDate(issued);
	const fonts = await embedLora(doc, ['regular', 'semibold', 'bold']);
	const page = doc.addPage(pageSizes[format]);
	if (format === 'card') drawCard(page, fonts, c);
	else drawPage(page, fonts, c);
	await doc.attach(new TextEncoder().encode(c.credentialJwt), `certificate-${c.number}.jwt`, {
		mimeType: 'application/jwt',
		description: 'Open Badges 3.0 OpenBadgeCredential secured as a JWT (EdDSA)',
		creationDate: issued,
		modificationDate: issued
	});
	return doc.save({ useObjectStreams: true });
}
