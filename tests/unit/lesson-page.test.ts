import { describe, expect, it } from 'vitest';
import { LESSON_BODY_SLOT } from '$lib/components/lesson/islands';
import { pageWithBody } from '$lib/server/lesson-html';

/** The lesson body goes into the finished page as bytes encoded once (hooks.server.ts, `lessonBody`). */
describe('a lesson page put together from bytes', () => {
	const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);
	const body = new TextEncoder().encode('<p>Mix 1.2 kg × 3 plies at 20 °C</p>');

	it('puts the body in the slot, characters beyond ASCII on both sides intact', () => {
		const page = `<main>Lektion · ${LESSON_BODY_SLOT} · Schluss ✓</main>`;
		expect(decode(pageWithBody(page, body))).toBe('<main>Lektion · <p>Mix 1.2 kg × 3 plies at 20 °C</p> · Schluss ✓</main>');
	});

	it('gives a page without the slot back as it is, and fills only the first slot', () => {
		expect(decode(pageWithBody('<main>no slot ✓</main>', body))).toBe('<main>no slot ✓</main>');
		expect(decode(pageWithBody(`${LESSON_BODY_SLOT}${LESSON_BODY_SLOT}`, body))).toBe(`<p>Mix 1.2 kg × 3 plies at 20 °C</p>${LESSON_BODY_SLOT}`);
	});
});
