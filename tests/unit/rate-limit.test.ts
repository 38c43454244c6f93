import { beforeEach, describe, expect, it } from 'vitest';
import { clear, hit, resetAll } from '$lib/server/rate-limit';

describe('rate limiter', () => {
	beforeEach(() => resetAll());

	it('allows the limit, refuses the next attempt with a wait, and opens again after the window', () => {
		const t0 = 1_000_000;
		for (let i = 0; i < 3; i++) expect(hit('b', 'k', 3, 60_000, t0 + i).ok).toBe(true);
		const refused = hit('b', 'k', 3, 60_000, t0 + 10_000);
		expect(refused).toEqual({ ok: false, retryAfterSeconds: 50 });
		expect(hit('b', 'k', 3, 60_000, t0 + 60_000).ok).toBe(true);
	});

	it('keeps buckets and keys apart, and forgets a key on clear', () => {
		for (let i = 0; i < 2; i++) hit('b', 'k', 2, 60_000);
		expect(hit('b', 'k', 2, 60_000).ok).toBe(false);
		expect(hit('b', 'other', 2, 60_000).ok).toBe(true);
		expect(hit('c', 'k', 2, 60_000).ok).toBe(true);
		clear('b', 'k');
		expect(hit('b', 'k', 2, 60_000).ok).toBe(true);
	});
});
