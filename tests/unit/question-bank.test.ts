/**
 * Validates the fixed question banks in content/courses/<course>/questions.yaml:
 * structure (ids, lessons, answer shapes, units), coverage (size, types, lessons) and
 * the correctness of every numeric answer, recomputed independently below.
 */
import { existsSync, readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { add, subtract, unit, type Unit } from 'mathjs';
import { compile } from 'mdsvex';
import { describe, expect, it } from 'vitest';
import { SLOW_CURE_BELOW_C } from '../../src/lib/calc/cure';
import { generators } from '../../src/lib/practice/index';

const CONTENT = join(process.cwd(), 'content', 'courses');

/** Lesson slugs are fixed: lesson URLs, links and questions all refer to them. */
const COURSES = {
	'point-repair-installer': {
		prefix: 'pri',
		lessons: [
			'the-job-and-defects',
			'safety-first',
			'materials',
			'measuring-and-sizing',
			'resin-quantity',
			'wet-out',
			'packer-preparation',
			'placing-and-inflating',
			'cure-and-witness-cup',
			'testing-and-records',
			'cleaning-and-flow-control',
			'resin-families',
			'laterals-and-patch-layouts',
			'records-an-inspector-expects'
		]
	},
	'transition-patches': {
		prefix: 'tp',
		lessons: [
			'why-transitions-are-hard',
			'sizing-the-taper',
			'packer-choice-and-preconditioning',
			'restraints-that-release',
			'thrust-on-the-step',
			'checking-both-sides',
			'testing-the-transition'
		]
	},
	'packer-pressure-safety': {
		prefix: 'pps',
		lessons: [
			'pressure-units',
			'groundwater-head-and-pressure-window',
			'packer-rated-maximum',
			'end-thrust',
			'hoses-gauges-relief-valves',
			'confined-spaces-and-gases',
			'resin-and-fibre-hazards',
			'traffic-and-site-setup',
			'jetting-and-root-cutting-hazards',
			'asbestos-cement-host-pipe',
			'spills-and-waste',
			'emergencies-on-the-job'
		]
	}
} as const;

type CourseSlug = keyof typeof COURSES;

const TYPES = ['single', 'multiple', 'truefalse', 'order', 'numeric'] as const;
/** Units a numeric answer may be given in, mapped to their mathjs names. */
const UNITS: Record<string, string> = {
	mm: 'mm',
	m: 'm',
	m2: 'm^2',
	L: 'L',
	kg: 'kg',
	g: 'g',
	bar: 'bar',
	kPa: 'kPa',
	psi: 'psi',
	kN: 'kN',
	min: 'minute',
	h: 'hour',
	s: 's',
	degC: 'degC'
};

const MIN_QUESTIONS = 40;
const MIN_PER_LESSON = 3;
const MIN_PER_TYPE = 3;

// ---------------------------------------------------------------------------
// Loading

/**
 * Parses YAML with the `yaml` package when it is installed; otherwise with the YAML
 * front-matter parser bundled in mdsvex (js-yaml, YAML 1.1 rules, so bare yes/no
 * become booleans, which the string checks below would catch).
 */
async function parseYaml(text: string): Promise<unknown> {
	const require = createRequire(import.meta.url);
	try {
		const yaml = require('yaml') as { parse(src: string): unknown };
		return yaml.parse(text);
	} catch (e) {
		if ((e as { code?: string }).code !== 'MODULE_NOT_FOUND') throw e;
	}
	if (/^(---|\.\.\.)\s*$/m.test(text)) throw new Error('document markers are not supported');
	const wrapped = `---\nbank:\n${text
		.split('\n')
		.map((line) => `  ${line}`)
		.join('\n')}\n---\n`;
	const out = await compile(wrapped);
	const fm = (out?.data as { fm?: { bank?: unknown } } | undefined)?.fm;
	if (!fm) throw new Error('YAML did not parse');
	return fm.bank;
}

async function loadBank(course: CourseSlug): Promise<unknown> {
	return parseYaml(readFileSync(join(CONTENT, course, 'questions.yaml'), 'utf8'));
}

/** Lesson slugs that exist as files, or null while the course has none yet. */
function lessonFiles(course: CourseSlug): Set<string> | null {
	const dir = join(CONTENT, course, 'lessons');
	if (!existsSync(dir)) return null;
	const files = readdirSync(dir).filter((f) => f.endsWith('.md'));
	return files.length ? new Set(files.map((f) => f.replace(/\.md$/, ''))) : null;
}

// ---------------------------------------------------------------------------
// Validation: returns a list of problems, empty when the bank is sound.

type Numeric = { value: number; unit: string; tolerancePercent: number };
type Question = {
	id: string;
	lesson: string;
	type: (typeof TYPES)[number];
	prompt: string;
	options?: string[];
	answer?: number | number[] | boolean | Numeric;
	explanation: string;
};

const isStr = (v: unknown): v is string => typeof v === 'string' && v.trim().length > 0;
const isIndex = (v: unknown, n: number): v is number =>
	Number.isInteger(v) && (v as number) >= 0 && (v as number) < n;

function checkQuestion(q: Record<string, unknown>, course: CourseSlug, files: Set<string> | null) {
	const errs: string[] = [];
	const id = String(q.id);
	const { prefix, lessons } = COURSES[course];
	const err = (msg: string) => errs.push(`${id}: ${msg}`);

	if (!isStr(q.id) || !new RegExp(`^${prefix}-\\d{3}$`).test(q.id)) err(`id must be ${prefix}-NNN`);
	if (!(lessons as readonly string[]).includes(q.lesson as string)) err(`unknown lesson ${q.lesson}`);
	else if (files && !files.has(q.lesson as string)) err(`no lesson file ${q.lesson}.md`);
	if (!isStr(q.prompt)) err('prompt missing');
	if (!isStr(q.explanation)) err('explanation missing');
	if (!TYPES.includes(q.type as Question['type'])) {
		err(`unknown type ${q.type}`);
		return errs;
	}

	const opts = q.options;
	const hasOptions = q.type === 'single' || q.type === 'multiple' || q.type === 'order';
	if (hasOptions) {
		if (!Array.isArray(opts) || opts.length < 3) err('needs at least 3 options');
		else {
			if (!opts.every(isStr)) err('every option must be a non-empty string');
			if (new Set(opts.map((o) => String(o).trim().toLowerCase())).size !== opts.length)
				err('options repeat');
		}
	} else if (opts !== undefined) err(`${q.type} takes no options`);

	const n = Array.isArray(opts) ? opts.length : 0;
	const a = q.answer;
	switch (q.type) {
		case 'single':
			if (!isIndex(a, n)) err('answer must be an option index');
			break;
		case 'multiple':
			if (!Array.isArray(a) || !a.every((i) => isIndex(i, n))) err('answer must be option indices');
			else if (new Set(a).size !== a.length) err('answer indices repeat');
			else if (a.length < 2 || a.length >= n) err('answer must pick at least 2 options and not all');
			break;
		case 'truefalse':
			if (typeof a !== 'boolean') err('answer must be true or false');
			break;
		case 'order':
			if (a !== undefined) err('order questions list the steps in order and carry no answer');
			break;
		case 'numeric': {
			const num = a as Partial<Numeric> | undefined;
			if (!num || typeof num !== 'object' || Array.isArray(num)) {
				err('answer must be { value, unit, tolerancePercent }');
				break;
			}
			if (typeof num.value !== 'number' || !Number.isFinite(num.value)) err('value must be a number');
			if (typeof num.unit !== 'string' || !(num.unit in UNITS)) err(`unit ${num.unit} not allowed`);
			if (
				typeof num.tolerancePercent !== 'number' ||
				!(num.tolerancePercent > 0 && num.tolerancePercent <= 10)
			)
				err('tolerancePercent must be above 0 and at most 10');
			break;
		}
	}
	return errs;
}

function validateBank(course: CourseSlug, bank: unknown, files = lessonFiles(course)): string[] {
	if (!Array.isArray(bank)) return ['bank is not a list'];
	const errs: string[] = [];
	const seen = new Set<string>();
	for (const q of bank as Record<string, unknown>[]) {
		if (!q || typeof q !== 'object') {
			errs.push('entry is not a mapping');
			continue;
		}
		if (seen.has(String(q.id))) errs.push(`${q.id}: duplicate id`);
		seen.add(String(q.id));
		errs.push(...checkQuestion(q, course, files));
	}
	if (bank.length < MIN_QUESTIONS) errs.push(`only ${bank.length} questions, need ${MIN_QUESTIONS}`);
	for (const lesson of COURSES[course].lessons) {
		const count = bank.filter((q) => q?.lesson === lesson).length;
		if (count < MIN_PER_LESSON) errs.push(`lesson ${lesson} has ${count} questions`);
	}
	for (const type of TYPES) {
		const count = bank.filter((q) => q?.type === type).length;
		if (count < MIN_PER_TYPE) errs.push(`type ${type} has ${count} questions`);
	}
	const prompts = bank.map((q) => String(q?.prompt).trim().toLowerCase());
	if (new Set(prompts).size !== prompts.length) errs.push('two questions share a prompt');
	return errs;
}

// ---------------------------------------------------------------------------
// Independent recomputation of every numeric answer (mathjs units for conversions).

const PI = Math.PI;
/** Conventional water column, 1 cmH2O = 98.0665 Pa (mathjs unit, conventional value). */
const waterHead = (m: number) => unit(m * 100, 'cmH2O');
/** Doubling rule for cure time: t = t_ref x 2^((T_ref - T)/10); common practice. */
const cureMinutes = (tRef: number, tempRef: number, temp: number) =>
	unit(tRef * 2 ** ((tempRef - temp) / 10), 'minute');
/** End thrust F = p x pi D^2 / 4 (pressure on a closed circular end). */
const thrust = (p: Unit, dMm: number) =>
	unit(p.toNumber('Pa') * (PI / 4) * (dMm / 1000) ** 2, 'N');
/** Frustum slant s = sqrt((r2 - r1)^2 + h^2) and lateral area pi (r1 + r2) s; geometry. */
const slant = (d1: number, d2: number, h: number) => Math.hypot((d2 - d1) / 2, h);
const taperArea = (d1: number, d2: number, h: number) =>
	unit((PI * (d1 / 2 + d2 / 2) * slant(d1, d2, h)) / 1e6, 'm^2');
/** Glass mat area = plies x pi x D x L; common practice for wrapped point-repair mats. */
const matArea = (plies: number, dMm: number, lMm: number) => (plies * PI * dMm * lMm) / 1e6;
/** EN 1610 method W allowance over the wetted internal surface pi D L. */
const waterAllowance = (sections: [dMm: number, lM: number][], lPerM2: number) =>
	unit(sections.reduce((s, [d, l]) => s + PI * (d / 1000) * l, 0) * lPerM2, 'L');
/** ASTM F1417: T(1.0 psig) = 0.085 D K / Q, K = 0.000419 D L (not below 1), Q = 0.0015. */
const airTest = (dIn: number, lFt: number, drop: number) =>
	unit(((0.085 * dIn * Math.max(1, 0.000419 * dIn * lFt)) / 0.0015) * drop, 's');

const RECOMPUTE: Record<string, () => Unit> = {
	// Mix ratio by weight, part B share of the total.
	'pri-014': () => unit((1170 * 45) / 145, 'g'),
	// Patch length = defect + overlap at each end.
	'pri-018': () => unit(300 + 2 * 150, 'mm'),
	'pri-019': () => unit(380 + 2 * 300, 'mm'),
	// Mat width around = plies x circumference (+ overlap where stated).
	'pri-020': () => unit(3 * PI * 150, 'mm'),
	'pri-021': () => unit(2 * PI * 225 + 50, 'mm'),
	// ASTM D3034 SDR 35: minimum wall = OD / 35.
	'pri-024': () => unit(6.275 - (2 * 6.275) / 35, 'inch'),
	// Resin = glass x ratio x (1 + waste).
	'pri-025': () => unit(matArea(3, 150, 600) * 1.0 * 2.0 * 1.15, 'kg'),
	'pri-026': () => unit(matArea(4, 150, 400) * 0.6, 'kg'),
	'pri-027': () => unit(matArea(3, 200, 800) * 1.0 * 2.4 * 1.1, 'kg'),
	// Annulus volume pi/4 (D^2 - (D - 2t)^2) L, written out independently of pi t (D - t) L.
	'pri-028': () => unit((PI / 4) * (150 ** 2 - (150 - 12) ** 2) * 600, 'mm^3'),
	'pri-029': () => unit(matArea(2, 300, 1000), 'm^2'),
	'pri-043': () => waterHead(3.5),
	'pri-048': () => cureMinutes(100, 25, 15),
	'pri-049': () => cureMinutes(180, 20, 30),
	'pri-054': () => waterAllowance([[225, 40]], 0.15),
	'pri-055': () => airTest(6, 200, 1.0),
	// Stopper thrust from backed-up sewage: p = rho g h over pi D^2 / 4.
	'pri-061': () => thrust(waterHead(2), 225),
	// Two patches end to end overlapping 100 mm.
	'pri-067': () => unit(1000 + 1000 - 100, 'mm'),
	// EN 1610 with manholes: 0.20 L/m2 over pipe plus the manholes' wetted area.
	'pri-074': () => add(waterAllowance([[150, 30]], 0.2), unit(11 * 0.2, 'L')),

	'tp-008': () => unit(slant(100, 150, 60), 'mm'),
	'tp-009': () => taperArea(100, 150, 60),
	'tp-010': () => taperArea(150, 225, 150),
	// Flat pattern of a frustum: outer radius = s x r2 / (r2 - r1).
	'tp-011': () => unit((slant(100, 150, 60) * 75) / 25, 'mm'),
	'tp-012': () =>
		add(unit(matArea(1, 100, 200) + matArea(1, 150, 200), 'm^2'), taperArea(100, 150, 100)),
	'tp-013': () => unit(3 * PI * 225, 'mm'),
	'tp-020': () => waterHead(2.5),
	// Step thrust = p x (A_large - A_small).
	'tp-032': () => subtract(thrust(unit(2.5, 'bar'), 150), thrust(unit(2.5, 'bar'), 100)),
	'tp-033': () => subtract(thrust(unit(1.2, 'bar'), 225), thrust(unit(1.2, 'bar'), 150)),
	// Lifted end: repair when the lift exceeds 5 % of the diameter (handbook).
	'tp-039': () => unit(0.05 * 150, 'mm'),
	'tp-045': () =>
		add(
			waterAllowance(
				[
					[100, 10],
					[150, 10]
				],
				0.15
			),
			unit(taperArea(100, 150, 100).toNumber('m^2') * 0.15, 'L')
		),

	'pps-001': () => unit(1.5, 'bar'),
	'pps-002': () => unit(30, 'psi'),
	'pps-003': () => waterHead(7),
	// 1 ft of water, 30.48 cmH2O.
	'pps-004': () => unit(12 * 30.48, 'cmH2O'),
	'pps-008': () => waterHead(3.8 - 1.2),
	'pps-009': () => add(waterHead(6), unit(0.5, 'bar')),
	// Same bladder hoop load p x D: p2 = p1 x D1 / D2.
	'pps-016': () => unit((2.5 * 100) / 200, 'bar'),
	'pps-021': () => thrust(unit(2.5, 'bar'), 150),
	'pps-022': () => thrust(unit(1.5, 'bar'), 200),
	'pps-023': () => thrust(unit(1.0, 'bar'), 300),
	'pps-024': () => thrust(unit(30, 'psi'), 100),
	'pps-029': () => unit(36, 'psi'),
	'pps-067': () => thrust(unit(2.0, 'bar'), 150)
};

/**
 * The job figures each computed bank item uses, named as the generator for that kind of
 * problem names them. They are held to the same realistic ranges the generators state
 * (cure temperatures above the 13 °C below which the lesson says the doubling rule fails).
 */
const BANK_INPUTS: Record<string, [generator: string, figures: Record<string, number>]> = {
	'pri-014': ['mix-ratio', { totalKg: 1.17, ratioA: 100, ratioB: 45 }],
	'pri-018': ['resin-quantity', { defectMm: 300, lengthMm: 600 }],
	'pri-019': ['resin-quantity', { defectMm: 380, lengthMm: 980 }],
	'pri-020': ['mat-size', { diameterMm: 150, plies: 3 }],
	'pri-021': ['mat-size', { diameterMm: 225, plies: 2, overlapMm: 50 }],
	'pri-025': ['resin-quantity', { diameterMm: 150, lengthMm: 600, plies: 3, matWeightGm2: 1000, resinGlassRatio: 2, wastePercent: 15 }],
	'pri-026': ['resin-quantity', { diameterMm: 150, lengthMm: 400, plies: 4, matWeightGm2: 600 }],
	'pri-027': ['resin-quantity', { diameterMm: 200, lengthMm: 800, plies: 3, matWeightGm2: 1000, resinGlassRatio: 2.4, wastePercent: 10 }],
	'pri-028': ['laminate-volume', { diameterMm: 150, thicknessMm: 6, lengthMm: 600 }],
	'pri-029': ['mat-size', { diameterMm: 300, plies: 2, patchLengthMm: 1000 }],
	'pri-043': ['groundwater-head', { headM: 3.5 }],
	'pri-048': ['cure-time', { refMinutes: 100, refTempC: 25, tempC: 15 }],
	'pri-049': ['cure-time', { refMinutes: 180, refTempC: 20, tempC: 30 }],
	'pri-054': ['water-test', { diameterMm: 225, lengthM: 40, allowanceLPerM2: 0.15 }],
	'pri-055': ['air-test', { diameterIn: 6, lengthFt: 200, dropPsig: 1 }],
	'pri-061': ['groundwater-head', { headM: 2 }],
	'pri-067': ['mat-size', { patchLengthMm: 1000 }],
	'pri-074': ['water-test', { diameterMm: 150, lengthM: 30, allowanceLPerM2: 0.2, manholeAreaM2: 11 }],
	'tp-008': ['transition-area', { smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 60 }],
	'tp-009': ['transition-area', { smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 60 }],
	'tp-010': ['transition-area', { smallDiameterMm: 150, largeDiameterMm: 225, taperLengthMm: 150 }],
	'tp-011': ['transition-area', { smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 60 }],
	'tp-012': ['transition-area', { smallDiameterMm: 100, largeDiameterMm: 150, taperLengthMm: 100 }],
	'tp-013': ['mat-size', { diameterMm: 225, plies: 3, smallDiameterMm: 150 }],
	'tp-020': ['groundwater-head', { headM: 2.5 }],
	'tp-032': ['end-thrust', { diameterMm: 150, pressureBar: 2.5, smallDiameterMm: 100 }],
	'tp-033': ['end-thrust', { diameterMm: 225, pressureBar: 1.2, smallDiameterMm: 150 }],
	'tp-045': ['water-test', { diameterMm: 150, lengthM: 10, allowanceLPerM2: 0.15 }],
	'pps-008': ['groundwater-head', { headM: 2.6, depthM: 3.8 }],
	'pps-009': ['pressure-window', { groundwaterHeadM: 6, marginBar: 0.5 }],
	'pps-021': ['end-thrust', { diameterMm: 150, pressureBar: 2.5 }],
	'pps-022': ['end-thrust', { diameterMm: 200, pressureBar: 1.5 }],
	'pps-023': ['end-thrust', { diameterMm: 300, pressureBar: 1 }],
	'pps-024': ['end-thrust', { diameterMm: 100, pressureBar: 2.07 }],
	'pps-067': ['end-thrust', { diameterMm: 150, pressureBar: 2 }]
};

/** Computed bank items that are not a generator's kind of job, and why no range applies. */
const NO_JOB_RANGE: Record<string, string> = {
	'pri-024': 'a pipe size from ASTM D3034, not a job figure',
	'tp-039': 'the 5 % lifted-end limit applied to one diameter',
	'pps-001': 'a unit conversion',
	'pps-002': 'a unit conversion',
	'pps-003': 'a unit conversion of a water column',
	'pps-004': 'a unit conversion in feet of water',
	'pps-016': 'the hoop-load ratio between two diameters',
	'pps-029': 'a gauge reading converted to bar'
};

/**
 * Numeric questions whose stored (rounded) value is not well inside the grading tolerance
 * of the recomputed one, or that have no recomputation at all.
 */
function numericMismatches(bank: Question[]): string[] {
	const errs: string[] = [];
	for (const q of bank.filter((q) => q.type === 'numeric')) {
		const recompute = RECOMPUTE[q.id];
		if (!recompute) {
			errs.push(`${q.id}: no recomputation`);
			continue;
		}
		const { value, unit: u, tolerancePercent } = q.answer as Numeric;
		const expected = recompute().toNumber(UNITS[u]);
		const slack = (Math.abs(expected) * tolerancePercent) / 100 / 4;
		if (!(Math.abs(value - expected) <= slack)) errs.push(`${q.id}: ${value} ${u}, recomputed ${expected}`);
	}
	return errs;
}

/** Published check values the helpers above must reproduce before they are trusted. */
describe('recomputation helpers', () => {
	it('reproduce published check values', () => {
		// ASTM F1417 check: 4 in, 0.5 psig drop -> 1:53 min (113 s).
		expect(airTest(4, 400, 0.5).toNumber('s')).toBeCloseTo(113.3, 1);
		// EN 1610 method W example: DN150 x 30 m -> 14.1 m2 -> about 2.1 L.
		expect(waterAllowance([[150, 30]], 0.15).toNumber('L')).toBeCloseTo(2.12, 2);
		// 1 bar = 14.5038 psi (NIST SP 811 conversion factors).
		expect(unit(1, 'bar').toNumber('psi')).toBeCloseTo(14.5038, 4);
		// 1 ft of water = 0.4335 psi (conventional water column, handbook value).
		expect(unit(30.48, 'cmH2O').toNumber('psi')).toBeCloseTo(0.4335, 4);
		// End thrust DN100 at 2.5 bar -> 1.96 kN (pi/4 x 0.1^2 x 250 kPa).
		expect(thrust(unit(2.5, 'bar'), 100).toNumber('kN')).toBeCloseTo(1.963, 3);
	});
});

// ---------------------------------------------------------------------------
// The banks themselves.

const banks = Object.fromEntries(
	await Promise.all(
		(Object.keys(COURSES) as CourseSlug[]).map(async (c) => [c, await loadBank(c)] as const)
	)
) as Record<CourseSlug, unknown>;

describe.each(Object.keys(COURSES) as CourseSlug[])('question bank of %s', (course) => {
	it('is sound: ids, lessons, answer shapes, units, coverage', () => {
		expect(validateBank(course, banks[course])).toEqual([]);
	});

	it('has every numeric answer agreeing with an independent recomputation', () => {
		expect(numericMismatches(banks[course] as Question[])).toEqual([]);
	});
});

describe('computed bank items use realistic job figures', () => {
	const all = Object.values(banks).flat() as Question[];

	it('names the figures of every computed item, or says why none apply', () => {
		const numeric = all.filter((q) => q.type === 'numeric').map((q) => q.id);
		expect(numeric.filter((id) => !(id in BANK_INPUTS) && !(id in NO_JOB_RANGE))).toEqual([]);
		expect(Object.keys(BANK_INPUTS).filter((id) => !numeric.includes(id))).toEqual([]);
	});

	it('keeps every figure inside the range its generator states as realistic', () => {
		const out: string[] = [];
		for (const [id, [generator, figures]] of Object.entries(BANK_INPUTS)) {
			const ranges = generators[generator].ranges;
			for (const [name, value] of Object.entries(figures)) {
				const range = ranges[name];
				if (!range) out.push(`${id}: ${generator} states no range for ${name}`);
				else if (value < range.min || value > range.max) out.push(`${id}: ${name} = ${value} outside ${range.min}-${range.max} (${range.basis})`);
			}
		}
		expect(out).toEqual([]);
	});

	it('keeps cure items above the temperature where the lesson says the doubling rule fails', () => {
		for (const [id, [generator, figures]] of Object.entries(BANK_INPUTS)) {
			if (generator === 'cure-time') expect(figures.tempC, id).toBeGreaterThan(SLOW_CURE_BELOW_C);
		}
	});

	it('catches a figure out of range (the check can fail)', () => {
		const ranges = generators['cure-time'].ranges;
		expect(12 >= ranges.tempC.min).toBe(false);
		expect(generators['resin-quantity'].ranges.defectMm.max).toBeLessThan(700);
	});
});

describe('all banks together', () => {
	it('share no id, and every recomputation belongs to a numeric question', () => {
		const all = Object.values(banks).flat() as Question[];
		const ids = all.map((q) => q.id);
		expect(new Set(ids).size).toBe(ids.length);
		const numericIds = new Set(all.filter((q) => q.type === 'numeric').map((q) => q.id));
		expect(Object.keys(RECOMPUTE).filter((id) => !numericIds.has(id))).toEqual([]);
	});
});

describe('the validator rejects broken banks', () => {
	const course: CourseSlug = 'point-repair-installer';
	const good = () => structuredClone(banks[course]) as Record<string, unknown>[];
	const first = (bank: Record<string, unknown>[], type: string) =>
		bank.find((q) => q.type === type) as Record<string, unknown>;
	const expectError = (bank: unknown, pattern: RegExp) =>
		expect(validateBank(course, bank, null).some((e) => pattern.test(e))).toBe(true);

	it('catches a duplicate id', () => {
		const bank = good();
		bank[1].id = bank[0].id;
		expectError(bank, /duplicate id/);
	});

	it('catches a lesson that is not in the course', () => {
		const bank = good();
		bank[0].lesson = 'sizing-the-taper';
		expectError(bank, /unknown lesson/);
	});

	it('catches a missing lesson file once lesson files exist', () => {
		const bank = good();
		const files = new Set(COURSES[course].lessons.filter((l) => l !== bank[0].lesson));
		expect(validateBank(course, bank, files).some((e) => /no lesson file/.test(e))).toBe(true);
	});

	it('catches an answer index out of range and a wrong answer shape', () => {
		const bank = good();
		first(bank, 'single').answer = 9;
		expectError(bank, /answer must be an option index/);
		const bank2 = good();
		first(bank2, 'truefalse').answer = 'yes';
		expectError(bank2, /true or false/);
		const bank3 = good();
		first(bank3, 'multiple').answer = 1;
		expectError(bank3, /option indices/);
		const bank4 = good();
		first(bank4, 'order').answer = 0;
		expectError(bank4, /carry no answer/);
	});

	it('catches a numeric unit outside the allowed list and a bad tolerance', () => {
		const bank = good();
		const q = first(bank, 'numeric');
		q.answer = { ...(q.answer as Numeric), unit: 'lb' };
		expectError(bank, /unit lb not allowed/);
		const bank2 = good();
		const q2 = first(bank2, 'numeric');
		q2.answer = { ...(q2.answer as Numeric), tolerancePercent: 0 };
		expectError(bank2, /tolerancePercent/);
	});

	it('catches a bank that is too small or leaves a lesson uncovered', () => {
		expectError(good().slice(0, 20), /only 20 questions/);
		const bank = good().filter((q) => q.lesson !== 'wet-out');
		expectError(bank, /lesson wet-out has 0/);
	});

	it('catches a numeric answer that disagrees with its recomputation', () => {
		const bank = good();
		const q = bank.find((q) => q.id === 'pri-025') as Record<string, unknown>;
		q.answer = { ...(q.answer as Numeric), value: 1.7 };
		expect(numericMismatches(bank as Question[])).toEqual([expect.stringMatching(/^pri-025:/)]);
		const bank2 = good();
		(bank2.find((q) => q.id === 'pri-025') as Record<string, unknown>).id = 'pri-999';
		expect(numericMismatches(bank2 as Question[])).toEqual(['pri-999: no recomputation']);
	});

	it('catches an option that YAML turned into something other than text', () => {
		const bank = good();
		(first(bank, 'single').options as unknown[])[1] = false;
		expectError(bank, /non-empty string/);
	});
});
