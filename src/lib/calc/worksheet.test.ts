import { describe, expect, it } from 'vitest';
import { given, num, plain, qty, roundSignificant } from './worksheet';

describe('numbers in worked steps', () => {
	it.each([
		[0.15, '0.150'],
		[1413.7, '1414'],
		[125000, '125,000'],
		[831265.4, '831,265'],
		[-12345.6, '-12,346'],
		[0, '0'],
		[2.5e-8, '2.50e-8']
	])('num(%f) = %s', (value, text) => {
		expect(num(value)).toBe(text);
	});

	it('writes inputs as typed, without padding zeros', () => {
		expect(plain(50)).toBe('50');
		expect(plain(0.3)).toBe('0.3');
		expect(plain(125000)).toBe('125,000');
		expect(plain(0.1 + 0.2)).toBe('0.3');
		expect(given(15, '%')).toBe('15 %');
		expect(qty(0.848, 'm2')).toBe('0.848 m²');
	});

	it('rounds answers to six significant figures', () => {
		expect(roundSignificant(0.1 + 0.2)).toBe(0.3);
		expect(roundSignificant(1.1705630989)).toBe(1.17056);
	});
});

describe('grouping at the edge of five digits', () => {
	it('groups a number that rounds up to 10,000, and no smaller one', () => {
		expect(num(9999.7)).toBe('10,000');
		expect(num(9998.7)).toBe('9999');
		expect(plain(9999.9999999)).toBe('10,000');
		expect(plain(9998.5)).toBe('9998.5');
		expect(num(-12345)).toBe('-12,345');
	});
});
