import type { Alert, AlertLevel, CalcOutput, ResultValue } from './types';
import { unitLabel } from './units';

/** Below this no rounding reaches five whole digits, so there is nothing to group (and no regular expression to run). */
const GROUPING_FROM = 9999;

/**
 * A number to `significant` figures, without exponent notation, grouped in thousands
 * from 10,000 up: 0.15 -> "0.150", 1413.7 -> "1414", 125000 -> "125,000".
 */
export function num(value: number, significant = 3): string {
	if (!Number.isFinite(value)) return String(value);
	if (value === 0) return '0';
	if (Math.abs(value) < 1e-6) return value.toExponential(significant - 1);
	const magnitude = Math.floor(Math.log10(Math.abs(value)));
	const decimals = Math.max(0, significant - 1 - magnitude);
	const text = value.toFixed(decimals);
	return Math.abs(value) < GROUPING_FROM ? text : groupThousands(text);
}

/** A number as a person typed it: at most `significant` figures, no padding zeros: 50, 0.3, 125,000. */
export function plain(value: number, significant = 6): string {
	if (!Number.isFinite(value)) return String(value);
	const text = String(roundSignificant(value, significant));
	return Math.abs(value) < GROUPING_FROM ? text : groupThousands(text);
}

/**
 * Commas between thousands from 10,000 up ("125000.5" -> "125,000.5"). Done by hand because
 * Intl number formatting costs more than the calculation it would print.
 */
function groupThousands(text: string): string {
	const match = /^(-?)(\d{5,})(\.\d+)?$/.exec(text);
	if (!match) return text;
	const [, sign, whole, fraction = ''] = match;
	return `${sign}${whole.replace(/\B(?=(\d{3})+$)/g, ',')}${fraction}`;
}

/** An input value with its unit, shown as given: "150 mm", "15 %", "20 °C". */
export function given(value: number, unit = ''): string {
	const label = unitLabel(unit);
	return label === '' ? plain(value) : `${plain(value)} ${label}`;
}

/** A computed number with its unit, as written in a worked step: "0.150 m", "1.17 kg". */
export function qty(value: number, unit: string, significant = 3): string {
	const label = unitLabel(unit);
	return label === '' ? num(value, significant) : `${num(value, significant)} ${label}`;
}

/** Rounds to `significant` figures to keep binary noise (0.30000000000000004) out of answers. */
export function roundSignificant(value: number, significant = 6): number {
	if (!Number.isFinite(value) || value === 0) return value;
	return Number(value.toPrecision(significant));
}

/** Collects the worked steps and warnings of one calculation. */
export class Worksheet {
	readonly steps: string[] = [];
	readonly alerts: Alert[] = [];

	constructor(readonly sources: string[]) {}

	step(line: string): this {
		this.steps.push(line);
		return this;
	}

	warn(level: AlertLevel, title: string, text: string): this {
		this.alerts.push({ level, title, text });
		return this;
	}

	/** The output; the worksheet is not used after this, so its lists are handed over as they are. */
	done(result: Record<string, ResultValue>): CalcOutput {
		const rounded: Record<string, ResultValue> = {};
		for (const key of Object.keys(result)) {
			const value = result[key];
			rounded[key] = typeof value === 'number' ? roundSignificant(value) : value;
		}
		return {
			result: rounded,
			steps: this.steps,
			sources: this.sources,
			warnings: this.alerts.map((a) => `${a.title}: ${a.text}`),
			alerts: this.alerts
		};
	}
}
