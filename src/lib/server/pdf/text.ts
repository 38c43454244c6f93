import { rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';

/** Splits text into lines no wider than `maxWidth` points at `size`; words longer than a line are kept whole. */
export function wrapText(text: string, font: PDFFont, size: number, maxWidth: number): string[] {
	// words measured one at a time (no kerning across a space is applied, see fonts.ts)
	const space = font.widthOfTextAtSize(' ', size);
	const lines: string[] = [];
	for (const paragraph of text.split('\n')) {
		let line = '';
		let width = 0;
		for (const word of paragraph.split(/\s+/).filter(Boolean)) {
			const w = font.widthOfTextAtSize(word, size);
			if (line && width + space + w > maxWidth) {
				lines.push(line);
				line = word;
				width = w;
			} else {
				width = line ? width + space + w : w;
				line = line ? `${line} ${word}` : word;
			}
		}
		lines.push(line);
	}
	return lines;
}

/** Draws wrapped text from (x, y) downwards and returns the y below the last line. */
export function drawWrapped(
	page: PDFPage,
	text: string,
	options: { x: number; y: number; font: PDFFont; size: number; maxWidth: number; lineHeight?: number; color?: RGB }
): number {
	const lineHeight = options.lineHeight ?? options.size * 1.3;
	let y = options.y;
	for (const line of wrapText(text, options.font, options.size, options.maxWidth)) {
		page.drawText(line, { x: options.x, y, size: options.size, font: options.font, color: options.color ?? rgb(0.12, 0.14, 0.16) });
		y -= lineHeight;
	}
	return y;
}
