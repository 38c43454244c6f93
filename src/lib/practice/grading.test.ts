import { unit as mathUnit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { formatAmount, gradeNumeric, readNumber, unitChoices, unitSlip, withinTolerance } from './grading';

const resin = { value: 1.1716, unit: 'kg' };

describe('reading a typed number', () => {
	it('takes numbers, decimal text, a decimal comma and min:s', () => {
		expect(readNumber(1.17)).toEqual({ ok: true, value: 1.17 });
		expect(readNumber(' 1.17 ')).toEqual({ ok: true, value: 1.17 });
		expect(readNumber('1,17')).toEqual({ ok: true, value: 1.17 });
		expect(readNumber('.5')).toEqual({ ok: true, value: 0.5 });
		expect(readNumber('1:53', 'min')).toEqual({ ok: true, value: 1 + 53 / 60 });
		expect(readNumber('2:30', 'h')).toEqual({ ok: true, value: 2.5 });
	});

	it('refuses empty, non-numeric and ambiguous text with a reason', () => {
		expect(readNumber('')).toMatchObject({ ok: false, empty: true });
		expect(readNumber('   ')).toMatchObject({ ok: false, empty: true });
		expect(readNumber(null)).toMatchObject({ ok: false, empty: true });
		expect(readNumber(undefined)).toMatchObject({ ok: false, empty: true });
		expect(readNumber('abc')).toMatchObject({ ok: false, empty: false });
		expect(readNumber('1.2.3')).toMatchObject({ ok: false, empty: false });
		expect(readNumber(Number.NaN)).toMatchObject({ ok: false, empty: false });
		expect(readNumber(Infinity)).toMatchObject({ ok: false, empty: false });
		expect(readNumber(true)).toMatchObject({ ok: false, empty: false });
		expect(readNumber('1:53', 's')).toMatchObject({ ok: false });
		const ambiguous = readNumber('1,414');
		expect(ambiguous).toMatchObject({ ok: false, empty: false });
		expect(!ambiguous.ok && ambiguous.message).toMatch(/decimal or thousands/);
	});
});

describe('grading a numeric answer', () => {
	it('accepts a rounded answer and the same amount in another unit', () => {
		expect(gradeNumeric(resin, { value: 1.17, unit: 'kg' }, 2)).toMatchObject({ correct: true, outcome: 'correct' });
		expect(gradeNumeric(resin, { value: '1172', unit: 'g' }, 2)).toMatchObject({ correct: true });
		expect(gradeNumeric(resin, { value: 2.58, unit: 'lb' }, 2)).toMatchObject({ correct: true });
		expect(gradeNumeric(resin, { value: 1.2, unit: 'kilograms' }, 3)).toMatchObject({ correct: true });
	});

	it('converts accepted units as mathjs does (independent units library)', () => {
		const pressure = { value: 2.03, unit: 'bar' };
		const inPsi = mathUnit(2.03, 'bar').toNumber('psi');
		const inKPa = mathUnit(2.03, 'bar').toNumber('kPa');
		expect(gradeNumeric(pressure, { value: inPsi, unit: 'psi' }, 0.01).correct).toBe(true);
		expect(gradeNumeric(pressure, { value: inKPa, unit: 'kPa' }, 0.01).correct).toBe(true);
		const grade = gradeNumeric({ value: 3.53, unit: 'kN' }, { value: mathUnit(3.53, 'kN').toNumber('lbf'), unit: 'lbf' }, 0.01);
		expect(grade.valueInUnit).toBeCloseTo(3.53, 9);
	});

	it('includes both tolerance bounds and refuses just outside them', () => {
		const expected = { value: 100, unit: 'mm' };
		expect(gradeNumeric(expected, { value: 102, unit: 'mm' }, 2).correct).toBe(true);
		expect(gradeNumeric(expected, { value: 98, unit: 'mm' }, 2).correct).toBe(true);
		expect(gradeNumeric(expected, { value: 102.01, unit: 'mm' }, 2).correct).toBe(false);
		expect(gradeNumeric(expected, { value: 97.99, unit: 'mm' }, 2).correct).toBe(false);
		// 10.2 cm is exactly on the bound after conversion, despite binary fractions.
		expect(gradeNumeric(expected, { value: 10.2, unit: 'cm' }, 2).correct).toBe(true);
		expect(gradeNumeric({ value: 0.3, unit: 'bar' }, { value: 0.1 + 0.2, unit: 'bar' }, 0).correct).toBe(true);
	});

	it('reports the deviation in percent, signed', () => {
		const grade = gradeNumeric({ value: 200, unit: 'min' }, { value: 3, unit: 'h' }, 3);
		expect(grade.correct).toBe(false);
		expect(grade.deviationPercent).toBeCloseTo(-10, 9);
		expect(grade.message).toMatch(/200 min/);
	});

	it('says clearly what is wrong with an empty, non-numeric or unit-less answer', () => {
		expect(gradeNumeric(resin, { value: '', unit: 'kg' }, 2)).toMatchObject({ correct: false, outcome: 'empty' });
		expect(gradeNumeric(resin, null, 2)).toMatchObject({ correct: false, outcome: 'empty' });
		expect(gradeNumeric(resin, { value: 'lots', unit: 'kg' }, 2)).toMatchObject({ correct: false, outcome: 'not-a-number' });
		expect(gradeNumeric(resin, { value: 1.17 }, 2)).toMatchObject({ correct: false, outcome: 'missing-unit' });
		expect(gradeNumeric(resin, { value: 1.17, unit: ' ' }, 2)).toMatchObject({ correct: false, outcome: 'missing-unit' });
		expect(gradeNumeric(resin, { value: 1.17, unit: 'stone' }, 2)).toMatchObject({ correct: false, outcome: 'unknown-unit' });
		expect(gradeNumeric(resin, { value: 1.17, unit: 42 }, 2)).toMatchObject({ correct: false, outcome: 'missing-unit' });
	});

	it('refuses a unit of another quantity, even with the right number', () => {
		const grade = gradeNumeric(resin, { value: 1.17, unit: 'L' }, 2);
		expect(grade).toMatchObject({ correct: false, outcome: 'wrong-quantity' });
		expect(grade.message).toMatch(/volume.*mass/);
		expect(gradeNumeric({ value: 2, unit: 'bar' }, { value: 2, unit: 'kN' }, 2).outcome).toBe('wrong-quantity');
	});

	it('grades plain numbers without a unit when a plain number is asked', () => {
		expect(gradeNumeric({ value: 58, unit: '' }, { value: 58.5 }, 2).correct).toBe(true);
		expect(gradeNumeric({ value: 58, unit: '' }, { value: 58.5, unit: 'mm' }, 2).outcome).toBe('wrong-quantity');
	});

	it('handles a zero expected value without dividing by zero', () => {
		expect(gradeNumeric({ value: 0, unit: 'bar' }, { value: 0, unit: 'psi' }, 2).correct).toBe(true);
		expect(gradeNumeric({ value: 0, unit: 'bar' }, { value: 0.01, unit: 'bar' }, 2).correct).toBe(false);
	});
});

describe('unit slips and unit choices', () => {
	it('spots the right number written in the wrong unit of the same quantity', () => {
		expect(unitSlip({ value: 2.03, unit: 'bar' }, { value: 2.03, unit: 'psi' }, 2)).toBe('bar');
		expect(unitSlip({ value: 29.4, unit: 'psi' }, { value: 29.4, unit: 'bar' }, 2)).toBe('psi');
		expect(unitSlip(resin, { value: 1171.6, unit: 'kg' }, 2)).toBe('g');
		expect(unitSlip(resin, { value: 5, unit: 'kg' }, 2)).toBeUndefined();
	});

	it('offers the unit asked first, then the others of its quantity', () => {
		expect(unitChoices('psi')[0]).toBe('psi');
		expect(unitChoices('psi')).toEqual(expect.arrayContaining(['bar', 'kPa']));
		expect(unitChoices('kg')).toEqual(['kg', 'g', 'lb', 'oz']);
		expect(unitChoices('')).toEqual(['']);
	});

	it('prints amounts with their unit', () => {
		expect(formatAmount(resin)).toBe('1.17 kg');
		expect(formatAmount({ value: 14.1, unit: 'm2' })).toBe('14.1 m²');
		expect(withinTolerance(1.0, 1.0, 0)).toBe(true);
	});
});
