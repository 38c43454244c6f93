import fs from 'node:fs';
import { createRequire } from 'node:module';
import fontkit from '@pdf-lib/fontkit';
import type { PDFDocument, PDFFont } from 'pdf-lib';

/**
 * Lora (SIL Open Font License 1.1) for PDFs, read as plain TTF from `@expo-google-fonts/lora`
 * (its index module targets another platform, so the files are read by path). fontkit embeds
 * TTF reliably as a subset; the @fontsource package ships only WOFF/WOFF2, which does not.
 */
export type LoraWeight = 'regular' | 'italic' | 'semibold' | 'bold';

const files: Record<LoraWeight, string> = {
	regular: '400Regular/Lora_400Regular.ttf',
	italic: '400Regular_Italic/Lora_400Regular_Italic.ttf',
	semibold: '600SemiBold/Lora_600SemiBold.ttf',
	bold: '700Bold/Lora_700Bold.ttf'
};

const require = createRequire(import.meta.url);
const packageDir = (() => {
	const main = require.resolve('@expo-google-fonts/lora/package.json');
	return main.slice(0, main.length - 'package.json'.length);
})();

const cache = new Map<LoraWeight, Uint8Array>();

/** The TTF bytes of one Lora weight, read once per process. */
export function loraBytes(weight: LoraWeight = 'regular'): Uint8Array {
	let bytes = cache.get(weight);
	if (!bytes) {
		bytes = new Uint8Array(fs.readFileSync(packageDir + files[weight]));
		cache.set(weight, bytes);
	}
	return bytes;
}

/**
 * Embeds Lora weights into a document as subsets (only the glyphs used are written, which
 * keeps a one-page document to a few kilobytes and its text extractable).
 */
export async function embedLora<W extends LoraWeight>(doc: PDFDocument, weights: readonly W[]): Promise<Record<W, PDFFont>> {
	doc.registerFontkit(fontkit);
	const fonts = {} as Record<W, PDFFont>;
	for (const weight of weights) fonts[weight] = await doc.embedFont(loraBytes(weight), { subset: true });
	return fonts;
}
