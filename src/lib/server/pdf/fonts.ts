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

/**
 * OpenType shaping (GSUB/GPOS lookups) is the slowest part of drawing text with fontkit and
 * buys nothing for short Latin lines set in precomposed letters; without ligatures the text
 * also extracts letter for letter ("fi", not a ligature glyph).
 */
const plainLatin = Object.fromEntries(
	['ccmp', 'locl', 'rlig', 'mark', 'mkmk', 'calt', 'clig', 'liga', 'rclt', 'curs', 'kern', 'dlig'].map((f) => [f, false])
);

const cache = new Map<LoraWeight, Uint8Array>();
const parsed = new WeakMap<Uint8Array, unknown>();

/**
 * fontkit parses a font's tables and builds its shaping caches on first use, which costs far
 * more than drawing a page. pdf-lib calls `create` once per document; this hands it the same
 * parsed font for the same bytes, so a process parses each weight once. (Subsets are still
 * made per document from the glyphs that document uses.)
 */
/**
 * pdf-lib lays out every string twice (width, then glyphs) and the same labels recur in every
 * certificate; the glyph runs depend only on the text and features, so they are kept per font.
 */
function memoiseLayout<F>(font: F): F {
	const f = font as unknown as { layout(text: string, features?: unknown): unknown };
	const layout = f.layout.bind(font);
	const runs = new Map<string, unknown>();
	f.layout = (text: string, features?: unknown) => {
		if (features !== undefined && features !== plainLatin) return layout(text, features);
		let run = runs.get(text);
		if (run === undefined) {
			if (runs.size > 5000) runs.clear();
			run = layout(text, features);
			runs.set(text, run);
		}
		return run;
	};
	return font;
}

const cachingFontkit = {
	create(bytes: Uint8Array, postscriptName?: string) {
		let font = parsed.get(bytes);
		if (!font) {
			font = memoiseLayout(fontkit.create(bytes as Buffer, postscriptName));
			parsed.set(bytes, font);
		}
		return font;
	}
} as unknown as typeof fontkit;

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
	doc.registerFontkit(cachingFontkit);
	const fonts = {} as Record<W, PDFFont>;
	for (const weight of weights) fonts[weight] = await doc.embedFont(loraBytes(weight), { subset: true, features: plainLatin });
	return fonts;
}
