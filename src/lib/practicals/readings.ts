/**
 * The readings a practical skill calls for, typed by the trainee (or the trainer at an
 * in-person assessment) with their units, and for some of them the key: the calculation
 * library's answer for the same job inputs. A figure within ±5 % of the key agrees with it
 * (the tolerance the course definitions state for the job calculations).
 * Pure and isomorphic: used by the form, the server and the API.
 */
import { runCalculation } from '$lib/calc';
import { convert, quantityOf, unitLabel } from '$lib/calc/units';

export const KEY_TOLERANCE = 0.05;

export interface ReadingKey {
	calculator: string;
	result: string;
	/** Calculator input name -> the name of another reading of the same skill (its job input). */
	inputs: Record<string, string>;
}

export interface ReadingSpec {
	name: string;
	label: string;
	/** The unit the value is compared and stored in; the person may type any unit of the same quantity. */
	unit: string;
	min: number;
	max: number;
	key?: ReadingKey;
}

const choicesByQuantity: Record<string, string[]> = {
	length: ['mm', 'm', 'in', 'ft'],
	mass: ['kg', 'g', 'lb'],
	pressure: ['bar', 'kPa', 'mbar', 'psi'],
	temperature: ['degC', 'degF'],
	time: ['min', 'h'],
	area: ['m2', 'ft2'],
	volume: ['L', 'gal'],
	force: ['kN', 'lbf'],
	ratio: ['']
};

/** The units a person may type a reading in (its own unit first). */
export function unitChoices(spec: ReadingSpec): string[] {
	const list = choicesByQuantity[quantityOf(spec.unit) ?? 'ratio'] ?? [spec.unit];
	return [spec.unit, ...list.filter((u) => u !== spec.unit)];
}

const r = (name: string, label: string, unit: string, min: number, max: number, key?: ReadingKey): ReadingSpec => ({ name, label, unit, min, max, key });

const pipeTemp = r('pipeTempC', 'Pipe temperature', 'degC', -10, 50);
const sheetCure = r('sheetCureMinutes', 'Cure time on the data sheet at 20 °C', 'min', 5, 1440);
const correctedCure = r('cureMinutes', 'Cure time corrected for the pipe temperature', 'min', 5, 5000, {
	calculator: 'cure-time',
	result: 'minutes',
	inputs: { refMinutes: 'sheetCureMinutes', tempC: 'pipeTempC' }
});
const pressureHeld = r('pressureHeldBar', 'Pressure held through the cure', 'bar', 0, 6);

/** Keyed by "<course>/<skill>". Skills not listed take photos and a note only. */
const specs: Record<string, ReadingSpec[]> = {
	'point-repair-installer/job-calculations': [
		r('diameterMm', 'Host pipe internal diameter', 'mm', 50, 600),
		r('patchLengthMm', 'Patch length', 'mm', 200, 3000),
		r('plies', 'Plies of glass mat', '', 1, 8),
		r('resinKg', 'Resin to mix (with waste)', 'kg', 0.01, 50, {
			calculator: 'resin-quantity',
			result: 'resinWithWasteKg',
			inputs: { diameterMm: 'diameterMm', lengthMm: 'patchLengthMm', plies: 'plies' }
		}),
		r('cutWidthMm', 'Mat cut width', 'mm', 50, 5000, {
			calculator: 'mat-size',
			result: 'cutWidthMm',
			inputs: { diameterMm: 'diameterMm', plies: 'plies', patchLengthMm: 'patchLengthMm' }
		}),
		r('groundwaterHeadM', 'Groundwater head above the invert', 'm', 0, 15),
		r('minPressureBar', 'Minimum inflation pressure', 'bar', 0, 6, {
			calculator: 'pressure-window',
			result: 'minBar',
			inputs: { groundwaterHeadM: 'groundwaterHeadM' }
		}),
		pipeTemp,
		sheetCure,
		correctedCure
	],
	'point-repair-installer/resin-metering': [
		r('totalKg', 'Resin to mix', 'kg', 0.05, 50),
		r('ratioA', 'Mix ratio, part A (by mass)', '', 1, 1000),
		r('ratioB', 'Mix ratio, part B (by mass)', '', 1, 1000),
		r('partAKg', 'Part A weighed', 'kg', 0.01, 50, {
			calculator: 'mix-ratio',
			result: 'partAKg',
			inputs: { totalKg: 'totalKg', ratioA: 'ratioA', ratioB: 'ratioB' }
		}),
		r('partBKg', 'Part B weighed', 'kg', 0.01, 50, {
			calculator: 'mix-ratio',
			result: 'partBKg',
			inputs: { totalKg: 'totalKg', ratioA: 'ratioA', ratioB: 'ratioB' }
		})
	],
	'point-repair-installer/staged-inflation': [pressureHeld, pipeTemp],
	'point-repair-installer/cure-and-deflation': [pipeTemp, sheetCure, correctedCure],
	'packer-pressure-safety/pressure-window': [
		r('groundwaterHeadM', 'Groundwater head above the invert', 'm', 0, 15),
		r('marginBar', 'Specified margin over the head', 'bar', 0, 2),
		r('ratedMaxBar', 'Packer rating at this diameter', 'bar', 0.1, 6),
		r('minBar', 'Minimum pressure', 'bar', 0, 6, {
			calculator: 'pressure-window',
			result: 'minBar',
			inputs: { groundwaterHeadM: 'groundwaterHeadM', marginBar: 'marginBar', ratedMaxBar: 'ratedMaxBar' }
		})
	],
	'packer-pressure-safety/staged-inflation': [pressureHeld, pipeTemp, sheetCure, correctedCure],
	'packer-pressure-safety/oral-questions': [
		r('diameterMm', 'Pipe internal diameter', 'mm', 50, 600),
		r('pressureBar', 'Inflation pressure', 'bar', 0.1, 6),
		r('forceKN', 'End thrust', 'kN', 0.001, 500, {
			calculator: 'end-thrust',
			result: 'forceKN',
			inputs: { diameterMm: 'diameterMm', pressureBar: 'pressureBar' }
		})
	],
	'transition-patches/size-transition-mat': [
		r('smallDiameterMm', 'Smaller internal diameter', 'mm', 50, 600),
		r('largeDiameterMm', 'Larger internal diameter', 'mm', 50, 600),
		r('taperLengthMm', 'Taper length', 'mm', 10, 1000),
		r('slantMm', 'Slant length of the taper', 'mm', 1, 2000, {
			calculator: 'transition-area',
			result: 'slantMm',
			inputs: { smallDiameterMm: 'smallDiameterMm', largeDiameterMm: 'largeDiameterMm', taperLengthMm: 'taperLengthMm' }
		})
	],
	'transition-patches/test-transition': [
		r('diameterMm', 'Pipe internal diameter', 'mm', 50, 600),
		r('lengthM', 'Length of the test section', 'm', 1, 500),
		r('allowedL', 'Water loss allowed', 'L', 0.001, 1000, {
			calculator: 'water-test',
			result: 'allowedL',
			inputs: { diameterMm: 'diameterMm', lengthM: 'lengthM' }
		})
	],
	'transition-patches/place-and-inflate': [pressureHeld, pipeTemp]
};

export function readingSpecs(courseSlug: string, skillId: string): ReadingSpec[] {
	const key = `${courseSlug}/${skillId}`;
	return Object.hasOwn(specs, key) ? specs[key] : [];
}

/** One recorded reading: what was typed, its value in the spec's unit, and the key when one exists. */
export interface Reading {
	name: string;
	label: string;
	/** As typed. */
	typedValue: number;
	typedUnit: string;
	/** In the spec's unit. */
	value: number;
	unit: string;
	key: number | null;
	/** Relative difference from the key (0.03 = 3 %), when there is a key. */
	deviation: number | null;
	withinTolerance: boolean | null;
}

export type TypedReadings = Record<string, { value: string; unit: string }>;

/**
 * Checks typed readings against the skill's specs and computes the key for each keyed reading.
 * Every reading is optional (a trainee may not have every figure), but a typed one must be a
 * number in range with a unit of the right quantity. Returns a message per field on failure.
 */
export function checkReadings(
	courseSlug: string,
	skillId: string,
	typed: TypedReadings
): { ok: true; readings: Reading[] } | { ok: false; errors: Record<string, string> } {
	const errors: Record<string, string> = {};
	const values: Record<string, number> = {};
	const recorded: Reading[] = [];
	for (const spec of readingSpecs(courseSlug, skillId)) {
		const entry = Object.hasOwn(typed, spec.name) ? typed[spec.name] : undefined;
		const text = entry?.value?.trim().replace(',', '.') ?? '';
		if (text === '') continue;
		const field = `readings.${spec.name}`;
		const typedValue = Number(text);
		const typedUnit = entry?.unit ?? spec.unit;
		if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(text) || !Number.isFinite(typedValue)) {
			errors[field] = `${spec.label}: type a number, such as 12.5.`;
			continue;
		}
		if (!unitChoices(spec).includes(typedUnit)) {
			errors[field] = `${spec.label}: choose one of the units offered.`;
			continue;
		}
		const value = typedUnit === spec.unit ? typedValue : convert(typedValue, typedUnit, spec.unit);
		if (value < spec.min || value > spec.max) {
			const u = unitLabel(spec.unit);
			errors[field] = `${spec.label} must be between ${spec.min} and ${spec.max}${u ? ` ${u}` : ''}.`;
			continue;
		}
		values[spec.name] = value;
		recorded.push({ name: spec.name, label: spec.label, typedValue, typedUnit, value, unit: spec.unit, key: null, deviation: null, withinTolerance: null });
	}
	if (Object.keys(errors).length) return { ok: false, errors };
	for (const reading of recorded) {
		const spec = readingSpecs(courseSlug, skillId).find((s) => s.name === reading.name)!;
		const key = computeKey(spec, values);
		if (key === null) continue;
		reading.key = key;
		reading.deviation = key === 0 ? (reading.value === 0 ? 0 : Infinity) : Math.abs(reading.value - key) / Math.abs(key);
		reading.withinTolerance = reading.deviation <= KEY_TOLERANCE + 1e-12;
	}
	return { ok: true, readings: recorded };
}

/** The library's answer for a keyed reading, or null when an input is missing or the library refuses them. */
export function computeKey(spec: ReadingSpec, values: Record<string, number>): number | null {
	if (!spec.key) return null;
	const inputs: Record<string, number> = {};
	for (const [input, from] of Object.entries(spec.key.inputs)) {
		if (!(from in values)) return null;
		inputs[input] = values[from];
	}
	const outcome = runCalculation(spec.key.calculator, inputs);
	if (!outcome.ok) return null;
	const result = outcome.result[spec.key.result];
	return typeof result === 'number' ? result : null;
}

/** "2.50 bar", "12 °C": a value with its unit label, trimmed to 3 significant figures. */
export function formatReading(value: number, unit: string): string {
	const label = unitLabel(unit);
	const text = Number(value.toPrecision(3)).toString();
	return label ? `${text} ${label}` : text;
}
