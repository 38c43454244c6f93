import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { PDFDocument } from 'pdf-lib';
import { extractText, getDocumentProxy } from 'unpdf';
import { describe, expect, it } from 'vitest';
import { embedLora } from '$lib/server/pdf';

describe('Lora embedding for pdf-lib', () => {
	it('embeds a subset whose text reads back, including Latin-extended letters', async () => {
		const doc = await PDFDocument.create();
		const fonts = await embedLora(doc, ['regular', 'bold']);
		const page = doc.addPage([595.28, 841.89]);
		page.drawText('Zoë Łukasiewicz-Øberg', { x: 50, y: 700, size: 18, font: fonts.bold });
		page.drawText('Point repair DN100–DN150', { x: 50, y: 670, size: 12, font: fonts.regular });
		const bytes = await doc.save();
		expect(bytes.length).toBeLessThan(30_000);
		// unpdf (pdf.js) as the independent reader
		const { text } = await extractText(await getDocumentProxy(new Uint8Array(bytes)), { mergePages: true });
		expect(text).toContain('Zoë Łukasiewicz-Øberg');
		expect(text).toContain('DN100–DN150');
		// poppler's pdffonts lists both Lora faces as embedded (pdf-lib names subsets with a
		// numeric suffix rather than the six-letter tag, so the size bound above is the subset check:
		// one Lora TTF alone is over 100 KB)
		const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'pdf-')), 'f.pdf');
		fs.writeFileSync(file, bytes);
		const fonts_ = execFileSync('pdffonts', [file]).toString();
		const lora = fonts_.split('\n').filter((l) => /^Lora-(Bold|Regular)/.test(l));
		expect(lora).toHaveLength(2);
		expect(lora.every((l) => /Identity-H\s+yes/.test(l))).toBe(true);
	});
});
