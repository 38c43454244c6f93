/**
 * Seeded pseudo-random numbers for problems and test draws: the same seed always gives the
 * same problem. mulberry32 (Tommy Ettinger, public domain), a 32-bit generator that is small,
 * fast and plenty for picking realistic job figures. Not for secrets: test seeds come from
 * the server's crypto source and are never sent to the browser.
 */

/** Seeds are unsigned 32-bit integers. */
export const MAX_SEED = 0xffffffff;

export function isSeed(value: unknown): value is number {
	return typeof value === 'number' && Number.isInteger(value) && value >= 0 && value <= MAX_SEED;
}

/**
 * MurmurHash3's 32-bit finaliser (Austin Appleby, public domain): scrambles a seed so that
 * neighbouring seeds (1, 2, 3 ...) start unrelated streams.
 */
export function mix32(seed: number): number {
	let h = seed >>> 0;
	h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
	h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
	return (h ^ (h >>> 16)) >>> 0;
}

/** A function returning floats in [0, 1), deterministic for `seed`. */
export function mulberry32(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** Helpers over one seeded stream. */
export class Rng {
	private readonly next: () => number;

	constructor(seed: number) {
		this.next = mulberry32(mix32(seed));
	}

	float(): number {
		return this.next();
	}

	/** An integer in [min, max], both included. */
	int(min: number, max: number): number {
		return min + Math.floor(this.next() * (max - min + 1));
	}

	/** A multiple of `step` in [min, max], without binary noise (0.30000000000000004). */
	step(min: number, max: number, step: number): number {
		const count = Math.round((max - min) / step);
		return Number((min + this.int(0, count) * step).toFixed(6));
	}

	pick<T>(items: readonly T[]): T {
		if (items.length === 0) throw new Error('pick from an empty list');
		return items[Math.floor(this.next() * items.length)];
	}

	/** True with probability `p`. */
	chance(p: number): boolean {
		return this.next() < p;
	}

	/** A fresh unsigned 32-bit seed drawn from this stream. */
	seed(): number {
		return Math.floor(this.next() * 4294967296) >>> 0;
	}

	/** A shuffled copy (Fisher-Yates). */
	shuffle<T>(items: readonly T[]): T[] {
		const out = [...items];
		for (let i = out.length - 1; i > 0; i--) {
			const j = Math.floor(this.next() * (i + 1));
			[out[i], out[j]] = [out[j], out[i]];
		}
		return out;
	}
}

/** A random seed from the platform's crypto source (browser and Node). */
export function randomSeed(): number {
	const buffer = new Uint32Array(1);
	globalThis.crypto.getRandomValues(buffer);
	return buffer[0];
}
