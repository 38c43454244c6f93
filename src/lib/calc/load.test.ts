import { describe, expect, it } from 'vitest';
import { calculators } from './index';
import { loadableIds, loadCalculator } from './load';

describe('loading one calculator on demand', () => {
	it('knows exactly the ids of the registry', () => {
		expect([...loadableIds].sort()).toEqual(Object.keys(calculators).sort());
	});

	for (const id of Object.keys(calculators)) {
		it(`${id} loads the registry's own definition`, async () => {
			expect(await loadCalculator(id)).toBe(calculators[id]);
		});
	}

	it('answers undefined for an unknown id, including prototype keys', async () => {
		for (const id of ['no-such-calculator', '__proto__', 'constructor', 'toString']) {
			expect(await loadCalculator(id)).toBeUndefined();
		}
	});
});
