import { describe, expect, it } from 'vitest';
import { isSeed, MAX_SEED, mulberry32, randomSeed, Rng } from './random';

describe('seeded random numbers (mulberry32)', () => {
	it('gives the same stream for the same seed and another for another seed', () => {
		const a = mulberry32(42);
		const b = mulberry32(42);
		const c = mulberry32(43);
		const first = Array.from({ length: 5 }, () => a());
		expect(Array.from({ length: 5 }, () => b())).toEqual(first);
		expect(Array.from({ length: 5 }, () => c())).not.toEqual(first);
	});

	it('stays in [0, 1) and spreads evenly over 100,000 draws (mean within 0.01 of 0.5)', () => {
		const next = mulberry32(7);
		let sum = 0;
		const buckets = new Array(10).fill(0);
		let outside = 0;
		for (let i = 0; i < 100_000; i++) {
			const x = next();
			if (!(x >= 0 && x < 1)) outside++;
			sum += x;
			buckets[Math.floor(x * 10)]++;
		}
		expect(outside).toBe(0);
		expect(Math.abs(sum / 100_000 - 0.5)).toBeLessThan(0.01);
		for (const count of buckets) expect(Math.abs(count - 10_000)).toBeLessThan(600);
	});

	it('int, step, pick and shuffle stay within what they were given', () => {
		const rng = new Rng(1);
		for (let i = 0; i < 1000; i++) {
			const n = rng.int(3, 5);
			expect([3, 4, 5]).toContain(n);
			const s = rng.step(1.1, 2, 0.1);
			expect(s).toBeGreaterThanOrEqual(1.1);
			expect(s).toBeLessThanOrEqual(2);
			expect(Number.isInteger(Math.round(s * 10)) && Math.abs(s * 10 - Math.round(s * 10)) < 1e-9).toBe(true);
		}
		const shuffled = rng.shuffle([1, 2, 3, 4, 5, 6]);
		expect([...shuffled].sort()).toEqual([1, 2, 3, 4, 5, 6]);
		expect(() => rng.pick([])).toThrow();
	});

	it('accepts unsigned 32-bit integers as seeds and nothing else', () => {
		expect(isSeed(0)).toBe(true);
		expect(isSeed(MAX_SEED)).toBe(true);
		expect(isSeed(MAX_SEED + 1)).toBe(false);
		expect(isSeed(-1)).toBe(false);
		expect(isSeed(1.5)).toBe(false);
		expect(isSeed('1')).toBe(false);
		expect(isSeed(randomSeed())).toBe(true);
	});
});
