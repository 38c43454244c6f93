import { PDFDocument, rgb, type PDFFont } from 'pdf-lib';
import { longDate } from '../../certificates/status';
import { embedLora } from './fonts';
import { drawQr } from './qr';
import { drawWrapped, wrapText } from './text';
import { pageSizes } from './certificate';

/**
 * The crew list: one A4 page a company hands to a pipe owner, with each valid certificate of
 * the crew on the board, its number and a QR code to its verification page. One page holds
 * CREW_LIST_CAPACITY certificates (two columns); the board asks for a narrower list past that.
 */
export interface CrewListEntry {
	name: string;
	courseCode: string;
	courseTitle: string;
	number: string;
	expiresOn: string;
	verifyUrl: string;
}

export interface CrewListDocument {
	companyName: string;
	issuerName: string;
	/** YYYY-MM-DD (UTC): the day the list was made; the certificates listed were valid that day. */
	madeOn: string;
	/** The board's filters in words, or '' for the whole crew. */
	filterWords: string;
	checkUrl: string;
	entries: CrewListEntry[];
}

export const CREW_LIST_CAPACITY = 16;

const ink = rgb(0x17 / 255, 0x1f / 255, 0x27 / 255);
const muted = rgb(0x45 / 255, 0x57 / 255, 0x66 / 255);
const clay = rgb(0x9a / 255, 0x46 / 255, 0x28 / 255);
const line = rgb(0xcf / 255, 0xd7 / 255, 0xdd / 255);

const [pageWidth, pageHeight] = pageSizes.a4;
const margin = 40;
const gap = 14;
const boxWidth = (pageWidth - 2 * margin - gap) / 2;
const boxHeight = 80;
const qrSize = 74;
const gridTop = pageHeight - 150;

/** Where entry `index` is drawn: its box and its QR code (PDF points, origin bottom left). */
export function crewListSlot(index: number) {
	const column = index % 2;
	const row = Math.floor(index / 2);
	const x = margin + column * (boxWidth + gap);
	const y = gridTop - (row + 1) * boxHeight;
	return { x, y, width: boxWidth, height: boxHeight, qr: { x: x + 3, y: y + 3, size: qrSize } };
}

function fit(text: string, font: PDFFont, size: number, width: number, lines: number): string[] {
	const wrapped = wrapText(text, font, size, width);
	if (wrapped.length <= lines) return wrapped;
	const kept = wrapped.slice(0, lines);
	let last = kept[lines - 1];
	while (last.length > 1 && font.widthOfTextAtSize(`${last}…`, size) > width) last = last.slice(0, -1);
	kept[lines - 1] = `${last}…`;
	return kept;
}

export async function renderCrewListPdf(d: CrewListDocument): Promise<Uint8Array> {
	if (d.entries.length > CREW_LIST_CAPACITY) throw new RangeError(`A crew list holds at most ${CREW_LIST_CAPACITY} certificates`);
	const doc = await PDFDocument.create({ updateMetadata: false });
	const made = new Date(`${d.madeOn}T00:00:00Z`);
	doc.setTitle(`Crew list: ${d.companyName}, ${longDate(d.madeOn)}`);
	doc.setAuthor(d.companyName);
	doc.setCreator('Patchwright');
	doc.setProducer('Patchwright (pdf-lib)');
	doc.setCreationDate(made);
	doc.setModificationDate(made);
	const fonts = await embedLora(doc, ['regular', 'semibold', 'bold']);
	const page = doc.addPage(pageSizes.a4);
	const text = (s: string, x: number, y: number, size: number, font: PDFFont = fonts.regular, color = ink) => page.drawText(s, { x, y, size, font, color });

	let y = pageHeight - margin - 18;
	text('Crew list', margin, y, 22, fonts.bold);
	text(d.issuerName, pageWidth - margin - fonts.semibold.widthOfTextAtSize(d.issuerName, 10), y + 6, 10, fonts.semibold, clay);
	y -= 22;
	y = drawWrapped(page, d.companyName, { x: margin, y, font: fonts.semibold, size: 14, maxWidth: pageWidth - 2 * margin, lineHeight: 17 });
	const scope = d.filterWords ? ` Board filter: ${d.filterWords}.` : '';
	drawWrapped(
		page,
		`${d.entries.length} ${d.entries.length === 1 ? 'certificate' : 'certificates'} valid on ${longDate(d.madeOn)}.${scope} Scan a code or enter the number at ${d.checkUrl} for its status today.`,
		{ x: margin, y: y - 2, font: fonts.regular, size: 10, maxWidth: pageWidth - 2 * margin, lineHeight: 13, color: muted }
	);

	if (d.entries.length === 0) text('No valid certificate matches the board as filtered.', margin, gridTop - 30, 12, fonts.semibold);
	d.entries.forEach((e, i) => {
		const slot = crewListSlot(i);
		page.drawRectangle({ x: slot.x, y: slot.y, width: slot.width, height: slot.height - 4, borderColor: line, borderWidth: 0.75 });
		drawQr(page, e.verifyUrl, slot.qr.x, slot.qr.y - 2, slot.qr.size);
		const tx = slot.qr.x + slot.qr.size + 6;
		const tw = slot.x + slot.width - tx - 6;
		let ty = slot.y + slot.height - 20;
		for (const l of fit(e.name, fonts.semibold, 11, tw, 1)) {
			text(l, tx, ty, 11, fonts.semibold);
			ty -= 13;
		}
		for (const l of fit(`${e.courseCode} ${e.courseTitle}`, fonts.regular, 8.5, tw, 2)) {
			text(l, tx, ty, 8.5, fonts.regular, muted);
			ty -= 10.5;
		}
		text(e.number, tx, slot.y + 20, 10, fonts.bold);
		text(`Valid until ${longDate(e.expiresOn)}`, tx, slot.y + 8, 8.5);
	});

	drawWrapped(page, `Made with Patchwright on ${longDate(d.madeOn)}. A certificate can expire or be revoked after this date: the verification page is what counts.`, {
		x: margin, y: margin, font: fonts.regular, size: 8.5, maxWidth: pageWidth - 2 * margin, lineHeight: 11, color: muted
	});
	return doc.save({ useObjectStreams: true });
}
