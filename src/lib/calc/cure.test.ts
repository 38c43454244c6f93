import { describe, expect, it } from 'vitest';
import { scaleMinutesForTemperature } from './cure';
import { runCalculation } from './index';

describe('cure-time', () => {
	it('2 h at 20 °C is 4 h at 10 °C and 1 h at 30 °C (doubling per 10 °C, common practice)', () => {
		expect(scaleMinutesForTemperature(120, 20, 10)).toBeCloseTo(240, 10);
		expect(scaleMinutesForTemperature(120, 20, 30)).toBeCloseTo(60, 10);
	});

	it('at a factor of 1.5, 5 °C warmer shortens the time by √1.5 (hand-worked)', () => {
		expect(scaleMinutesForTemperature(90, 20, 25, 1.5)).toBeCloseTo(90 / Math.sqrt(1.5), 10);
	});

	it('scales pot life by the same rule', () => {
		const out = runCalculation('cure-time', { refMinutes: 120, refTempC: 20, tempC: 30, potLifeRefMinutes: 40 });
		expect(out.ok && out.result).toMatchObject({ minutes: 60, hours: 1, potLifeMinutes: 20 });
	});

	it('warns that many ambient-cure epoxies nearly stop at or below about 13 °C (from memory)', () => {
		const cold = runCalculation('cure-time', { refMinutes: 120, refTempC: 20, tempC: 12 });
		const warm = runCalculation('cure-time', { refMinutes: 120, refTempC: 20, tempC: 18 });
		expect(cold.ok && cold.alerts.map((a) => a.title)).toContain('Cold pipe: the cure may stall');
		expect(warm.ok && warm.alerts).toEqual([]);
	});
});
