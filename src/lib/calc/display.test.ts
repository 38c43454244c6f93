import { describe, expect, it } from 'vitest';
import { unit } from 'mathjs';
import {
	fieldMessage,
	formatInput,
	formatResult,
	inputUnit,
	offersUnitSwitch,
	readInput,
	resultUnits,
	resultRows,
	inputHelp
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
		expect(resultUnits(calculators['f1216-partial'], 'metric')).toMatchObject({ thicknessIn: 'in', thicknessMm: 'mm', thicknessBucklingIn: 'mm' });
	});

	it('lists a result given in several units once, led by the unit of the system shown', () => {
		const metric = resultRows(calculators['f1216-partial'], 'metric');
		expect(metric.filter((r) => r.label === 'Wall thickness')).toEqual([
			{ label: 'Wall thickness', primary: { name: 'thicknessMm', unit: 'mm' }, also: [{ name: 'thicknessIn', unit: 'in' }] }
		]);
		expect(metric.find((r) => r.primary.name === 'thicknessBendingIn')?.primary.unit).toBe('mm');
		const imperial = resultRows(calculators['f1216-full'], 'imperial');
		expect(imperial.filter((r) => r.label === 'Wall thickness').map((r) => r.primary.unit)).toEqual(['in']);
		expect(resultRows(calculators['end-thrust'], 'metric')).toHaveLength(1);
		for (const def of Object.values(calculators)) {
			const labels = resultRows(def, 'metric').map((r) => r.label);
			expect(new Set(labels).size, def.id).toBe(labels.length);
		}
	});

	it('words an input’s help for the system shown', () => {
		const pressure = calculators['f1216-partial'].inputs.find((s) => s.name === 'pressurePsi')!;
		expect(inputHelp(pressure, 'metric')).toContain('kPa per metre');
		expect(inputHelp(pressure, 'imperial')).toContain('psi per foot');
		// No help line quotes a unit of the other system alone.
		for (const def of Object.values(calculators)) {
			for (const spec of def.inputs) {
				const outside = (system: 'metric' | 'imperial') => (inputHelp(spec, system) ?? '').replace(/\([^)]*\)/g, '');
				expect(outside('metric'), `${def.id}.${spec.name}`).not.toMatch(/\d ?(psi|in|ft)\b/);
				expect(outside('imperial'), `${def.id}.${spec.name}`).not.toMatch(/\d ?(mm|kPa|MPa|bar|m)\b/);
			}
		}
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
