import { describe, expect, it } from 'vitest';
import { courses } from '$lib/content';
import { questionsFor } from '$lib/server/question-bank';

describe('question banks as loaded', () => {
	it('use ×, π, °C and ² where the YAML writes x, pi, degC and ^2', () => {
		let checked = 0;
		for (const c of courses) {
			for (const q of questionsFor(c.slug)) {
				const text = [q.prompt, q.explanation, ...('options' in q ? q.options : [])].join(' ');
				expect(text, `${c.slug}/${q.id}`).not.toMatch(/\d ?degC|\bpi\b| x \d|\^2/);
				checked++;
			}
		}
		expect(checked).toBeGreaterThan(20);
	});
});
