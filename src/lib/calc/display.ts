/**
 * How a calculator's inputs and results are shown to a person working in metric or
 * imperial units. Pure helpers for the calculator component; the library itself always
 * computes in the units its InputSpec and ResultSpec state.
 */
import type { CalculatorDef, InputSpec, ResultValue } from './types';
import { convert, displayUnit, quantityOf, type UnitSystem } from './units';
import { isNumericText, rangeMessage } from './validate';
import { num, plain } from './worksheet';

/** The unit a field is typed in. Choice fields keep their own unit: their values are fixed. */
export function inputUnit(spec: InputSpec, system: UnitSystem): string {
	return spec.choices ? spec.unit : displayUnit(spec.unit, system);
}

/**
 * The unit each result is shown in. Results the calculator already gives in several units of
 * one quantity (kN, kgf and lbf; in and mm) are shown as they are.
 */
export function resultUnits(def: CalculatorDef, system: UnitSystem): Record<string, string> {
	const unitsByQuantity = new Map<string, Set<string>>();
	for (const r of def.results) {
		const q = quantityOf(r.unit) ?? r.unit;
		unitsByQuantity.set(q, (unitsByQuantity.get(q) ?? new Set()).add(r.unit));
	}
	return Object.fromEntries(
		def.results.map((r) => {
			const mixed = (unitsByQuantity.get(quantityOf(r.unit) ?? r.unit)?.size ?? 0) > 1;
			return [r.name, mixed ? r.unit : displayUnit(r.unit, system)];
		})
	);
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
