import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { unit as mathUnit } from 'mathjs';
import {
	convert,
	displayUnit,
	quantityOf,
	resolveUnit,
	unitCodes,
	unitLabel,
	type Quantity
} from './units';

/**
 * Reference: the mathjs units library (npm "mathjs"), an independent implementation.
 * Each of our unit codes is written as a mathjs expression, scaled where mathjs has no
 * unit of its own: a conventional metre of water is 100 cmH2O and a foot of water
 * 30.48 cmH2O (mathjs defines cmH2O as 98.0665 Pa, NIST SP 811 Appendix B).
 */
const MATHJS: Record<string, { expr: string; scale?: number }> = {
	mm: { expr: 'mm' },
	cm: { expr: 'cm' },
	m: { expr: 'm' },
	in: { expr: 'in' },
	ft: { expr: 'ft' },
	'L/m2': { expr: 'L/m^2' },
	mm2: { expr: 'mm^2' },
	cm2: { expr: 'cm^2' },
	m2: { expr: 'm^2' },
	in2: { expr: 'in^2' },
	ft2: { expr: 'ft^2' },
	mL: { expr: 'mL' },
	L: { expr: 'L' },
	m3: { expr: 'm^3' },
	in3: { expr: 'in^3' },
	gal: { expr: 'gal' },
	ft3: { expr: 'ft^3' },
	g: { expr: 'g' },
	kg: { expr: 'kg' },
	oz: { expr: 'oz' },
	lb: { expr: 'lbm' },
	Pa: { expr: 'Pa' },
	kPa: { expr: 'kPa' },
	MPa: { expr: 'MPa' },
	mbar: { expr: 'mbar' },
	bar: { expr: 'bar' },
	psi: { expr: 'psi' },
	mH2O: { expr: 'cmH2O', scale: 100 },
	ftH2O: { expr: 'cmH2O', scale: 30.48 },
	inH2O: { expr: 'cmH2O', scale: 2.54 },
	N: { expr: 'N' },
	kN: { expr: 'kN' },
	kgf: { expr: 'kgf' },
	lbf: { expr: 'lbf' },
	s: { expr: 's' },
	min: { expr: 'min' },
	h: { expr: 'h' },
	K: { expr: 'K' },
	degC: { expr: 'degC' },
	degF: { expr: 'degF' },
	'g/m2': { expr: 'g/m^2' },
	'kg/m2': { expr: 'kg/m^2' },
	'oz/ft2': { expr: 'oz/ft^2' },
	'kg/m3': { expr: 'kg/m^3' },
	'g/cm3': { expr: 'g/cm^3' },
	'kg/L': { expr: 'kg/L' },
	'lb/gal': { expr: 'lbm/gal' },
	'lb/ft3': { expr: 'lbf/ft^3' },
	'kN/m3': { expr: 'kN/m^3' },
	deg: { expr: 'deg' },
	rad: { expr: 'rad' }
};

/** mathjs's answer for `value fromUnit` expressed in `toUnit`. */
function reference(value: number, from: string, to: string): number {
	const a = MATHJS[from];
	const b = MATHJS[to];
	return mathUnit(value * (a.scale ?? 1), a.expr).toNumber(b.expr) / (b.scale ?? 1);
}

function closeTo(actual: number, expected: number, relative = 1e-9) {
	const tolerance = Math.max(Math.abs(expected) * relative, 1e-9);
	expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tolerance);
}

const byQuantity = new Map<Quantity, string[]>();
for (const code of unitCodes()) {
	const quantity = quantityOf(code)!;
	if (quantity === 'ratio') continue;
	byQuantity.set(quantity, [...(byQuantity.get(quantity) ?? []), code]);
}

describe('convert, against mathjs units', () => {
	it('has a mathjs reference for every unit except plain ratios', () => {
		const missing = unitCodes().filter((c) => quantityOf(c) !== 'ratio' && !(c in MATHJS));
		expect(missing).toEqual([]);
	});

	for (const [quantity, codes] of byQuantity) {
		for (const from of codes) {
			for (const to of codes) {
				it(`${quantity}: ${from} -> ${to}`, () => {
					for (const value of [1, 2.5, 150, 0.0433]) {
						closeTo(convert(value, from, to), reference(value, from, to));
					}
				});
			}
		}
	}

	it('matches mathjs for random values and unit pairs (fast-check)', () => {
		const pairs = [...byQuantity.values()].flatMap((codes) =>
			codes.flatMap((a) => codes.map((b) => [a, b] as const))
		);
		fc.assert(
			fc.property(
				fc.constantFrom(...pairs),
				fc.double({ min: -1e4, max: 1e4, noNaN: true }),
				([from, to], value) => {
					closeTo(convert(value, from, to), reference(value, from, to), 1e-9);
				}
			)
		);
	});
});

describe('convert, published check values', () => {
	it('1 bar = 100 kPa = 14.5038 psi; 1 psi = 6.89476 kPa (NIST SP 811, Appendix B)', () => {
		expect(convert(1, 'bar', 'kPa')).toBeCloseTo(100, 10);
		expect(convert(1, 'bar', 'psi')).toBeCloseTo(14.5038, 4);
		expect(convert(1, 'psi', 'kPa')).toBeCloseTo(6.89476, 5);
	});

	it('1 m of water = 9.80665 kPa and 1 ft of water = 0.4335 psi (conventional, NIST SP 811)', () => {
		expect(convert(1, 'mH2O', 'kPa')).toBeCloseTo(9.80665, 10);
		expect(convert(1, 'ftH2O', 'psi')).toBeCloseTo(0.4335, 4);
	});

	it('100 degC = 212 degF = 373.15 K; -40 degC = -40 degF (definitions of the scales)', () => {
		expect(convert(100, 'degC', 'degF')).toBeCloseTo(212, 10);
		expect(convert(100, 'degC', 'K')).toBeCloseTo(373.15, 10);
		expect(convert(-40, 'degF', 'degC')).toBeCloseTo(-40, 10);
	});

	it('plain ratios: 15 % = 0.15', () => {
		expect(convert(15, '%', '')).toBeCloseTo(0.15, 12);
		expect(convert(0.5, '', '%')).toBeCloseTo(50, 12);
	});
});

describe('aliases and errors', () => {
	it.each([
		['m²', 'm2'],
		['sq ft', 'ft2'],
		['litres', 'L'],
		['l', 'L'],
		['°C', 'degC'],
		['°F', 'degF'],
		['psig', 'psi'],
		['KPA', 'kPa'],
		['lbs', 'lb'],
		['hours', 'h'],
		['m H2O', 'mH2O'],
		['gsm', 'g/m2'],
		['pcf', 'lb/ft3']
	])('reads "%s" as %s', (alias, code) => {
		expect(resolveUnit(alias)).toBe(code);
	});

	it('keeps milli- and mega-pascal apart', () => {
		expect(resolveUnit('MPa')).toBe('MPa');
		expect(convert(1, 'MPa', 'kPa')).toBe(1000);
	});

	it('throws for an unknown unit and for mixed quantities', () => {
		expect(() => convert(1, 'furlong', 'm')).toThrow(/Unknown unit/);
		expect(() => convert(1, 'bar', 'kg')).toThrow(/Cannot convert/);
		expect(quantityOf('furlong')).toBeUndefined();
	});

	it('labels units for people', () => {
		expect(unitLabel('m2')).toBe('m²');
		expect(unitLabel('degC')).toBe('°C');
		expect(unitLabel('g/m2')).toBe('g/m²');
	});

	it('chooses a same-quantity display unit for each system', () => {
		expect(displayUnit('mm', 'imperial')).toBe('in');
		expect(displayUnit('mm', 'metric')).toBe('mm');
		expect(displayUnit('psi', 'metric')).toBe('kPa');
		expect(displayUnit('min', 'imperial')).toBe('min');
		for (const code of unitCodes()) {
			for (const system of ['metric', 'imperial'] as const) {
				expect(quantityOf(displayUnit(code, system))).toBe(quantityOf(code));
			}
		}
	});
});
