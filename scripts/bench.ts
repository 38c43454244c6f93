/**
 * `npm run bench`: how fast the trade calculations run.
 * Sections are independent functions; add one (for example problems generated and graded
 * per second) by writing another function that returns BenchResult rows and listing it in
 * `sections` below.
 */
import { answerCalculation } from '../src/lib/calc/api.ts';
import { calculators, defaultInputs, runCalculation } from '../src/lib/calc/index.ts';
import { bench, printSection, type BenchResult } from './bench-lib.ts';

const PER_CALCULATOR = 20_000;

/** Each calculator validated and computed from its default inputs, then the whole set in turn. */
function calculations(): BenchResult[] {
	const cases = Object.values(calculators).map((def) => ({ id: def.id, inputs: defaultInputs(def) }));
	const rows = cases.map(({ id, inputs }) => bench(id, () => runCalculation(id, inputs), PER_CALCULATOR));
	rows.push(
		bench('whole set, round robin', (i) => {
			const { id, inputs } = cases[i % cases.length];
			return runCalculation(id, inputs);
		}, PER_CALCULATOR * cases.length)
	);
	return rows;
}

/** The API's work without the network: JSON body parsed, validated, computed, answered. */
function apiAnswers(): BenchResult[] {
	const bodies = Object.values(calculators).map((def) => ({
		id: def.id,
		body: JSON.stringify({ inputs: defaultInputs(def) })
	}));
	return [
		bench('POST body to answer, whole set', (i) => {
			const { id, body } = bodies[i % bodies.length];
			return answerCalculation(id, body);
		}, 100_000)
	];
}

const sections: [string, () => BenchResult[]][] = [
	['Calculations per second (validate + compute + worked steps)', calculations],
	['Calculation API answers per second (no network)', apiAnswers]
];

for (const [title, run] of sections) printSection(title, run());
