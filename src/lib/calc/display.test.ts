import { describe, expect, it } from 'vitest';
import { unit } from 'mathjs';
import {
	fieldMessage,
	formatInput,
	formatResult,
	inputUnit,
	offersUnitSwitch,
	readInput,
	resultUnits
} from './display';
import { calculators } from './index';

const diameter = calculators['resin-quantity'].inputs[0];

describe('showing calculators in metric or imperial units', () => {
	it('shows a millimetre field in inches for imperial, and reads it back (mathjs units as reference)', () => {
		expect(inputUnit(diameter, 'imperial')).toBe('in');
		expect(formatInput(150, diameter, 'in')).toBe(String(Number(unit(150, 'mm').toNumber('in').toPrecision(4))));
		expect(readInput('6', diameter, 'in')).toBeCloseTo(unit(6, 'in').toNumber('mm'), 10);
	});

	it('reads decimal commas, empty fields and text', () => {
		expect(readInput('1,5', calculators['resin-quantity'].inputs[4], '')).toBe(1.5);
		expect(readInput('  ', diameter, 'mm')).toBeUndefined();
		expect(readInput('abc', diameter, 'mm')).toBe('abc');
		expect(readInput('1,500', diameter, 'mm')).toBe('1,500');
	});

	it('keeps the units of choice fields, whose values are fixed', () => {
		const drop = calculators['air-test'].inputs.find((s) => s.name === 'dropPsig')!;
		expect(inputUnit(drop, 'metric')).toBe('psi');
	});

	it('restates a range message in the shown unit', () => {
		expect(fieldMessage(diameter, 'Must be between 50 and 1600 mm', 'in')).toBe('Must be between 1.969 and 62.99 in');
		expect(fieldMessage(diameter, 'Required', 'in')).toBe('Required');
	});

	it('converts results of one unit, and leaves alone results already given in several units', () => {
		expect(resultUnits(calculators['resin-quantity'], 'imperial')).toMatchObject({ resinKg: 'lb', matAreaM2: 'ft2' });
		expect(resultUnits(calculators['end-thrust'], 'imperial')).toEqual({ forceKN: 'kN', forceKgf: 'kgf', forceLbf: 'lbf' });
		expect(resultUnits(calculators['f1216-partial'], 'metric')).toMatchObject({ thicknessIn: 'in', thicknessMm: 'mm' });
	});

	it('offers a unit switch only where it changes something', () => {
		expect(offersUnitSwitch(calculators['resin-quantity'])).toBe(true);
		expect(offersUnitSwitch(calculators['end-thrust'])).toBe(true);
		expect(offersUnitSwitch(calculators['groundwater-head'])).toBe(true);
	});

	it('prints results with units converted, booleans as words', () => {
		expect(formatResult(1.17056, 'kg', 'lb')).toBe(unit(1.17056, 'kg').toNumber('lbm').toFixed(2));
		expect(formatResult(true, '', '')).toBe('Yes');
		expect(formatResult('X1.1', '', '')).toBe('X1.1');
	});
});
