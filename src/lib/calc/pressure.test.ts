import { describe, expect, it } from 'vitest';
import { evaluate, unit } from 'mathjs';
import { runCalculation } from './index';
import { endThrustKN, headToKPa, pressureWindow } from './pressure';

function ok(id: string, inputs: Record<string, unknown>) {
	const out = runCalculation(id, inputs);
	if (!out.ok) throw new Error(`${id} failed: ${JSON.stringify(out.errors)}`);
	return out;
}

describe('groundwater-head', () => {
	it('10 m of water = 98.0665 kPa (conventional metre of water, NIST SP 811 Appendix B)', () => {
		expect(headToKPa(10)).toBeCloseTo(98.0665, 10);
	});

	it('matches ρ g h evaluated by mathjs units', () => {
		const out = ok('groundwater-head', { headM: 4.2 });
		const kPa = evaluate('4.2 m * 1000 kg/m^3 * 9.80665 m/s^2').toNumber('kPa');
		expect(out.result.pressureKPa).toBeCloseTo(kPa, 3);
		expect(out.result.pressureBar).toBeCloseTo(unit(kPa, 'kPa').toNumber('bar'), 5);
		expect(out.result.pressurePsi).toBeCloseTo(unit(kPa, 'kPa').toNumber('psi'), 4);
	});

	it('10 ft of water is 4.33 psi (1 ft of water = 0.4335 psi, NIST SP 811)', () => {
		const out = ok('groundwater-head', { headM: 3.048 });
		expect(out.result.pressurePsi).toBeCloseTo(4.335, 3);
	});
});

describe('pressure-window', () => {
	it('3 m head, 0.3 bar margin, packer rated 2.5 bar: window 0.594 to 2.5 bar (hand-worked; rule is common practice)', () => {
		const r = pressureWindow({ groundwaterHeadM: 3, marginBar: 0.3, ratedMaxBar: 2.5 });
		expect(r.minBar).toBeCloseTo(0.5942, 4);
		expect(r.maxBar).toBe(2.5);
		expect(r.ok).toBe(true);
	});

	it('says plainly, as danger, when the head needs more than the packer is rated for', () => {
		const out = ok('pressure-window', { groundwaterHeadM: 25, marginBar: 0.3, ratedMaxBar: 2.5 });
		expect(out.result.ok).toBe(false);
		expect(out.alerts[0]).toMatchObject({ level: 'danger', title: 'No safe pressure window' });
		expect(out.warnings[0]).toMatch(/^No safe pressure window: /);
	});

	it('warns when there is no margin above the head', () => {
		const out = ok('pressure-window', { groundwaterHeadM: 2, marginBar: 0, ratedMaxBar: 2.5 });
		expect(out.alerts.map((a) => a.title)).toEqual(['No margin above the head']);
	});

	it('carries the standing pressure cautions (relief valve, restraint, maker ratings first)', async () => {
		const { calculators } = await import('./index');
		const titles = calculators['pressure-window'].cautions!.map((c) => c.title);
		expect(titles).toContain('A pressurised packer stores energy');
		expect(titles).toContain('Local codes and the maker come first');
	});
});

describe('end-thrust', () => {
	it('DN100 at 2.5 bar: 1.96 kN, about 200 kgf (F = p π D² / 4, statics)', () => {
		const out = ok('end-thrust', { diameterMm: 100, pressureBar: 2.5 });
		expect(out.result.forceKN).toBeCloseTo(1.96, 2);
		expect(out.result.forceKgf).toBeCloseTo(200, 0);
		expect(out.result.forceLbf).toBeCloseTo(unit(1.9635, 'kN').toNumber('lbf'), 1);
	});

	it('DN150 at 2.0 bar: 3.53 kN (statics)', () => {
		expect(endThrustKN({ diameterMm: 150, pressureBar: 2, smallDiameterMm: 0 })).toBeCloseTo(3.53, 2);
	});

	it('on a 100 -> 150 step at 2 bar the ring carries p π (D² − d²) / 4, evaluated by mathjs', () => {
		const kN = endThrustKN({ diameterMm: 150, pressureBar: 2, smallDiameterMm: 100 });
		expect(kN).toBeCloseTo(evaluate('2 bar * pi * ((150 mm)^2 - (100 mm)^2) / 4').toNumber('kN'), 12);
		const out = ok('end-thrust', { diameterMm: 150, pressureBar: 2, smallDiameterMm: 100 });
		expect(out.warnings[0]).toMatch(/toward the larger pipe/);
	});

	it('rejects a step diameter not smaller than the pipe', () => {
		const out = runCalculation('end-thrust', { diameterMm: 100, pressureBar: 2, smallDiameterMm: 100 });
		expect(out).toMatchObject({ ok: false, status: 400, errors: { smallDiameterMm: expect.any(String) } });
	});
});
