/**
 * How a calculator's inputs and results are shown to a person working in metric or
 * imperial units. Pure helpers for the calculator component; the library itself always
 * computes in the units its InputSpec and ResultSpec state.
 */
import type { CalculatorDef, InputSpec, ResultValue } from './types';
import { convert, displayUnit, quantityOf, systemOf, type UnitSystem } from './units';
import { isNumericText, rangeMessage } from './fields';
import { num, plain } from './worksheet';

/** The unit a field is typed in. Choice fields keep their own unit: their values are fixed. */
export function inputUnit(spec: InputSpec, system: UnitSystem): string {
	return spec.choices ? spec.unit : displayUnit(spec.unit, system);
}

/** One line of results: a value in the unit of the system shown, and the same value in other units. */
export interface ResultRow {
	label: string;
	/** The result shown first, and the unit it is shown in. */
	primary: { name: string; unit: string };
	/** The same quantity as the calculator also gives it, in its own units ("4.8 mm" beside "0.19 in"). */
	also: { name: string; unit: string }[];
}

/**
 * How results are listed: results that a calculator gives under one label in several units
 * (wall thickness in in and mm; thrust in kN, kgf and lbf) become one line led by the unit of
 * the system shown; every other result is converted into that system.
 */
export function resultRows(def: CalculatorDef, system: UnitSystem): ResultRow[] {
	const groups = new Map<string, CalculatorDef['results']>();
	for (const r of def.results) {
		const key = `${r.label}\u0000${quantityOf(r.unit) ?? r.unit}`;
		groups.set(key, [...(groups.get(key) ?? []), r]);
	}
	return [...groups.values()].map((members) => {
		if (members.length === 1) {
			const [r] = members;
			return { label: r.label, primary: { name: r.name, unit: displayUnit(r.unit, system) }, also: [] };
		}
		const lead = members.find((m) => systemOf(m.unit) === system) ?? members.find((m) => systemOf(m.unit) === undefined) ?? members[0];
		return {
			label: lead.label,
			primary: { name: lead.name, unit: lead.unit },
			also: members.filter((m) => m !== lead).map((m) => ({ name: m.name, unit: m.unit }))
		};
	});
}

/** The unit each result is shown in (see resultRows). */
export function resultUnits(def: CalculatorDef, system: UnitSystem): Record<string, string> {
	return Object.fromEntries(resultRows(def, system).flatMap((row) => [row.primary, ...row.also].map((r) => [r.name, r.unit])));
}

/** An input's help line for the system shown: `helpBySystem` when the calculator words it per system. */
export function inputHelp(spec: InputSpec, system: UnitSystem): string | undefined {
	return spec.helpBySystem?.[system] ?? spec.help;
}

/** Whether a metric/imperial switch would change anything for this calculator. */
export function offersUnitSwitch(def: CalculatorDef): boolean {
	const other: UnitSystem = def.system === 'metric' ? 'imperial' : 'metric';
	const inputs = def.inputs.some((s) => inputUnit(s, other) !== s.unit);
	const results = Object.entries(resultUnits(def, other)).some(
		([name, unit]) => def.results.find((r) => r.name === name)!.unit !== unit
	);
	return inputs || results;
}

/** A value in the spec's unit, written for a field shown in `unit`: up to 4 figures, no padding. */
export function formatInput(value: number, spec: InputSpec, unit: string): string {
	const shown = unit === spec.unit ? value : convert(value, spec.unit, unit);
	return plain(shown, unit === spec.unit ? 6 : 4).replace(/,/g, '');
}

/**
 * What a person typed, in the spec's unit: a number, undefined for an empty field, or the
 * text itself (which validation reports as not a number). A decimal comma is accepted
 * unless it could be a thousands separator.
 */
export function readInput(text: string, spec: InputSpec, unit: string): unknown {
	const trimmed = text.trim().replace(/\s/g, '');
	if (trimmed === '') return undefined;
	// "1,500" could mean 1.5 or 1500: refuse it rather than guess.
	if (/^[+-]?[1-9]\d{0,2},\d{3}$/.test(trimmed)) return text;
	const normalised = /^[+-]?\d*,\d+$/.test(trimmed) ? trimmed.replace(',', '.') : trimmed;
	if (!isNumericText(normalised)) return text;
	const value = Number(normalised);
	return unit === spec.unit ? value : convert(value, unit, spec.unit);
}

/** A field's error restated in the unit the field is shown in. */
export function fieldMessage(spec: InputSpec, message: string, unit: string): string {
	if (unit === spec.unit || !message.startsWith('Must be between')) return message;
	const lo = convert(spec.min, spec.unit, unit);
	const hi = convert(spec.max, spec.unit, unit);
	return rangeMessage(Number(lo.toPrecision(4)), Number(hi.toPrecision(4)), unit);
}

/** A result value in `unit` (converted from the spec's unit), ready to print. */
export function formatResult(value: ResultValue, fromUnit: string, unit: string): string {
	if (typeof value === 'boolean') return value ? 'Yes' : 'No';
	if (typeof value === 'string') return value;
	const shown = unit === fromUnit ? value : convert(value, fromUnit, unit);
	return num(shown, Math.abs(shown) >= 1000 ? 4 : 3);
}
