import { describe, expect, it } from 'vitest';
import { workingRoles } from '$lib/roles';
import { formatWhen, formatWhenLocal } from '$lib/practice/format';
import { gradeNumeric, inputNotice } from '$lib/practice/grading';
import { expectedAmount, generateProblem, generators } from '$lib/practice';

describe('input notices before an answer is checked or saved', () => {
	it('flags ambiguous separators and text that is no number', () => {
		expect(inputNotice('1,454', 'm')).toMatchObject({ kind: 'unreadable', blocking: true });
		expect(inputNotice('1.5.5', 'mm')).toMatchObject({ kind: 'unreadable', blocking: true });
		expect(inputNotice('1,5', 'mm')).toBeNull();
		expect(inputNotice('', 'mm')).toBeNull();
	});

	it('refuses impossible signs and says why; temperatures may be below zero', () => {
		expect(inputNotice('-5', 'g')).toMatchObject({ kind: 'sign', blocking: true, message: 'A mass cannot be negative: type it without the minus sign.' });
		expect(inputNotice('-5', 'degC')).toBeNull();
		expect(gradeNumeric({ value: 5, unit: 'g' }, { value: '-5', unit: 'g' }, 2)).toMatchObject({ correct: false, outcome: 'impossible-sign' });
	});

	it('warns of a magnitude no job needs, without blocking', () => {
		expect(inputNotice('1454', 'm')).toMatchObject({ kind: 'magnitude', blocking: false });
		expect(inputNotice('1454', 'mm')).toBeNull();
		expect(inputNotice('0.001', 'mm')).toMatchObject({ kind: 'magnitude' });
		expect(inputNotice('20000', 'kg')).toMatchObject({ kind: 'magnitude' });
		expect(inputNotice('300', 'degC')).toMatchObject({ kind: 'magnitude' });
	});

	it('never warns about a right answer: every generator over 400 seeds', () => {
		for (const id of Object.keys(generators)) {
			for (let seed = 0; seed < 400; seed++) {
				const p = generateProblem(id, seed);
				if (p.kind === 'choice') continue;
				const expected = expectedAmount(p);
				expect(inputNotice(String(expected.value), expected.unit), `${id}#${seed}: ${expected.value} ${expected.unit}`).toBeNull();
			}
		}
	});
});

describe('roles a person works in', () => {
	it('names a trainee only when enrolled, then the platform and company parts', () => {
		expect(workingRoles({ roles: ['trainee', 'inspector'] }, false)).toEqual(['Inspector']);
		expect(workingRoles({ roles: ['trainee', 'trainer'], companies: [{ id: 'c', name: 'Tarn', role: 'admin' }] }, true)).toEqual([
			'Trainee',
			'Trainer',
			'Company admin at Tarn'
		]);
	});
});

describe('times in the reader’s zone', () => {
	it('prints the zone and keeps UTC for the datetime attribute (IANA zone data via Intl)', () => {
		const iso = '2026-03-03T08:05:00.000Z';
		expect(formatWhen(iso)).toBe('3 Mar 2026, 08:05 UTC');
		expect(formatWhenLocal(iso, 'Asia/Tokyo')).toBe('3 Mar 2026, 17:05 GMT+9');
		expect(formatWhenLocal(iso, 'UTC')).toBe('3 Mar 2026, 08:05 UTC');
	});
});

describe('question text uses the signs the rest of the app prints', () => {
	it('writes ×, π, °C, ² and ³ for their ASCII stand-ins, and leaves words alone', async () => {
		const { tradeTypography } = await import('$lib/practice/typography');
		expect(tradeTypography('2 x pi x 225 = 1413.7 mm')).toBe('2 × π × 225 = 1413.7 mm');
		expect(tradeTypography('a cure time of 100 minutes at 22 degC; every 10 degC drop')).toBe('a cure time of 100 minutes at 22 °C; every 10 °C drop');
		expect(tradeTypography('F = p x pi x D^2 / 4 = 1.885 m2, 0.5 m3')).toBe('F = p × π × D² / 4 = 1.885 m², 0.5 m³');
		expect(tradeTypography('Mix part A and part B; pick the pipe')).toBe('Mix part A and part B; pick the pipe');
	});
});
