/**
 * Packer pressure: groundwater head, the pressure window, end thrust.
 */
import { SOURCES } from './sources';
import type { Alert, CalculatorDef, InputSpec } from './types';
import { convert } from './units';
import { given, num, plain, qty, Worksheet } from './worksheet';

/** Standing cautions wherever packer pressure or thrust is involved (common practice). */
export const PRESSURE_CAUTIONS: Alert[] = [
	{
		level: 'danger',
		title: 'A pressurised packer stores energy',
		text: 'Fit a relief valve and a gauge, never inflate a packer unconfined above its check pressure, restrain it against thrust, stay out of line with the pipe ends, look with a camera and never with your eyes, and deflate fully before handling.'
	},
	{
		level: 'warning',
		title: 'Local codes and the maker come first',
		text: "These figures support a plan; they do not replace local codes, the packer maker's ratings for the diameter, the resin data sheet or licensed practice."
	}
];

/** The head of water over the pipe, as both the head and the window calculators take it. */
function waterAboveInvert(name: string): InputSpec {
	return {
		name,
		label: 'Water above the pipe invert',
		unit: 'm',
		default: 3,
		min: 0,
		max: 50,
		step: 0.1,
		help: 'Include any sewage standing in laterals above the pipe.'
	};
}

// ---------------------------------------------------------------- groundwater head

export type GroundwaterHeadInputs = { headM: number };

/** Hydrostatic pressure of a water column, p = ρ g h with the conventional metre of water (NIST SP 811). */
export function headToKPa(headM: number): number {
	return convert(headM, 'mH2O', 'kPa');
}

export const groundwaterHeadCalculator: CalculatorDef<GroundwaterHeadInputs> = {
	id: 'groundwater-head',
	title: 'Groundwater head to pressure',
	summary: 'The pressure the groundwater puts on the pipe, in kPa, bar and psi.',
	lesson: '/courses/packer-pressure-safety/groundwater-head-and-pressure-window',
	system: 'metric',
	inputs: [
		waterAboveInvert('headM')
	],
	results: [
		{ name: 'pressureKPa', label: 'Pressure', unit: 'kPa' },
		{ name: 'pressureBar', label: 'Pressure', unit: 'bar' },
		{ name: 'pressurePsi', label: 'Pressure', unit: 'psi' }
	],
	cautions: PRESSURE_CAUTIONS,
	compute(i) {
		const pressureKPa = headToKPa(i.headM);
		const pressureBar = convert(pressureKPa, 'kPa', 'bar');
		const pressurePsi = convert(pressureKPa, 'kPa', 'psi');
		const w = new Worksheet([SOURCES.hydrostatics, SOURCES.nist811]);
		w.step(
			`p = ρ × g × h = 1000 kg/m³ × 9.80665 m/s² × ${given(i.headM, 'm')} = ${qty(pressureKPa, 'kPa')}`
		);
		w.step(`In bar: ${qty(pressureKPa, 'kPa')} ÷ 100 = ${qty(pressureBar, 'bar')}`);
		w.step(`In psi: ${qty(pressureKPa, 'kPa')} ÷ 6.894757 = ${qty(pressurePsi, 'psi')}`);
		return w.done({ pressureKPa, pressureBar, pressurePsi });
	}
};

// ---------------------------------------------------------------- pressure window

export type PressureWindowInputs = { groundwaterHeadM: number; marginBar: number; ratedMaxBar: number };

/**
 * Inflation pressure must exceed the groundwater head (plus a margin) and stay at or below
 * the packer maker's rated maximum for the diameter (common practice).
 */
export function pressureWindow(i: PressureWindowInputs) {
	const headBar = convert(i.groundwaterHeadM, 'mH2O', 'bar');
	const minBar = headBar + i.marginBar;
	const maxBar = i.ratedMaxBar;
	return { headBar, minBar, maxBar, ok: minBar <= maxBar };
}

export const pressureWindowCalculator: CalculatorDef<PressureWindowInputs> = {
	id: 'pressure-window',
	title: 'Pressure window',
	summary: 'The lowest and highest inflation pressure: above the groundwater, within the packer rating.',
	lesson: '/courses/packer-pressure-safety/groundwater-head-and-pressure-window',
	system: 'metric',
	inputs: [
		waterAboveInvert('groundwaterHeadM'),
		{ name: 'marginBar', label: 'Margin above the head', unit: 'bar', default: 0.3, min: 0, max: 3, step: 0.05 },
		{
			name: 'ratedMaxBar',
			label: "Packer maker's rated maximum",
			unit: 'bar',
			default: 2.5,
			min: 0.1,
			max: 10,
			step: 0.1,
			help: 'The rating for this pipe diameter, from the packer maker.'
		}
	],
	results: [
		{ name: 'headBar', label: 'Groundwater pressure', unit: 'bar' },
		{ name: 'minBar', label: 'Lowest inflation pressure', unit: 'bar' },
		{ name: 'maxBar', label: 'Highest inflation pressure', unit: 'bar' },
		{ name: 'ok', label: 'A safe window exists', unit: '' }
	],
	cautions: PRESSURE_CAUTIONS,
	compute(i) {
		const r = pressureWindow(i);
		const w = new Worksheet([SOURCES.hydrostatics, SOURCES.nist811, SOURCES.pressureWindow]);
		w.step(`Groundwater pressure = ${given(i.groundwaterHeadM, 'm')} × 0.0980665 bar/m = ${qty(r.headBar, 'bar')}`);
		w.step(
			`Lowest = groundwater + margin = ${qty(r.headBar, 'bar')} + ${given(i.marginBar, 'bar')} = ${qty(r.minBar, 'bar')} (${qty(convert(r.minBar, 'bar', 'psi'), 'psi')})`
		);
		w.step(
			`Highest = packer rating = ${given(r.maxBar, 'bar')} (${qty(convert(r.maxBar, 'bar', 'psi'), 'psi')})`
		);
		w.step(
			r.ok
				? `Window: ${num(r.minBar)} to ${plain(r.maxBar)} bar`
				: `No window: ${qty(r.minBar, 'bar')} is above ${qty(r.maxBar, 'bar')}`
		);
		if (!r.ok) {
			w.warn(
				'danger',
				'No safe pressure window',
				`Holding the patch against the groundwater needs ${qty(r.minBar, 'bar')}, above the packer's rated ${qty(r.maxBar, 'bar')}. Do not inflate: use a packer rated higher for this diameter, lower the water, or choose another method.`
			);
		} else if (r.headBar > 0 && i.marginBar === 0) {
			w.warn(
				'warning',
				'No margin above the head',
				'At exactly the groundwater pressure a small error in the head or the gauge lets the patch lift. Add a margin.'
			);
		}
		return w.done(r);
	}
};

// ---------------------------------------------------------------- end thrust

export type EndThrustInputs = { diameterMm: number; pressureBar: number; smallDiameterMm: number };

/**
 * Force on a plugged or pressurised packer end, F = p × π D² / 4 (statics). On a transition
 * step (smallDiameterMm > 0) the ring p × π (D² − d²) / 4 pushes toward the larger pipe.
 */
export function endThrustKN(i: EndThrustInputs): number {
	const areaM2 = (Math.PI * ((i.diameterMm / 1000) ** 2 - (i.smallDiameterMm / 1000) ** 2)) / 4;
	return (convert(i.pressureBar, 'bar', 'kPa') * areaM2);
}

export const endThrustCalculator: CalculatorDef<EndThrustInputs> = {
	id: 'end-thrust',
	title: 'End thrust',
	summary: 'The force pressure puts on a packer end, or on the step of a transition.',
	lesson: '/courses/packer-pressure-safety/end-thrust',
	system: 'metric',
	inputs: [
		{ name: 'diameterMm', label: 'Pipe diameter (the larger, on a transition)', unit: 'mm', default: 100, min: 50, max: 1600, step: 1 },
		{ name: 'pressureBar', label: 'Inflation pressure', unit: 'bar', default: 2.5, min: 0.01, max: 10, step: 0.1 },
		{
			name: 'smallDiameterMm',
			label: 'Smaller diameter at a transition step',
			unit: 'mm',
			default: 0,
			min: 0,
			max: 1600,
			step: 1,
			optional: true,
			help: 'Leave at 0 for a plugged end in a straight pipe.'
		}
	],
	results: [
		{ name: 'forceKN', label: 'Thrust', unit: 'kN' },
		{ name: 'forceKgf', label: 'Thrust', unit: 'kgf' },
		{ name: 'forceLbf', label: 'Thrust', unit: 'lbf' }
	],
	cautions: PRESSURE_CAUTIONS,
	check(i) {
		return i.smallDiameterMm >= i.diameterMm
			? { smallDiameterMm: 'Must be smaller than the pipe diameter (or 0 for a straight pipe)' }
			: {};
	},
	compute(i) {
		const forceKN = endThrustKN(i);
		const forceKgf = convert(forceKN, 'kN', 'kgf');
		const forceLbf = convert(forceKN, 'kN', 'lbf');
		const step = i.smallDiameterMm > 0;
		const areaM2 = forceKN / convert(i.pressureBar, 'bar', 'kPa');
		const w = new Worksheet([SOURCES.thrust, SOURCES.nist811]);
		w.step(
			step
				? `Ring area = π × (D² − d²) ÷ 4 = π × ((${qty(i.diameterMm / 1000, 'm')})² − (${qty(i.smallDiameterMm / 1000, 'm')})²) ÷ 4 = ${num(areaM2 * 1e4)} cm²`
				: `Area = π × D² ÷ 4 = π × (${qty(i.diameterMm / 1000, 'm')})² ÷ 4 = ${num(areaM2 * 1e4)} cm²`
		);
		w.step(
			`F = p × A = ${given(i.pressureBar * 100, 'kPa')} × ${num(areaM2, 3)} m² = ${qty(forceKN, 'kN')}`
		);
		w.step(`= ${qty(forceKgf, 'kgf')} = ${qty(forceLbf, 'lbf')}`);
		w.warn(
			'warning',
			'Restrain the packer',
			`About ${num(forceKgf, 2)} kgf acts ${step ? 'on the step and pushes the packer toward the larger pipe' : 'on a plugged or pressurised end'}. Restrain the packer and keep everyone out of line with the pipe ends.`
		);
		return w.done({ forceKN, forceKgf, forceLbf });
	}
};
