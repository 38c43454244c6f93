/**
 * Computed practice problems: seeded generators over the calculation library, and their
 * checking. Pure and isomorphic (no database, environment or framework imports), so the
 * practice API, the course test's server-side grading, the bench and the tests share it.
 *
 * The answer to a problem is never written down here: it is what `runCalculation` returns
 * for the problem's calculator and inputs.
 */
import { calculators, runCalculation, type CalculationSuccess } from '../calc/index';
import { convert, quantityOf, unitLabel } from '../calc/units';
import { roundSignificant } from '../calc/worksheet';
import { formatAmount, gradeNumeric, unitSlip, withinTolerance, type Amount, type NumericOutcome, type TypedAnswer } from './grading';
import { endThrustGenerator, groundwaterHeadGenerator, pressureWindowGenerator } from './generators/pressure';
import { laminateVolumeGenerator, matSizeGenerator, mixRatioGenerator, resinQuantityGenerator } from './generators/materials';
import { airTestGenerator, cureTimeGenerator, f1216PartialGenerator, transitionAreaGenerator, waterTestGenerator } from './generators/others';
import { isSeed, Rng } from './random';
import type { Choice, Generator, Mistake, Problem } from './types';

export type { Choice, Generator, Mistake, Problem } from './types';
export { isSeed, MAX_SEED, randomSeed } from './random';

const all: Generator[] = [
	resinQuantityGenerator,
	laminateVolumeGenerator,
	matSizeGenerator,
	transitionAreaGenerator,
	mixRatioGenerator,
	groundwaterHeadGenerator,
	pressureWindowGenerator,
	endThrustGenerator,
	cureTimeGenerator,
	waterTestGenerator,
	airTestGenerator,
	f1216PartialGenerator
];

export const generators: Record<string, Generator> = Object.fromEntries(all.map((g) => [g.id, g]));

export function getGenerator(id: string): Generator | undefined {
	return Object.hasOwn(generators, id) ? generators[id] : undefined;
}

export interface GeneratorListing {
	id: string;
	calculator: string;
	title: string;
	topic: string;
	level: Generator['level'];
	lesson: string | null;
	tolerancePercent: number;
}

export function listGenerators(): GeneratorListing[] {
	return all.map((g) => ({
		id: g.id,
		calculator: g.calculator,
		title: g.title,
		topic: g.topic,
		level: g.level,
		lesson: calculators[g.calculator]?.lesson ?? null,
		tolerancePercent: g.tolerancePercent
	}));
}

/** The problem for `seed`: always the same one. Throws for an unknown generator or a bad seed. */
export function generateProblem(generatorId: string, seed: number): Problem {
	const gen = getGenerator(generatorId);
	if (!gen) throw new Error(`Unknown generator "${generatorId}"`);
	if (!isSeed(seed)) throw new Error(`Bad seed ${seed}: must be an integer from 0 to 4294967295`);
	const draft = gen.create(new Rng(seed));
	return {
		generator: gen.id,
		seed,
		calculator: gen.calculator,
		inputs: draft.inputs,
		asks: draft.asks,
		unit: draft.unit,
		prompt: draft.prompt,
		topic: gen.topic,
		lesson: calculators[gen.calculator]?.lesson ?? null,
		kind: draft.kind ?? 'numeric',
		...(draft.choices ? { choices: draft.choices } : {}),
		...(draft.given ? { given: draft.given } : {}),
		tolerancePercent: gen.tolerancePercent
	};
}

/** A problem as shown to the person: without `given`, whose figures are already in the prompt. */
export type PublicProblem = Omit<Problem, 'given'>;

export function publicProblem(problem: Problem): PublicProblem {
	const shown: Problem = { ...problem };
	delete shown.given;
	return shown;
}

function solve(problem: Problem): CalculationSuccess {
	const out = runCalculation(problem.calculator, problem.inputs);
	if (!out.ok) throw new Error(`Problem ${problem.generator}#${problem.seed} has invalid inputs: ${JSON.stringify(out.errors)}`);
	return out;
}

function resultUnit(calculator: string, field: string): string {
	const spec = calculators[calculator]?.results.find((r) => r.name === field);
	if (!spec) throw new Error(`Calculator ${calculator} has no result ${field}`);
	return spec.unit;
}

/** The expected answer of a numeric problem, in the unit asked. */
export function expectedAmount(problem: Problem, solved = solve(problem)): Amount {
	const value = Number(solved.result[problem.asks]);
	return { value: roundSignificant(convert(value, resultUnit(problem.calculator, problem.asks), problem.unit)), unit: problem.unit };
}

/** The right choice of a decision problem. */
export function expectedChoice(problem: Problem, solved = solve(problem)): Choice {
	const gen = getGenerator(problem.generator);
	const value = gen?.decide?.(problem, solved.result);
	const choice = problem.choices?.find((c) => c.value === value);
	if (!choice) throw new Error(`Problem ${problem.generator}#${problem.seed} has no decision`);
	return choice;
}

/** An answer: a number with its unit for numeric problems, a choice's value for decisions. */
export type ProblemAnswer = TypedAnswer & { choice?: unknown };

export type CheckOutcome = NumericOutcome | 'no-choice' | 'unknown-choice';

export interface CheckResult {
	correct: boolean;
	outcome: CheckOutcome;
	message: string;
	expected: Amount | Choice;
	/** The worked solution, from the calculator's own steps. */
	steps: string[];
	/** The usual mistake the answer matches, when one does. */
	hint?: string;
}

/** Checks an answer to a problem; the answer is computed by the calculation library. */
export function checkAnswer(problem: Problem, answer: ProblemAnswer | null | undefined): CheckResult {
	const solved = solve(problem);
	if (problem.kind === 'choice') return checkChoice(problem, solved, answer);

	const expected = expectedAmount(problem, solved);
	const steps = [...solved.steps];
	const fieldUnit = resultUnit(problem.calculator, problem.asks);
	if (fieldUnit !== problem.unit) {
		steps.push(`In the unit asked: ${formatAmount({ value: Number(solved.result[problem.asks]), unit: fieldUnit })} = ${formatAmount(expected)}`);
	}
	const grade = gradeNumeric(expected, answer, problem.tolerancePercent);
	const result: CheckResult = { correct: grade.correct, outcome: grade.outcome, message: grade.message, expected, steps };
	if (!grade.correct && answer && grade.valueInUnit !== undefined) {
		const hint = mistakeHint(problem, grade.valueInUnit, expected) ?? slipHint(expected, answer, problem.tolerancePercent);
		if (hint) result.hint = hint;
	} else if (!grade.correct && answer && grade.outcome === 'wrong-quantity') {
		result.hint = 'Check which quantity is asked for, and pick a unit of it.';
	}
	return result;
}

function checkChoice(problem: Problem, solved: CalculationSuccess, answer: ProblemAnswer | null | undefined): CheckResult {
	const gen = getGenerator(problem.generator)!;
	const expected = expectedChoice(problem, solved);
	const steps = [...solved.steps];
	const closing = gen.decisionStep?.(problem, solved.result);
	if (closing) steps.push(closing);
	const chosen = answer?.choice;
	if (chosen === undefined || chosen === null || chosen === '') {
		return { correct: false, outcome: 'no-choice', message: 'No choice was made.', expected, steps };
	}
	if (typeof chosen !== 'string' || !problem.choices?.some((c) => c.value === chosen)) {
		return { correct: false, outcome: 'unknown-choice', message: 'That is not one of the choices.', expected, steps };
	}
	const correct = chosen === expected.value;
	const result: CheckResult = {
		correct,
		outcome: correct ? 'correct' : 'wrong',
		message: correct ? `Right: ${expected.label}.` : `Not quite: ${expected.label}.`,
		expected,
		steps
	};
	const hint = correct ? undefined : gen.choiceHint?.(problem, solved.result, chosen);
	if (hint) result.hint = hint;
	return result;
}

/**
 * The answer a usual mistake produces, in the unit asked; a different quantity given instead
 * (the wetted area typed as litres) counts by its bare number. Undefined when the mistaken
 * inputs cannot be computed.
 */
export function mistakeValue(problem: Problem, mistake: Mistake): number | undefined {
	const out = runCalculation(problem.calculator, mistake.inputs ?? problem.inputs);
	if (!out.ok) return undefined;
	const field = mistake.asks ?? problem.asks;
	const unit = resultUnit(problem.calculator, field);
	const value = Number(out.result[field]);
	return quantityOf(unit) === quantityOf(problem.unit) ? convert(value, unit, problem.unit) : value;
}

/** The first usual mistake whose recomputed answer matches the person's. */
function mistakeHint(problem: Problem, valueInUnit: number, expected: Amount): string | undefined {
	const gen = getGenerator(problem.generator);
	for (const mistake of gen?.mistakes?.(problem) ?? []) {
		const wrong = mistakeValue(problem, mistake);
		if (wrong === undefined || withinTolerance(wrong, expected.value, problem.tolerancePercent)) continue;
		if (withinTolerance(valueInUnit, wrong, problem.tolerancePercent)) return mistake.hint;
	}
	return undefined;
}

function slipHint(expected: Amount, answer: TypedAnswer, tolerancePercent: number): string | undefined {
	const unit = unitSlip(expected, answer, tolerancePercent);
	if (unit === undefined) return undefined;
	const shown = formatAmount({ value: convert(expected.value, expected.unit, unit), unit });
	return `Your number would be right in ${unitLabel(unit)} (${shown}), not in the unit you gave. Check the unit.`;
}

/** A short label for an amount or a choice, for review screens. */
export function describeExpected(expected: Amount | Choice): string {
	return 'label' in expected ? expected.label : formatAmount(expected, Math.abs(expected.value) >= 1000 ? 4 : 3);
}

