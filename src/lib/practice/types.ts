import type { Inputs } from '../calc/types';
import type { Rng } from './random';

/** One choice of a decision problem ("is this pressure safe?"). */
export interface Choice {
	value: string;
	label: string;
}

/**
 * A computed problem: an instance of one calculator. The answer is never stored here; it is
 * computed from `calculator` and `inputs` by the calculation library when checked.
 */
export interface Problem {
	generator: string;
	seed: number;
	/** The calculator id, as in the calculation API. */
	calculator: string;
	/** Exactly that calculator's inputs, in its own units. */
	inputs: Inputs;
	/** The result field wanted, or 'decision' for a choice problem. */
	asks: string;
	/** The unit the answer is asked in ('' for a plain number or a decision). */
	unit: string;
	/** The job situation, in words. */
	prompt: string;
	topic: string;
	/** '/courses/<course>/<lesson>' that explains it, when there is one. */
	lesson: string | null;
	kind: 'numeric' | 'choice';
	/** Decision problems only. */
	choices?: Choice[];
	/** Figures in the prompt that are not calculator inputs (a proposed pressure, the air temperature). */
	given?: Record<string, number>;
	tolerancePercent: number;
}

/** The parts of a problem a generator chooses; the rest is filled in from the generator. */
export type ProblemDraft = Pick<Problem, 'inputs' | 'asks' | 'unit' | 'prompt'> &
	Partial<Pick<Problem, 'kind' | 'choices' | 'given'>>;

/** A usual mistake, recognised by recomputing the problem with it made. */
export interface Mistake {
	hint: string;
	/** The inputs as the mistaken person used them. */
	inputs?: Inputs;
	/** A different result field the person gave instead. */
	asks?: string;
}

/** The realistic range a generator draws one input (or one stated figure) from, and why. */
export interface DrawRange {
	min: number;
	max: number;
	/** Where the range comes from: what crews meet, or where the lesson says the rule holds. */
	basis: string;
}

export interface Generator {
	/** The same as the calculator id, so a course test lists generators by calculator. */
	id: string;
	calculator: string;
	title: string;
	topic: string;
	/** The level a learner meets it at; 'advanced' problems are offered, not drilled by default. */
	level: 'foundation' | 'advanced';
	/** Suited to the quantity: metering resin is held to 2 %, rule-of-thumb cure times to 3 %. */
	tolerancePercent: number;
	/**
	 * Every input and every stated figure (`given`) this generator draws, with its realistic
	 * range and the basis for it. Tests hold every drawn problem to these ranges.
	 */
	ranges: Record<string, DrawRange>;
	create(rng: Rng): ProblemDraft;
	mistakes?(problem: Problem): Mistake[];
	/** Decision problems: the right choice, given the calculator's result. */
	decide?(problem: Problem, result: Record<string, unknown>): string;
	/** Decision problems: a hint for a wrong choice. */
	choiceHint?(problem: Problem, result: Record<string, unknown>, chosen: string): string | undefined;
	/** Decision problems: a closing line for the worked steps. */
	decisionStep?(problem: Problem, result: Record<string, unknown>): string;
}
