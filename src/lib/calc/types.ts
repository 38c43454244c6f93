import type { UnitSystem } from './units';

/** One input of a calculator. `unit` is a code known to ./units (or '' for a pure number). */
export interface InputSpec {
	name: string;
	label: string;
	unit: string;
	default: number;
	min: number;
	max: number;
	step?: number;
	integer?: boolean;
	/** Optional inputs take `default` when left out. */
	optional?: boolean;
	/** When set, the value must be one of these. */
	choices?: number[];
	/** Words for each choice, same order as `choices`. */
	choiceLabels?: string[];
	/** One short line of guidance shown under the field. */
	help?: string;
	/** The help line worded for each system, where it quotes units ("0.433 psi per foot"). */
	helpBySystem?: Partial<Record<UnitSystem, string>>;
}

export interface ResultSpec {
	name: string;
	label: string;
	unit: string;
}

export type ResultValue = number | boolean | string;

/** A safety level as in ISO 3864 / ANSI Z535: red danger, orange warning, yellow caution. */
export type AlertLevel = 'danger' | 'warning' | 'caution';

export interface Alert {
	level: AlertLevel;
	title: string;
	text: string;
}

export interface CalcOutput {
	result: Record<string, ResultValue>;
	/** Worked steps with numbers and units substituted. */
	steps: string[];
	sources: string[];
	/** Each warning as one line, "Title: text". */
	warnings: string[];
	/** The same warnings with their level and title kept apart, for display. */
	alerts: Alert[];
}

export type Inputs = Record<string, number>;

export interface CalculatorDef<I extends Inputs = Inputs> {
	id: string;
	title: string;
	summary: string;
	/** '/courses/<course>/<lesson>' of the lesson that explains it. */
	lesson?: string;
	/** The system the inputs are stated in; the other one is offered as a switch. */
	system: UnitSystem;
	inputs: InputSpec[];
	results: ResultSpec[];
	/** Standing cautions shown with the calculator (pressure, thrust, chemicals). */
	cautions?: Alert[];
	/** Checks across fields after each field is valid on its own; message per field. */
	check?(inputs: I): Partial<Record<keyof I & string, string>>;
	compute(inputs: I): CalcOutput;
}
