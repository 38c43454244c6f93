/**
 * Every generator: deterministic per seed, inputs exactly the calculator's and within its
 * stated ranges, the expected answer equal to the calculation library's for the same inputs,
 * accepted in other units, wrong answers refused, usual mistakes recognised.
 */
import { readFileSync } from 'node:fs';
import { unit as mathUnit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { SLOW_CURE_BELOW_C } from '../calc/cure';
import { calculators, parseInputs, runCalculation } from '../calc/index';
import { RESIN_GLASS_CHOPPED_MAT_MIN, RESIN_GLASS_USUAL_MAX } from '../calc/materials';
import { RATINGS } from './generators/pressure';
import { convert, quantityOf } from '../calc/units';
import { unitChoices } from './grading';
import { checkAnswer, expectedAmount, expectedChoice, generateProblem, generators, getGenerator, listGenerators, mistakeValue, publicProblem, type Problem } from './index';

const SEEDS = Array.from({ length: 400 }, (_, i) => (i * 2654435761) >>> 0);
const MANY_SEEDS = Array.from({ length: 1500 }, (_, i) => (i * 2246822519 + 7) >>> 0);

/** The generators a course may list, by calculator id; f1216-full has none (too many inputs for a drill). */
const REQUIRED = [
	'resin-quantity',
	'laminate-volume',
	'mat-size',
	'transition-area',
	'mix-ratio',
	'groundwater-head',
	'pressure-window',
	'end-thrust',
	'cure-time',
	'water-test',
	'air-test',
	'f1216-partial'
];

/** mathjs spellings for the unit codes the problems are asked in (mathjs as independent reference). */
const MATHJS: Record<string, string> = { m2: 'm^2', mm2: 'mm^2', cm2: 'cm^2', ft2: 'ft^2', in2: 'in^2', m3: 'm^3', ft3: 'ft^3', L: 'L', mL: 'mL', gal: 'gal', h: 'hour', mH2O: '', ftH2O: '' };

describe('the generator registry', () => {
	it('has one generator per required calculator, each named after it', () => {
		expect(Object.keys(generators).sort()).toEqual([...REQUIRED].sort());
		for (const g of Object.values(generators)) {
			expect(g.calculator).toBe(g.id);
			expect(calculators[g.calculator]).toBeDefined();
		}
		expect(listGenerators().map((g) => g.id)).toEqual(expect.arrayContaining(REQUIRED));
		expect(getGenerator('no-such')).toBeUndefined();
		expect(getGenerator('constructor')).toBeUndefined();
	});

	it('refuses unknown generators and bad seeds', () => {
		expect(() => generateProblem('no-such', 1)).toThrow(/Unknown generator/);
		expect(() => generateProblem('resin-quantity', -1)).toThrow(/Bad seed/);
		expect(() => generateProblem('resin-quantity', 2 ** 32)).toThrow(/Bad seed/);
	});
});

for (const id of REQUIRED) {
	describe(`generator ${id}`, () => {
		const problems = SEEDS.map((seed) => generateProblem(id, seed));
		const def = calculators[id];

		it('gives the same problem for the same seed, and varied problems over many seeds', () => {
			for (const seed of SEEDS.slice(0, 20)) expect(generateProblem(id, seed)).toEqual(generateProblem(id, seed));
			expect(new Set(problems.map((p) => p.prompt)).size).toBeGreaterThan(30);
		});

		it('takes exactly the calculator inputs, all within the stated ranges, over 400 seeds', () => {
			const names = def.inputs.map((s) => s.name).sort();
			for (const p of problems) {
				expect(Object.keys(p.inputs).sort(), p.prompt).toEqual(names);
				for (const spec of def.inputs) {
					const v = p.inputs[spec.name];
					expect(v, `${spec.name} in ${p.prompt}`).toBeGreaterThanOrEqual(spec.min);
					expect(v, `${spec.name} in ${p.prompt}`).toBeLessThanOrEqual(spec.max);
				}
				expect(parseInputs(def, p.inputs), p.prompt).toMatchObject({ ok: true });
			}
		});

		it('asks for a result the calculator gives, in a unit of the same quantity, and states its figures', () => {
			for (const p of problems) {
				expect(p.calculator).toBe(id);
				expect(p.generator).toBe(id);
				expect(p.prompt.length).toBeGreaterThan(60);
				expect(p.prompt).toMatch(/\?$/);
				if (p.kind === 'choice') {
					expect(p.asks).toBe('decision');
					expect(p.choices!.length).toBeGreaterThanOrEqual(2);
					continue;
				}
				const spec = def.results.find((r) => r.name === p.asks);
				expect(spec, p.asks).toBeDefined();
				expect(quantityOf(p.unit)).toBe(quantityOf(spec!.unit));
				// The figures a person needs are in the words: the inputs, or the figures they come from.
				const words = p.prompt.replace(/,/g, '');
				const stated = def.inputs.filter((s) => !s.optional && words.includes(String(p.inputs[s.name])));
				const derived = Object.values(p.given ?? {}).filter((v) => words.includes(String(v)));
				expect(stated.length + derived.length, p.prompt).toBeGreaterThanOrEqual(Math.min(2, def.inputs.filter((s) => !s.optional).length));
			}
		});

		it('expects exactly what the calculation library computes for the same inputs', () => {
			for (const p of problems.filter((q) => q.kind === 'numeric')) {
				const out = runCalculation(id, p.inputs);
				if (!out.ok) throw new Error('invalid inputs');
				const field = def.results.find((r) => r.name === p.asks)!;
				const raw = Number(out.result[p.asks]);
				const expected = expectedAmount(p);
				expect(expected.unit).toBe(p.unit);
				// Six significant figures, as the calculation library rounds its results.
				expect(expected.value / convert(raw, field.unit, p.unit)).toBeCloseTo(1, 5);
				const mathFrom = MATHJS[field.unit] ?? field.unit;
				const mathTo = MATHJS[p.unit] ?? p.unit;
				if (field.unit !== p.unit && mathFrom && mathTo) {
					expect(expected.value / mathUnit(raw, mathFrom).toNumber(mathTo)).toBeCloseTo(1, 5);
				}
				expect(Number.isFinite(expected.value) && expected.value > 0, p.prompt).toBe(true);
			}
		});

		it('accepts the answer in every offered unit, rounded to 3 figures, and refuses 10 % off', () => {
			for (const p of problems.slice(0, 100)) {
				if (p.kind === 'choice') {
					const right = expectedChoice(p).value;
					expect(checkAnswer(p, { choice: right }).correct).toBe(true);
					const wrong = p.choices!.find((c) => c.value !== right)!.value;
					expect(checkAnswer(p, { choice: wrong }).correct).toBe(false);
					continue;
				}
				const expected = expectedAmount(p);
				for (const unit of unitChoices(p.unit)) {
					const value = Number(convert(expected.value, p.unit, unit).toPrecision(3));
					expect(checkAnswer(p, { value, unit }).correct, `${value} ${unit} for ${p.prompt}`).toBe(true);
				}
				const off = checkAnswer(p, { value: expected.value * 1.1, unit: p.unit });
				expect(off.correct).toBe(false);
				expect(off.steps.length).toBeGreaterThan(0);
				expect(off.expected).toEqual(expected);
			}
		});

		it('recognises each usual mistake from the answer it produces', () => {
			const gen = getGenerator(id)!;
			let recognised = 0;
			for (const p of problems.slice(0, 60)) {
				if (p.kind === 'choice') continue;
				for (const mistake of gen.mistakes?.(p) ?? []) {
					const value = mistakeValue(p, mistake);
					if (value === undefined) continue;
					const check = checkAnswer(p, { value, unit: p.unit });
					if (check.correct) continue;
					expect(check.hint, `${mistake.hint} for ${p.prompt}`).toBeDefined();
					recognised++;
				}
			}
			if (gen.mistakes) expect(recognised).toBeGreaterThan(20);
		});

		it('shows the problem without hidden figures', () => {
			const shown = publicProblem(problems[0]) as Problem;
			expect(shown.given).toBeUndefined();
			expect(shown.seed).toBe(SEEDS[0]);
		});
	});
}

describe('problem checks against hand-worked and published values', () => {
	const base = generateProblem('resin-quantity', 1);

	it('resin: DN150, 600 mm, 3 plies of 1000 g/m², ratio 1.2, 15 % waste is 1.17 kg (hand-worked, common practice)', () => {
		const p: Problem = { ...base, inputs: { diameterMm: 150, lengthMm: 600, plies: 3, matWeightGm2: 1000, resinGlassRatio: 1.2, wastePercent: 15 }, asks: 'resinWithWasteKg', unit: 'kg', given: undefined };
		expect(checkAnswer(p, { value: 1.17, unit: 'kg' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 1170, unit: 'g' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 1.02, unit: 'kg' }).hint).toMatch(/waste/);
		expect(checkAnswer(p, { value: 0.585, unit: 'kg' }).hint).toMatch(/radius/);
		expect(checkAnswer(p, { value: 1.17, unit: 'lb' }).hint).toMatch(/right in kg/);
	});

	it('end thrust: DN150 at 2.0 bar is 3.53 kN (statics, F = p × πD²/4)', () => {
		const thrust = generateProblem('end-thrust', 1);
		const p: Problem = { ...thrust, inputs: { diameterMm: 150, pressureBar: 2, smallDiameterMm: 0 }, asks: 'forceKN', unit: 'kN' };
		expect(checkAnswer(p, { value: 3.53, unit: 'kN' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 360, unit: 'kgf' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 3.53 / 4, unit: 'kN' }).hint).toMatch(/radius/);
	});

	it('air test: 4 in, 0.5 psig drop takes 1:53 (ASTM F1417)', () => {
		const air = generateProblem('air-test', 1);
		const p: Problem = { ...air, inputs: { diameterIn: 4, lengthFt: 300, dropPsig: 0.5 }, asks: 'minimumMinutes', unit: 'min' };
		expect(checkAnswer(p, { value: '1:53', unit: 'min' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 113, unit: 's' }).correct).toBe(true);
		expect(checkAnswer(p, { value: '3:47', unit: 'min' }).hint).toMatch(/half as long/);
	});

	it('cure: 2 h at 20 °C is 4 h at 10 °C by the doubling rule (common practice)', () => {
		const cure = generateProblem('cure-time', 1);
		const p: Problem = { ...cure, inputs: { refMinutes: 120, refTempC: 20, tempC: 10, factorPer10C: 2, potLifeRefMinutes: 30 }, asks: 'hours', unit: 'h', given: undefined };
		expect(checkAnswer(p, { value: 4, unit: 'h' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 1, unit: 'h' }).hint).toMatch(/Colder means slower/);
		expect(checkAnswer(p, { value: 2, unit: 'h' }).hint).toMatch(/Correct the data sheet time/);
	});

	it('water test: DN150 × 30 m allows 2.1 L (EN 1610, 0.15 L/m²)', () => {
		const water = generateProblem('water-test', 1);
		const p: Problem = { ...water, inputs: { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.15 }, asks: 'allowedL', unit: 'L' };
		expect(checkAnswer(p, { value: 2.1, unit: 'L' }).correct).toBe(true);
		expect(checkAnswer(p, { value: 2.83, unit: 'L' }).correct).toBe(false);
	});

	it('water test with two manholes: 0.20 L/m² of pipe plus manholes (EN 1610 13.3; manhole area by geometry)', () => {
		const water = generateProblem('water-test', 1);
		// Two 1.0 m manholes filled 1.5 m deep: 2 × (π × 1.0 × 1.5 + π × 1.0² / 4) = 11.0 m².
		const manholes = 2 * (Math.PI * 1.5 + Math.PI / 4);
		const p: Problem = { ...water, inputs: { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.2, manholeAreaM2: 11 }, asks: 'allowedL', unit: 'L' };
		expect(manholes).toBeCloseTo(11, 1);
		expect(checkAnswer(p, { value: (14.137 + 11) * 0.2, unit: 'L' }).correct).toBe(true);
		// 0.20 × the pipe alone (2.83 L) forgets the manholes.
		expect(checkAnswer(p, { value: 2.83, unit: 'L' }).correct).toBe(false);
		expect(checkAnswer(p, { value: 14.137 * 0.15, unit: 'L' }).hint).toMatch(/manholes are part of the test/);
	});
});

describe('is this pressure safe?', () => {
	const decisions = MANY_SEEDS.map((s) => generateProblem('pressure-window', s)).filter((p) => p.kind === 'choice');

	it('draws every kind of decision, the unsafe ones included', () => {
		const kinds = new Set(decisions.map((p) => expectedChoice(p).value));
		expect([...kinds].sort()).toEqual(['inside', 'no-window', 'too-high', 'too-low', 'window']);
	});

	it('explains a wrong decision and refuses an empty or unknown choice', () => {
		const p = decisions.find((q) => expectedChoice(q).value === 'too-high')!;
		const check = checkAnswer(p, { choice: 'inside' });
		expect(check.correct).toBe(false);
		expect(check.hint).toMatch(/rating/);
		expect(check.steps.at(-1)).toMatch(/Planned/);
		expect(checkAnswer(p, {}).outcome).toBe('no-choice');
		expect(checkAnswer(p, { choice: 'maybe' }).outcome).toBe('unknown-choice');
		const none = decisions.find((q) => expectedChoice(q).value === 'no-window')!;
		expect(checkAnswer(none, { choice: 'window' }).hint).toMatch(/more than the packer/);
	});
});

/**
 * Each choice of a decision item, judged on its own against an independent reckoning of the
 * window: the groundwater head in bar by mathjs (1 m of water = 9.80665 kPa, conventional)
 * plus the margin, against the maker's rating (common practice). A choice is defensible when
 * what it says is true; every item must have exactly one.
 */
function defensible(p: Problem, choice: string): boolean {
	const min = mathUnit(p.inputs.groundwaterHeadM * 1000 * 9.80665, 'Pa').toNumber('bar') + p.inputs.marginBar;
	const max = p.inputs.ratedMaxBar;
	const planned = p.given?.proposedBar;
	const statements: Record<string, () => boolean> = {
		'too-low': () => planned !== undefined && planned < min,
		inside: () => planned !== undefined && planned >= min && planned <= max,
		'too-high': () => planned !== undefined && planned > max,
		window: () => min <= max,
		'no-window': () => min > max
	};
	if (!Object.hasOwn(statements, choice)) throw new Error(`No independent reckoning for choice "${choice}" of ${p.generator}`);
	return statements[choice]();
}

describe('every multiple-choice item has exactly one defensible answer', () => {
	const choiceItems = Object.keys(generators).flatMap((id) => MANY_SEEDS.map((s) => generateProblem(id, s)).filter((p) => p.kind === 'choice'));

	it('finds choice items to check', () => {
		expect(choiceItems.length).toBeGreaterThan(300);
	});

	it('tries every option of every generated item against the calculation: exactly one holds, and it is the key', () => {
		for (const p of choiceItems) {
			const right = p.choices!.filter((c) => defensible(p, c.value)).map((c) => c.value);
			expect(right, p.prompt).toEqual([expectedChoice(p).value]);
		}
	});

	it('keeps a planned pressure clear of the window edges (no trick questions)', () => {
		for (const p of choiceItems.filter((q) => q.given?.proposedBar !== undefined)) {
			const min = mathUnit(p.inputs.groundwaterHeadM * 1000 * 9.80665, 'Pa').toNumber('bar') + p.inputs.marginBar;
			expect(Math.min(Math.abs(p.given!.proposedBar - min), Math.abs(p.given!.proposedBar - p.inputs.ratedMaxBar)), p.prompt).toBeGreaterThanOrEqual(0.05 - 1e-9);
		}
	});

	it('catches an item with two right answers (the check itself can fail)', () => {
		const p = choiceItems.find((q) => expectedChoice(q).value === 'too-low')!;
		const both: Problem = { ...p, choices: [...p.choices!, { value: 'no-window', label: 'No pressure is safe' }], inputs: { ...p.inputs, ratedMaxBar: 0.1 } };
		expect(both.choices!.filter((c) => defensible(both, c.value)).length).toBeGreaterThan(1);
	});
});

describe('generated inputs stay within each generator’s stated realistic ranges', () => {
	for (const [id, gen] of Object.entries(generators)) {
		it(`${id}: every input and stated figure has a range with its basis, inside the calculator's limits, and every draw stays in it`, () => {
			const def = calculators[gen.calculator];
			for (const [name, range] of Object.entries(gen.ranges)) {
				expect(range.basis.length, `${id}.${name} basis`).toBeGreaterThan(10);
				expect(range.min, `${id}.${name}`).toBeLessThanOrEqual(range.max);
				const spec = def.inputs.find((s) => s.name === name);
				if (spec) {
					expect(range.min, `${id}.${name}`).toBeGreaterThanOrEqual(spec.min);
					expect(range.max, `${id}.${name}`).toBeLessThanOrEqual(spec.max);
				}
			}
			for (const seed of MANY_SEEDS) {
				const p = generateProblem(id, seed);
				for (const [name, value] of [...Object.entries(p.inputs), ...Object.entries(p.given ?? {})]) {
					const range = gen.ranges[name];
					expect(range, `${id}: no stated range for ${name}`).toBeDefined();
					expect(value, `${name} in ${p.prompt}`).toBeGreaterThanOrEqual(range.min - 1e-9);
					expect(value, `${name} in ${p.prompt}`).toBeLessThanOrEqual(range.max + 1e-9);
				}
			}
		});
	}

	it('cure problems stay above the temperature below which the lesson says the doubling rule fails', () => {
		expect(generators['cure-time'].ranges.tempC.min).toBeGreaterThan(SLOW_CURE_BELOW_C);
		for (const seed of MANY_SEEDS) {
			const p = generateProblem('cure-time', seed);
			expect(p.inputs.tempC, p.prompt).toBeGreaterThan(SLOW_CURE_BELOW_C);
			expect(runCalculation('cure-time', p.inputs)).toMatchObject({ ok: true, warnings: [] });
		}
	});

	it('resin ratios are chopped-mat hand lay-up figures, inside the calculator’s no-warning band', () => {
		for (const seed of MANY_SEEDS) {
			const p = generateProblem('resin-quantity', seed);
			expect(p.inputs.resinGlassRatio).toBeGreaterThanOrEqual(RESIN_GLASS_CHOPPED_MAT_MIN);
			expect(p.inputs.resinGlassRatio).toBeLessThanOrEqual(RESIN_GLASS_USUAL_MAX);
		}
	});

	it('packer ratings agree with the example table the packer-rating lesson teaches (225 mm: 2.0 bar)', () => {
		expect(Object.fromEntries(RATINGS)).toMatchObject({ 100: 2.5, 150: 2.5, 200: 2, 225: 2, 250: 1.5, 300: 1.5 });
		const lesson = readFileSync('content/courses/packer-pressure-safety/lessons/packer-rated-maximum.md', 'utf8');
		expect(lesson).toMatch(/\| 151 to 225 mm \| 2\.0 bar \|/);
		expect(lesson).toMatch(/\| 226 to 300 mm \| 1\.5 bar \|/);
	});

	it('laterals and drains come in 100-150 mm, and defects stay point-repair sized', () => {
		for (const seed of MANY_SEEDS) {
			const p = generateProblem('resin-quantity', seed);
			if (/lateral|drain/.test(p.prompt)) expect(p.inputs.diameterMm, p.prompt).toBeLessThanOrEqual(150);
			if (p.given?.defectMm !== undefined) expect(p.given.defectMm).toBeLessThanOrEqual(600);
		}
	});
});
