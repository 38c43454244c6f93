import { describe, expect, it } from 'vitest';
import { courses } from '$lib/content';
import { buildSearchIndex, lessonSources, loadSearchIndex, searchLessons } from '$lib/content/search';
import { formatMoney } from '$lib/money';

const raw = import.meta.glob<string>('/content/courses/*/lessons/*.md', { query: '?raw', import: 'default', eager: true });

const sources = lessonSources(courses, raw);

describe('lesson search', () => {
	const index = loadSearchIndex(buildSearchIndex(sources));

	it('indexes every lesson and survives the JSON round trip', () => {
		expect(index.documentCount).toBe(sources.length);
	});

	it('ranks the lesson named by the words first, and finds words inside the text', () => {
		expect(searchLessons(index, 'witness cup')[0].href).toBe('/courses/point-repair-installer/cure-and-witness-cup');
		expect(searchLessons(index, 'diisocyanate').map((h) => h.href)).toContain('/courses/packer-pressure-safety/resin-and-fibre-hazards');
		// Prefix and small typos still match.
		expect(searchLessons(index, 'transiti').length).toBeGreaterThan(0);
		expect(searchLessons(index, 'groundwatr head').map((h) => h.href)).toContain('/courses/packer-pressure-safety/groundwater-head-and-pressure-window');
	});

	it('returns nothing for an empty query or unknown words, and carries title, course and preview', () => {
		expect(searchLessons(index, '   ')).toEqual([]);
		expect(searchLessons(index, 'qqxzv')).toEqual([]);
		const hit = searchLessons(index, 'defects patch fixes').find((h) => h.href.endsWith('/the-job-and-defects'));
		expect(hit).toMatchObject({ title: 'The job and the defects', courseTitle: 'Point-repair installer', preview: true });
	});

	it('does not index the code, math or component props of a lesson', () => {
		expect(searchLessons(index, 'svelte')).toEqual([]);
		expect(searchLessons(index, 'CheckYourself')).toEqual([]);
		expect(searchLessons(index, 'resinGlassRatio')).toEqual([]);
	});
});

describe('formatMoney', () => {
	it('formats integer minor units with the currency', () => {
		expect(formatMoney(39000, 'EUR')).toBe('€390.00');
		expect(formatMoney(4950, 'GBP')).toBe('£49.50');
		// Yen has no minor unit (ISO 4217), so the count is already whole yen.
		expect(formatMoney(1000, 'JPY')).toBe('JP¥1,000');
	});
});
