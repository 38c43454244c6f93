/**
 * Cure time and pot life against temperature.
 */
import { SOURCES } from './sources';
import type { CalculatorDef } from './types';
import { given, num, plain, qty, Worksheet } from './worksheet';

export type CureTimeInputs = {
	refMinutes: number;
	refTempC: number;
	tempC: number;
	factorPer10C: number;
	potLifeRefMinutes: number;
};

/**
 * Rate rule of thumb (common practice): the reaction speeds up `factor` times per 10 °C,
 * so a time at T is t(T) = t_ref × factor^((T_ref − T) / 10). Used for cure and pot life.
 */
export function scaleMinutesForTemperature(
	refMinutes: number,
	refTempC: number,
	tempC: number,
	factorPer10C = 2
): number {
	return refMinutes * factorPer10C ** ((refTempC - tempC) / 10);
}

/** Many ambient-cure epoxies nearly stop curing at or below about 13 °C (from memory). */
export const SLOW_CURE_BELOW_C = 13;

export const cureTimeCalculator: CalculatorDef<CureTimeInputs> = {
	id: 'cure-time',
	title: 'Cure time and pot life',
	summary: 'Cure time and pot life at the pipe temperature, from the data sheet values at another temperature.',
	lesson: '/courses/point-repair-installer/cure-and-witness-cup',
	system: 'metric',
	inputs: [
		{ name: 'refMinutes', label: 'Cure time on the data sheet', unit: 'min', default: 120, min: 1, max: 10000, step: 5 },
		{ name: 'refTempC', label: 'at data sheet temperature', unit: 'degC', default: 20, min: 0, max: 60, step: 1 },
		{
			name: 'tempC',
			label: 'Pipe temperature',
			unit: 'degC',
			default: 10,
			min: -5,
			max: 60,
			step: 1,
			help: 'The pipe, flow or ground temperature, not the air.'
		},
		{
			name: 'factorPer10C',
			label: 'Speed-up per 10 °C',
			unit: '',
			default: 2,
			min: 1.1,
			max: 3,
			step: 0.1,
			optional: true,
			help: 'About 2 for most resins; 1.5 to 2.5 by resin.'
		},
		{
			name: 'potLifeRefMinutes',
			label: 'Pot life on the data sheet',
			unit: 'min',
			default: 30,
			min: 1,
			max: 1000,
			step: 1,
			optional: true
		}
	],
	results: [
		{ name: 'minutes', label: 'Cure time', unit: 'min' },
		{ name: 'hours', label: 'Cure time', unit: 'h' },
		{ name: 'potLifeMinutes', label: 'Pot life', unit: 'min' }
	],
	cautions: [
		{
			level: 'caution',
			title: 'The data sheet and the witness cup decide',
			text: 'This rule is an estimate. Follow the resin data sheet, and do not deflate until a cup of the same mix kept at pipe temperature is hard.'
		}
	],
	compute(i) {
		const minutes = scaleMinutesForTemperature(i.refMinutes, i.refTempC, i.tempC, i.factorPer10C);
		const potLifeMinutes = scaleMinutesForTemperature(i.potLifeRefMinutes, i.refTempC, i.tempC, i.factorPer10C);
		const exponent = (i.refTempC - i.tempC) / 10;
		const multiplier = i.factorPer10C ** exponent;
		const w = new Worksheet([SOURCES.cureRule]);
		w.step(
			`Multiplier = f^((T_ref − T) ÷ 10) = ${given(i.factorPer10C)}^((${given(i.refTempC, 'degC')} − ${given(i.tempC, 'degC')}) ÷ 10) = ${given(i.factorPer10C)}^${plain(exponent, 3)} = ${num(multiplier)}`
		);
		w.step(
			`Cure time = ${given(i.refMinutes, 'min')} × ${num(multiplier)} = ${qty(minutes, 'min')} (${qty(minutes / 60, 'h')})`
		);
		w.step(`Pot life = ${given(i.potLifeRefMinutes, 'min')} × ${num(multiplier)} = ${qty(potLifeMinutes, 'min')}`);
		if (i.tempC <= SLOW_CURE_BELOW_C) {
			w.warn(
				'warning',
				'Cold pipe: the cure may stall',
				`Many ambient-cure epoxies nearly stop curing at or below about ${SLOW_CURE_BELOW_C} °C, where this rule no longer holds. Check the data sheet's lowest cure temperature and trust the witness cup, not the clock.`
			);
		}
		if (Math.abs(i.tempC - i.refTempC) > 20) {
			w.warn(
				'caution',
				'Far from the data sheet temperature',
				'The rule of thumb is rough this far from the tested temperature. Ask the resin maker for a value at this temperature.'
			);
		}
		if (i.factorPer10C < 1.5 || i.factorPer10C > 2.5) {
			w.warn('caution', 'Unusual factor', 'Most resins speed up 1.5 to 2.5 times per 10 °C. Check the data sheet.');
		}
		return w.done({ minutes, hours: minutes / 60, potLifeMinutes });
	}
};
