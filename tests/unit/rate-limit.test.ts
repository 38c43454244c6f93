import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { beforeEach, describe, expect, it } from 'vitest';
import { clear, hit, refuseIfLimited, resetAll, useLimitStore } from '$lib/server/rate-limit';

describe('rate limiter (rate-limiter-flexible on a SQLite table)', () => {
	beforeEach(() => {
		useLimitStore(new Database(':memory:'));
		resetAll();
	});

	it('allows the limit, then refuses with a wait no longer than the window', async () => {
		for (let i = 0; i < 3; i++) expect((await hit('b', 'k', 3, 60_000)).ok).toBe(true);
		const refused = await hit('b', 'k', 3, 60_000);
		expect(refused.ok).toBe(false);
		expect(refused.retryAfterSeconds).toBeGreaterThan(55);
		expect(refused.retryAfterSeconds).toBeLessThanOrEqual(60);
	});

	it('keeps buckets and keys apart, and forgets a key on clear', async () => {
		for (let i = 0; i < 2; i++) await hit('b', 'k', 2, 60_000);
		expect((await hit('b', 'k', 2, 60_000)).ok).toBe(false);
		expect((await hit('b', 'other', 2, 60_000)).ok).toBe(true);
		expect((await hit('c', 'k', 2, 60_000)).ok).toBe(true);
		await clear('b', 'k');
		expect((await hit('b', 'k', 2, 60_000)).ok).toBe(true);
	});

	it('keeps its counts in the database, so they survive a restart and are shared by processes', async () => {
		const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'pw-limits-')), 'limits.sqlite');
		useLimitStore(new Database(file));
		for (let i = 0; i < 2; i++) await hit('sign-in-email', 'a@example.test', 2, 60_000);
		// A second connection to the same file stands for a restarted or a second process.
		const other = new Database(file);
		useLimitStore(other);
		expect((await hit('sign-in-email', 'a@example.test', 2, 60_000)).ok).toBe(false);
		expect(other.prepare('select count(*) as n from rate_limit').get()).toEqual({ n: 1 });
	});

	it('holds no per-key state in process memory: every distinct key is a row in the table, at a flat cost per hit', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		const started = performance.now();
		for (let i = 0; i < 5_000; i++) await hit('calc-api', `10.0.${i >> 8}.${i & 255}`, 5, 60_000);
		const perHitMs = (performance.now() - started) / 5_000;
		expect(store.prepare('select count(*) as n from rate_limit').get()).toEqual({ n: 5_000 });
		expect(perHitMs).toBeLessThan(2);
	});

	it('answers an API refusal as 429 with Retry-After and the API error shape', async () => {
		const event = { getClientAddress: () => '192.0.2.1' };
		const limit = { bucket: 'calc-api', limit: 1, windowMs: 60_000 };
		expect(await refuseIfLimited(event, limit)).toBeNull();
		const refused = (await refuseIfLimited(event, limit))!;
		expect(refused.status).toBe(429);
		expect(Number(refused.headers.get('retry-after'))).toBeGreaterThan(0);
		expect(await refused.json()).toEqual({ error: { code: 'rate_limited', message: expect.stringContaining('Try again') } });
	});
});
