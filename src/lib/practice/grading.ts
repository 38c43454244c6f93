/**
 * Grading of numeric answers typed with a unit. Pure: used by the practice check, the course
 * test's server-side grading and the unit tests alike.
 *
 * Contract: an answer is right when, converted to the unit asked, it lies within
 * `tolerancePercent` of the expected value (bounds included). Any known unit of the same
 * quantity is accepted ("1170 g" for "1.17 kg"); empty, non-numeric, unit-less, unknown or
 * wrong-quantity answers are wrong with a message saying why.
 */
import { convert, quantityOf, resolveUnit, unitLabel, type Quantity } from '../calc/units';
import { num } from '../calc/worksheet';

export interface Amount {
	value: number;
	unit: string;
}

/** What a person sent: the value may be typed text, the unit any spelling. */
export interface TypedAnswer {
	value?: unknown;
	unit?: unknown;
}

export type NumericOutcome =
	| 'correct'
	| 'wrong'
	| 'empty'
	| 'not-a-number'
	| 'missing-unit'
	| 'unknown-unit'
	| 'wrong-quantity'
	| 'impossible-sign';

export interface NumericGrade {
	correct: boolean;
	outcome: NumericOutcome;
	/** One sentence for the person. */
	message: string;
	/** The answer read as a number in the unit asked, when it could be. */
	valueInUnit?: number;
	/** Signed deviation from the expected value in percent, when it could be computed. */
	deviationPercent?: number;
}

/** Relative slack on the tolerance bound so that an answer exactly on it is not lost to binary noise. */
const BOUND_SLACK = 1e-9;

/** The units offered for a quantity, in the order a picker shows them. */
const UNITS_BY_QUANTITY: Partial<Record<Quantity, string[]>> = {
	length: ['mm', 'cm', 'm', 'in', 'ft'],
	area: ['m2', 'cm2', 'mm2', 'ft2', 'in2'],
	volume: ['L', 'mL', 'm3', 'gal', 'ft3'],
	mass: ['kg', 'g', 'lb', 'oz'],
	pressure: ['bar', 'kPa', 'psi', 'mbar', 'mH2O', 'ftH2O'],
	force: ['kN', 'N', 'kgf', 'lbf'],
	time: ['min', 'h', 's'],
	temperature: ['degC', 'degF'],
	ratio: ['']
};

/** The unit asked first, then the other common units of its quantity. */
export function unitChoices(unit: string): string[] {
	const code = resolveUnit(unit);
	if (code === undefined) return [unit];
	const others = UNITS_BY_QUANTITY[quantityOf(code)!] ?? [];
	return [code, ...others.filter((u) => u !== code)];
}

const AMBIGUOUS_THOUSANDS = /^[+-]?[1-9]\d{0,2},\d{3}$/;
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const CLOCK = /^(\d+):([0-5]\d)$/;

export type ReadNumber = { ok: true; value: number } | { ok: false; empty: boolean; message: string };

/**
 * A typed value as a number. Accepts numbers, decimal text with a point, a decimal comma when
 * it cannot be a thousands separator ("1,5"), and "m:ss" for minutes (or "h:mm" for hours).
 */
export function readNumber(value: unknown, unit = ''): ReadNumber {
	if (value === null || value === undefined) return { ok: false, empty: true, message: 'No answer was given.' };
	if (typeof value === 'number') {
		return Number.isFinite(value) ? { ok: true, value } : { ok: false, empty: false, message: 'The answer is not a finite number.' };
	}
	if (typeof value !== 'string') return { ok: false, empty: false, message: 'The answer must be a number.' };
	const text = value.trim().replace(/\s+/g, '');
	if (text === '') return { ok: false, empty: true, message: 'No answer was given.' };
	if (AMBIGUOUS_THOUSANDS.test(text)) {
		return { ok: false, empty: false, message: `“${value.trim()}” could mean a decimal or thousands: write it without a comma, with a point for decimals.` };
	}
	const clock = CLOCK.exec(text);
	const code = resolveUnit(unit);
	if (clock && (code === 'min' || code === 'h')) {
		return { ok: true, value: Number(clock[1]) + Number(clock[2]) / 60 };
	}
	const normalised = /^[+-]?\d*,\d+$/.test(text) ? text.replace(',', '.') : text;
	if (!DECIMAL.test(normalised)) return { ok: false, empty: false, message: `“${value.trim().slice(0, 40)}” is not a number.` };
	return { ok: true, value: Number(normalised) };
}

/** Quantities that cannot be below zero on this job (temperatures and plain numbers can). */
const NEVER_NEGATIVE: Partial<Record<Quantity, string>> = {
	length: 'A length',
	area: 'An area',
	volume: 'A volume',
	mass: 'A mass',
	pressure: 'A pressure here (gauge pressure in a packer or a pipe)',
	force: 'A force here',
	time: 'A time'
};

/**
 * The span of values, in the SI base of each quantity, that any answer on a point-repair job
 * can plausibly take. Deliberately wide (a factor of ten or more beyond every answer the
 * problems ask for, checked by a test over every generator) so that a warning never hints at
 * the right answer; outside it the number or the unit is almost surely a slip ("1454" typed
 * with m where mm was meant). Common practice, no published source.
 */
const PLAUSIBLE: Partial<Record<Quantity, { min: number; max: number; small: string; large: string }>> = {
	length: { min: 1e-5, max: 1000, small: 'less than 0.01 mm', large: 'more than 1 km' },
	area: { min: 1e-6, max: 1e4, small: 'less than 1 mm²', large: 'more than 10 000 m²' },
	volume: { min: 1e-7, max: 100, small: 'less than 0.1 mL', large: 'more than 100 m³' },
	mass: { min: 1e-4, max: 1e4, small: 'less than 0.1 g', large: 'more than 10 tonnes' },
	pressure: { min: 10, max: 1e7, small: 'less than 0.1 mbar', large: 'more than 100 bar' },
	force: { min: 1, max: 1e7, small: 'less than 1 N', large: 'more than 10 MN' },
	time: { min: 1, max: 30 * 86400, small: 'less than a second', large: 'more than 30 days' },
	temperature: { min: 223.15, max: 473.15, small: 'below −50 °C', large: 'above 200 °C' }
};

export interface InputNotice {
	/** unreadable: not a number as typed; sign: below zero where nothing can be; magnitude: far outside the job's range. */
	kind: 'unreadable' | 'sign' | 'magnitude';
	message: string;
	/** True when the text cannot stand as an answer (it is not saved or checked as it is). */
	blocking: boolean;
}

/**
 * What to tell a person about a number while they type it, before it is checked or saved:
 * ambiguous or unreadable text, an impossible sign, a magnitude far outside the job. It never
 * depends on the right answer, so the course test can show it without revealing anything.
 */
export function inputNotice(value: unknown, unit: string): InputNotice | null {
	const read = readNumber(value, unit);
	if (!read.ok) return read.empty ? null : { kind: 'unreadable', message: read.message, blocking: true };
	const code = resolveUnit(unit);
	const quantity = code === undefined ? undefined : quantityOf(code);
	if (code === undefined || quantity === undefined) return null;
	const label = unitLabel(code);
	const what = NEVER_NEGATIVE[quantity];
	if (read.value < 0 && what) {
		return { kind: 'sign', message: `${what} cannot be negative: type it without the minus sign.`, blocking: true };
	}
	const span = PLAUSIBLE[quantity];
	if (!span || read.value === 0) return null;
	const base = quantity === 'temperature' ? convert(read.value, code, 'K') : convert(Math.abs(read.value), code, baseUnitOf(quantity));
	if (base >= span.min && base <= span.max) return null;
	const beyond = base < span.min ? span.small : span.large;
	return { kind: 'magnitude', message: `${num(read.value, 4)} ${label} is ${beyond}, which no job here needs: check the number and the unit.`, blocking: false };
}

function baseUnitOf(quantity: Quantity): string {
	const bases: Partial<Record<Quantity, string>> = { length: 'm', area: 'm2', volume: 'm3', mass: 'kg', pressure: 'Pa', force: 'N', time: 's', temperature: 'K' };
	return bases[quantity] ?? '';
}

/** Whether `value` lies within `tolerancePercent` of `expected`, bounds included. */
export function withinTolerance(value: number, expected: number, tolerancePercent: number): boolean {
	const allowed = (Math.abs(expected) * tolerancePercent) / 100;
	return Math.abs(value - expected) <= allowed * (1 + BOUND_SLACK) + Number.EPSILON * Math.max(1, Math.abs(expected));
}

function quantityWord(q: Quantity | undefined): string {
	const words: Partial<Record<Quantity, string>> = {
		length: 'a length',
		area: 'an area',
		volume: 'a volume',
		mass: 'a mass',
		pressure: 'a pressure',
		force: 'a force',
		time: 'a time',
		temperature: 'a temperature',
		ratio: 'a plain number'
	};
	return (q && words[q]) ?? 'another quantity';
}

/** Prints an amount as a person reads it: "1.17 kg", "29.4 psi". */
export function formatAmount(amount: Amount, significant = 3): string {
	const label = unitLabel(amount.unit);
	return label === '' ? num(amount.value, significant) : `${num(amount.value, significant)} ${label}`;
}

/** Grades one typed answer against the expected amount. */
export function gradeNumeric(expected: Amount, answer: TypedAnswer | null | undefined, tolerancePercent: number): NumericGrade {
	const read = readNumber(answer?.value, typeof answer?.unit === 'string' ? answer.unit : '');
	if (!read.ok) return { correct: false, outcome: read.empty ? 'empty' : 'not-a-number', message: read.message };

	const expectedQuantity = quantityOf(expected.unit);
	const rawUnit = typeof answer?.unit === 'string' ? answer.unit.trim() : '';
	if (rawUnit === '' && expectedQuantity !== 'ratio') {
		return { correct: false, outcome: 'missing-unit', message: `Give the unit with the number, for example ${unitLabel(expected.unit)}.` };
	}
	const code = resolveUnit(rawUnit);
	if (code === undefined) {
		return { correct: false, outcome: 'unknown-unit', message: `“${rawUnit.slice(0, 20)}” is not a unit this app knows. Try ${unitLabel(expected.unit)}.` };
	}
	const quantity = quantityOf(code);
	if (quantity !== expectedQuantity) {
		return {
			correct: false,
			outcome: 'wrong-quantity',
			message: `${unitLabel(code) || 'A plain number'} measures ${quantityWord(quantity)}; this asks for ${quantityWord(expectedQuantity)} in ${unitLabel(expected.unit)}.`
		};
	}
	if (read.value < 0 && NEVER_NEGATIVE[quantity!]) {
		return { correct: false, outcome: 'impossible-sign', message: inputNotice(answer?.value, code)!.message };
	}
	const valueInUnit = convert(read.value, code, expected.unit);
	const deviationPercent = expected.value === 0 ? (valueInUnit === 0 ? 0 : Infinity) : ((valueInUnit - expected.value) / Math.abs(expected.value)) * 100;
	const correct = withinTolerance(valueInUnit, expected.value, tolerancePercent);
	return {
		correct,
		outcome: correct ? 'correct' : 'wrong',
		message: correct
			? `Right: ${formatAmount(expected)} (within ${tolerancePercent} %).`
			: `Not quite: the answer is ${formatAmount(expected)}; yours is ${formatAmount({ value: valueInUnit, unit: expected.unit })}.`,
		valueInUnit,
		deviationPercent
	};
}

/**
 * When a wrong number would be right in another unit of the same quantity (1.17 typed as lb
 * where 1.17 kg was meant, 2.1 bar written as psi), that unit; else undefined.
 */
export function unitSlip(expected: Amount, answer: TypedAnswer, tolerancePercent: number): string | undefined {
	const read = readNumber(answer.value, typeof answer.unit === 'string' ? answer.unit : '');
	const typed = typeof answer.unit === 'string' ? resolveUnit(answer.unit) : undefined;
	if (!read.ok || typed === undefined) return undefined;
	for (const unit of unitChoices(expected.unit)) {
		if (unit === typed || unit === '') continue;
		if (withinTolerance(convert(read.value, unit, expected.unit), expected.value, tolerancePercent)) return unit;
	}
	return undefined;
}
