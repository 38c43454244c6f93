/**
 * The right answer to a drawn test item, worked out from the stored draw as only the server
 * (or a test reading its database) can. Shared by the unit and end-to-end tests.
 */
import { expectedAmount, expectedChoice } from '../../src/lib/practice/index';
import type { DrawnItem, ItemAnswer } from '../../src/lib/practice/test-items';

export function rightAnswer(item: DrawnItem): ItemAnswer {
	if (item.source === 'computed') {
		const p = item.problem;
		if (p.kind === 'choice') return { choice: p.choices!.findIndex((c) => c.value === expectedChoice(p).value) };
		const e = expectedAmount(p);
		return { value: e.value, unit: e.unit };
	}
	const q = item.question;
	const shownAt = (original: number) => (item.shown ? item.shown.indexOf(original) : original);
	switch (q.type) {
		case 'single':
			return { choice: shownAt(q.answer) };
		case 'multiple':
			return { choices: q.answer.map(shownAt) };
		case 'truefalse':
			return { value: q.answer };
		case 'order':
			return { order: q.options.map((_, i) => shownAt(i)) };
		case 'numeric':
			return { value: q.answer.value, unit: q.answer.unit };
	}
}

/** A wrong answer of the right shape. */
export function wrongAnswer(item: DrawnItem): ItemAnswer {
	const right = rightAnswer(item);
	if ('choice' in right) return { choice: right.choice === 0 ? 1 : 0 };
	if ('choices' in right) return { choices: right.choices.length === 1 ? [...right.choices, right.choices[0] === 0 ? 1 : 0] : right.choices.slice(0, 1) };
	if ('order' in right) return { order: [...right.order].reverse() };
	if ('unit' in right) return { value: Number(right.value) * 3, unit: right.unit };
	return { value: !right.value };
}
