import QRCode from 'qrcode';
import { fill, popGraphicsState, pushGraphicsState, rectangle, setFillingGrayscaleColor, type PDFOperator, type PDFPage } from 'pdf-lib';

/**
 * Draws a QR code (ISO/IEC 18004, built by the `qrcode` package) as vector rectangles, one per
 * horizontal run of dark modules, with the four-module quiet zone the standard asks for left
 * white. `size` is the side of the symbol including the quiet zone, in points; (x, y) is its
 * lower-left corner.
 */
export function drawQr(page: PDFPage, text: string, x: number, y: number, size: number): void {
	const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
	const count = modules.size;
	const quiet = 4;
	const cell = size / (count + 2 * quiet);
	// one filled path of plain rectangles: a few kilobytes, where drawRectangle per run would
	// wrap each in its own graphics state
	const ops: PDFOperator[] = [pushGraphicsState(), setFillingGrayscaleColor(1), rectangle(x, y, size, size), fill(), setFillingGrayscaleColor(0)];
	const round = (n: number) => Math.round(n * 100) / 100;
	for (let row = 0; row < count; row++) {
		let col = 0;
		while (col < count) {
			if (!modules.get(row, col)) {
				col++;
				continue;
			}
			const start = col;
			while (col < count && modules.get(row, col)) col++;
			ops.push(rectangle(round(x + (quiet + start) * cell), round(y + size - (quiet + row + 1) * cell), round((col - start) * cell), round(cell)));
		}
	}
	ops.push(fill(), popGraphicsState());
	page.pushOperators(...ops);
}
