/**
 * A Svelte action that keeps every label of an SVG at least `minPx` CSS pixels tall as it is
 * drawn, however small the picture is scaled on a phone. A drawing states its labels' sizes
 * in its own viewBox units; when the svg is shrunk to fit a 360 px screen those would fall
 * below a readable size, so a label that would is enlarged just enough. Nothing changes where
 * the picture is drawn at full size. Runs in the browser only (server HTML keeps the sizes).
 */
export const MIN_LABEL_PX = 12;

export function fitLabels(svg: SVGSVGElement, minPx: number = MIN_LABEL_PX) {
	const own = new WeakMap<SVGTextElement, number>();

	function fit() {
		for (const text of svg.querySelectorAll('text')) {
			if (!own.has(text)) own.set(text, parseFloat(getComputedStyle(text).fontSize));
			const ctm = text.getScreenCTM();
			if (!ctm) continue;
			const scale = Math.hypot(ctm.a, ctm.b);
			const size = own.get(text)!;
			if (!scale || !size) continue;
			// A hair above the minimum so that rounding never lands below it.
			text.style.fontSize = size * scale < minPx ? `${(minPx / scale + 0.05).toFixed(2)}px` : '';
		}
	}

	const resized = new ResizeObserver(fit);
	resized.observe(svg);
	// Labels that appear or change (live calculator pictures) are fitted as well.
	const changed = new MutationObserver(fit);
	changed.observe(svg, { childList: true, subtree: true, characterData: true });
	fit();
	return {
		destroy() {
			resized.disconnect();
			changed.disconnect();
		}
	};
}
