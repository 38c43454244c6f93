import { describe, expect, it } from 'vitest';
import { calculators, defaultInputs, listCalculators, runCalculation } from './index';
import { quantityOf } from './units';

/** Ids and input names other programs call; they must not drift. */
const FIXED_INPUTS: Record<string, string[]> = {
	'resin-quantity': ['diameterMm', 'lengthMm', 'plies', 'matWeightGm2', 'resinGlassRatio', 'wastePercent'],
	'laminate-volume': ['diameterMm', 'thicknessMm', 'lengthMm'],
	'transition-area': ['smallDiameterMm', 'largeDiameterMm', 'taperLengthMm'],
	'mat-size': ['diameterMm', 'plies', 'overlapMm', 'patchLengthMm'],
	'mix-ratio': ['totalKg', 'ratioA', 'ratioB'],
	'groundwater-head': ['headM'],
	'pressure-window': ['groundwaterHeadM', 'marginBar', 'ratedMaxBar'],
	'end-thrust': ['diameterMm', 'pressureBar', 'smallDiameterMm'],
	'cure-time': ['refMinutes', 'refTempC', 'tempC', 'factorPer10C'],
	'f1216-partial': ['diameterIn', 'pressurePsi', 'ovalityPercent', 'longTermModulusPsi', 'enhancementK', 'poisson', 'safetyFactor'],
	'f1216-full': ['diameterIn', 'ovalityPercent', 'longTermModulusPsi', 'shortTermModulusPsi', 'safetyFactor'],
	'air-test': ['diameterIn', 'lengthFt', 'dropPsig'],
	'water-test': ['diameterMm', 'lengthM', 'allowanceLPerM2', 'manholeAreaM2']
};

const FIXED_RESULTS: Record<string, string[]> = {
	'resin-quantity': ['matAreaM2', 'glassKg', 'resinKg', 'resinWithWasteKg'],
	'laminate-volume': ['volumeL'],
	'transition-area': ['slantMm', 'areaM2', 'patternInnerRadiusMm', 'patternOuterRadiusMm', 'patternAngleDeg'],
	'groundwater-head': ['pressureKPa', 'pressureBar', 'pressurePsi'],
	'pressure-window': ['minBar', 'maxBar', 'ok'],
	'end-thrust': ['forceKN', 'forceKgf', 'forceLbf'],
	'cure-time': ['minutes', 'potLifeMinutes'],
	'f1216-partial': ['ovalityFactorC', 'dr', 'thicknessIn', 'thicknessMm'],
	'f1216-full': ['thicknessX13In', 'thicknessX14In', 'thicknessIn', 'governs'],
	'air-test': ['minimumSeconds'],
	'water-test': ['wettedAreaM2', 'allowedL']
};

describe('the calculator registry', () => {
	it('holds exactly the thirteen calculators, in listing order', () => {
		expect(listCalculators().map((c) => c.id)).toEqual(Object.keys(FIXED_INPUTS));
		expect(Object.keys(calculators).sort()).toEqual(Object.keys(FIXED_INPUTS).sort());
	});

	for (const [id, names] of Object.entries(FIXED_INPUTS)) {
		it(`${id} takes its fixed input names`, () => {
			const inputs = calculators[id].inputs.map((s) => s.name);
			expect(inputs).toEqual(expect.arrayContaining(names));
		});
	}

	for (const [id, names] of Object.entries(FIXED_RESULTS)) {
		it(`${id} gives its fixed result names`, () => {
			expect(calculators[id].results.map((r) => r.name)).toEqual(expect.arrayContaining(names));
		});
	}

	for (const def of Object.values(calculators)) {
		it(`${def.id}: specs are consistent and the defaults compute cleanly`, () => {
			for (const spec of def.inputs) {
				expect(quantityOf(spec.unit), `${spec.name} unit "${spec.unit}"`).toBeDefined();
				expect(spec.min).toBeLessThanOrEqual(spec.default);
				expect(spec.default).toBeLessThanOrEqual(spec.max);
				if (spec.choices) expect(spec.choices).toContain(spec.default);
				if (spec.choiceLabels) expect(spec.choiceLabels).toHaveLength(spec.choices!.length);
			}
			for (const r of def.results) expect(quantityOf(r.unit), `${r.name} unit "${r.unit}"`).toBeDefined();
			if (def.lesson) {
				expect(def.lesson).toMatch(
					/^\/courses\/(point-repair-installer|transition-patches|packer-pressure-safety)\/[a-z0-9-]+$/
				);
			}

			const out = runCalculation(def.id, defaultInputs(def));
			expect(out.ok).toBe(true);
			if (!out.ok) return;
			expect(Object.keys(out.result).sort()).toEqual(def.results.map((r) => r.name).sort());
			for (const value of Object.values(out.result)) {
				if (typeof value === 'number') expect(Number.isFinite(value)).toBe(true);
			}
			expect(out.steps.length).toBeGreaterThan(0);
			expect(out.sources.length).toBeGreaterThan(0);
			expect(out.warnings).toEqual(out.alerts.map((a) => `${a.title}: ${a.text}`));
		});
	}

	it('puts standing safety cautions on every calculator involving pressure or thrust', () => {
		for (const id of ['groundwater-head', 'pressure-window', 'end-thrust', 'air-test', 'water-test']) {
			expect(calculators[id].cautions?.some((c) => c.level === 'danger'), id).toBe(true);
		}
	});

	it('lists plain data that survives JSON', () => {
		const listing = listCalculators();
		expect(JSON.parse(JSON.stringify(listing))).toEqual(listing);
		const resin = listing.find((c) => c.id === 'resin-quantity')!;
		expect(resin.inputs[0]).toMatchObject({ name: 'diameterMm', unit: 'mm', default: 150, min: 50, max: 1600 });
	});
});

describe('runCalculation validation', () => {
	const resin = defaultInputs(calculators['resin-quantity']);

	it('404s an unknown id, including names inherited from Object', () => {
		expect(runCalculation('nope', {})).toMatchObject({ ok: false, status: 404 });
		expect(runCalculation('constructor', {})).toMatchObject({ ok: false, status: 404 });
	});

	it('names each missing required input and fills optional ones with defaults', () => {
		const out = runCalculation('resin-quantity', { diameterMm: 150 });
		expect(out).toMatchObject({
			ok: false,
			status: 400,
			errors: { lengthMm: 'Required', plies: 'Required', matWeightGm2: 'Required', resinGlassRatio: 'Required' }
		});
		expect(out.ok || 'wastePercent' in out.errors).toBe(false);
	});

	it('rejects non-numbers, NaN-like strings, booleans and infinities', () => {
		for (const bad of ['abc', '12abc', true, [], {}, '1e999']) {
			const out = runCalculation('resin-quantity', { ...resin, diameterMm: bad });
			expect(out, JSON.stringify(bad)).toMatchObject({ ok: false, errors: { diameterMm: expect.stringMatching(/number|between/) } });
		}
	});

	it('accepts numeric strings as forms send them', () => {
		const out = runCalculation('resin-quantity', { ...resin, diameterMm: ' 150 ', lengthMm: '6e2', resinGlassRatio: '1.2' });
		expect(out.ok && out.result.resinWithWasteKg).toBeCloseTo(1.17, 2);
	});

	it('gives the range with its unit for out-of-range values', () => {
		const out = runCalculation('resin-quantity', { ...resin, diameterMm: 20 });
		expect(out).toMatchObject({ errors: { diameterMm: 'Must be between 50 and 1600 mm' } });
	});

	it('insists on whole numbers of plies', () => {
		const out = runCalculation('resin-quantity', { ...resin, plies: 2.5 });
		expect(out).toMatchObject({ errors: { plies: 'Must be a whole number' } });
	});

	it('names unknown inputs rather than ignoring a typo', () => {
		const out = runCalculation('resin-quantity', { ...resin, diameter: 150 });
		expect(out).toMatchObject({ errors: { diameter: expect.stringContaining('Unknown input') } });
	});

	it('rejects inputs that are not an object', () => {
		for (const bad of [null, 5, 'x', [1, 2]]) {
			expect(runCalculation('resin-quantity', bad)).toMatchObject({
				ok: false,
				status: 400,
				errors: { inputs: 'Must be an object of named numbers' }
			});
		}
	});
});
