import { describe, expect, it } from 'vitest';
import { calculators } from './index';
import { checkField, checkInputs } from './fields';
import type { InputSpec } from './types';
import { parseInputs } from './validate';

// The contract of the field checks (./fields), shared by the browser's live calculators and
// the server's edge (./validate). Not trade facts: the wording and limits are the app's own.
const plies: InputSpec = { name: 'plies', label: 'Plies', unit: '', default: 2, min: 1, max: 6, integer: true };
const drop: InputSpec = { name: 'dropPsig', label: 'Drop', unit: 'psig', default: 1, min: 0.5, max: 1, choices: [0.5, 1] };
const waste: InputSpec = { name: 'wastePct', label: 'Waste', unit: '%', default: 15, min: 0, max: 50, optional: true };

describe('checkField', () => {
	it('reads numbers and numeric text alike, trimming spaces', () => {
		expect(checkField(plies, 3)).toEqual({ ok: true, value: 3 });
		expect(checkField(plies, ' 3 ')).toEqual({ ok: true, value: 3 });
		expect(checkField(waste, '2.5e1')).toEqual({ ok: true, value: 25 });
	});

	it('gives an optional field its default when left out, empty or null', () => {
		for (const raw of [undefined, null, '', '   ']) expect(checkField(waste, raw)).toEqual({ ok: true, value: 15 });
	});

	it('names a required field left out', () => {
		for (const raw of [undefined, null, '']) expect(checkField(plies, raw)).toEqual({ ok: false, message: 'Required' });
	});

	it('refuses what is not a finite number', () => {
		for (const raw of ['three', '1e999', Number.NaN, Number.POSITIVE_INFINITY, true, {}, [], '0x10']) {
			expect(checkField(plies, raw), String(raw)).toEqual({ ok: false, message: 'Must be a number' });
		}
	});

	it('checks whole numbers, then the range, then the choices, and gives the first failure', () => {
		expect(checkField(plies, 2.5)).toEqual({ ok: false, message: 'Must be a whole number' });
		expect(checkField(plies, 7.5)).toEqual({ ok: false, message: 'Must be a whole number' });
		expect(checkField(plies, 7)).toEqual({ ok: false, message: 'Must be between 1 and 6' });
		expect(checkField(drop, 0.75)).toEqual({ ok: false, message: 'Must be one of 0.5, 1' });
		expect(checkField(drop, 2)).toMatchObject({ ok: false, message: expect.stringMatching(/^Must be between 0.5 and 1 /) });
	});
});

describe('the browser and the server check alike', () => {
	// Values around each limit, plus text, blanks and junk: every calculator, every field.
	const probes = (spec: InputSpec): unknown[] => [
		spec.min,
		spec.max,
		spec.min - 1,
		spec.max + 1,
		(spec.min + spec.max) / 2,
		String(spec.default),
		'',
		'abc',
		null
	];

	for (const def of Object.values(calculators)) {
		it(`${def.id}: the same message for each field from the live calculator and the API`, () => {
			for (const spec of def.inputs) {
				for (const probe of probes(spec)) {
					const values = { ...Object.fromEntries(def.inputs.map((s) => [s.name, s.default])), [spec.name]: probe };
					expect(parseInputs(def, values), `${spec.name} = ${String(probe)}`).toEqual(checkInputs(def, values));
				}
			}
		});
	}

	it('only the server refuses names a calculator does not take; the browser never sends them', () => {
		const def = calculators['end-thrust'];
		const values = { diameterMm: 100, pressureBar: 1, depthM: 2 };
		expect(checkInputs(def, values)).toMatchObject({ ok: true });
		expect(parseInputs(def, values)).toMatchObject({ ok: false, errors: { depthM: expect.stringContaining('Unknown input') } });
	});
});
