/**
 * `npm run bench`: how fast the trade calculations run in process, then the built app over
 * HTTP beside a bare node:http + SQLite server, and page weight in Chromium
 * (scripts/bench-http.ts; needs `npm run build` first). `npm run bench -- calc` runs only the
 * in-process part, `npm run bench -- http` only the HTTP part, `npm run bench -- certificates`
 * only the certificate PDF and look-up figures (scripts/bench-certificates.ts), `npm run bench -- board`
 * only the compliance board of a 1,000-person company (scripts/bench-board.ts).
 * In-process sections are independent functions; add one (for example problems generated and graded
 * per second) by writing another function that returns BenchResult rows and listing it in
 * `sections` below.
 */
import { answerCalculation } from '../src/lib/calc/api.ts';
import { calculators, defaultInputs, runCalculation } from '../src/lib/calc/index.ts';
import { checkAnswer, expectedAmount, generateProblem, listGenerators, type Problem } from '../src/lib/practice/index.ts';
import { bench, printSection, type BenchResult } from './bench-lib.ts';
import { runHttpBench } from './bench-http.ts';
import { lookupBench, pdfBench } from './bench-certificates.ts';
import { boardBench } from './bench-board.ts';

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

const PER_GENERATOR = 5_000;

/** A wrong answer makes the grader look for the usual mistake too: the slower path. */
function wrongAnswer(p: Problem) {
	return p.kind === 'choice' ? { choice: p.choices![0].value } : { value: 1, unit: p.unit };
}

/** Each generator: a problem made from seed i and graded (right, then wrong with the mistake search). */
function problems(): BenchResult[] {
	const ids = listGenerators().map((g) => g.id);
	const rows = ids.map((id) =>
		bench(id, (i) => {
			const p = generateProblem(id, i);
			return checkAnswer(p, wrongAnswer(p));
		}, PER_GENERATOR)
	);
	rows.push(
		bench('whole set, right answers', (i) => {
			const p = generateProblem(ids[i % ids.length], i);
			if (p.kind === 'choice') return checkAnswer(p, { choice: p.choices![1].value });
			const e = expectedAmount(p);
			return checkAnswer(p, { value: e.value, unit: e.unit });
		}, PER_GENERATOR * ids.length),
		bench('whole set, wrong answers', (i) => {
			const p = generateProblem(ids[i % ids.length], i);
			return checkAnswer(p, wrongAnswer(p));
		}, PER_GENERATOR * ids.length)
	);
	return rows;
}

const sections: [string, () => BenchResult[]][] = [
	['Calculations per second (validate + compute + worked steps)', calculations],
	['Calculation API answers per second (no network)', apiAnswers],
	['Practice problems generated and graded per second', problems]
];

const only = process.argv[2];
if (only === 'certificates') {
	await pdfBench();
	await lookupBench();
} else if (only === 'board') {
	await boardBench();
} else {
	if (only !== 'http') for (const [title, run] of sections) printSection(title, run());
	if (only !== 'http') await pdfBench();
	if (only !== 'http') await boardBench();
	if (only !== 'calc') await runHttpBench();
	if (only !== 'calc') await lookupBench();
}
