import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { clear, hit, refuseIfLimited, reservingCounter, resetAll, sweepEndedWindows, useLimitStore } from '$lib/server/rate-limit';
import { createSharedTestDbs, destroyAll, testEngine } from '../helpers/db';

describe('rate limiter (one upsert on a SQLite table of its own file)', () => {
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
		expect(other.prepare('select count(*) as n from rate_limit_count').get()).toEqual({ n: 1 });
	});

	it('holds no per-key state in process memory: every distinct key is a row in the table, at a flat cost per hit', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		const started = performance.now();
		for (let i = 0; i < 5_000; i++) await hit('calc-api', `10.0.${i >> 8}.${i & 255}`, 5, 60_000);
		const perHitMs = (performance.now() - started) / 5_000;
		expect(store.prepare('select count(*) as n from rate_limit_count').get()).toEqual({ n: 5_000 });
		expect(perHitMs).toBeLessThan(2);
	});

	it('sweeps ended windows, and a hit after the end starts a new window', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		await hit('b', 'k', 1, 1_000);
		expect((await hit('b', 'k', 1, 1_000)).ok).toBe(false);
		expect(await sweepEndedWindows(Date.now())).toBe(0);
		expect(await sweepEndedWindows(Date.now() + 2_000)).toBe(1);
		expect(store.prepare('select count(*) as n from rate_limit_count').get()).toEqual({ n: 0 });
		expect((await hit('b', 'k', 1, 1_000)).ok).toBe(true);
	});

	it('reserving counters (one per process) admit the limit between them and no more, writing once per block', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		const processes = [reservingCounter(), reservingCounter()];
		const verdicts = [];
		for (let i = 0; i < 300; i++) verdicts.push(await processes[i % 2].hit('calc-api', '192.0.2.7', 100, 60_000));
		const admitted = verdicts.filter((v) => v.ok).length;
		// a block is limit / 20 = 5; with two processes at most one block may be stranded
		expect(admitted).toBeLessThanOrEqual(100);
		expect(admitted).toBeGreaterThanOrEqual(95);
		expect(verdicts.slice(admitted).every((v) => !v.ok && v.retryAfterSeconds > 55)).toBe(true);
		const quiet = reservingCounter();
		for (let i = 0; i < 10; i++) await quiet.hit('calc-api', '198.51.100.1', 100, 60_000);
		// ten requests took two blocks of five from the shared count: two writes, not ten
		expect(store.prepare("select points from rate_limit_count where key = 'calc-api:198.51.100.1'").get()).toEqual({ points: 10 });
	});

	it('a reserving counter is given only what the shared count has left, and remembers a refusal', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		for (let i = 0; i < 98; i++) await hit('calc-api', 'k', 100, 60_000);
		const counter = reservingCounter();
		expect((await counter.hit('calc-api', 'k', 100, 60_000)).ok).toBe(true);
		expect((await counter.hit('calc-api', 'k', 100, 60_000)).ok).toBe(true);
		expect((await counter.hit('calc-api', 'k', 100, 60_000)).ok).toBe(false);
		const before = store.prepare("select points from rate_limit_count where key = 'calc-api:k'").get();
		expect((await counter.hit('calc-api', 'k', 100, 60_000)).ok).toBe(false);
		// the remembered refusal costs no write
		expect(store.prepare("select points from rate_limit_count where key = 'calc-api:k'").get()).toEqual(before);
	});

	it('a reserving counter keeps a bounded number of keys, and a dropped key only takes a fresh block', async () => {
		const store = new Database(':memory:');
		useLimitStore(store);
		const counter = reservingCounter(3);
		for (let round = 0; round < 2; round++) for (let k = 0; k < 5; k++) expect((await counter.hit('b', `k${k}`, 40, 60_000)).ok).toBe(true);
		// every key's reservation was dropped before its second hit, so each took two blocks of two
		expect(store.prepare('select sum(points) as n from rate_limit_count').get()).toEqual({ n: 20 });
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

describe(`rate limits in the main database (${testEngine}), as with DATABASE_URL`, () => {
	let dbs: Awaited<ReturnType<typeof createSharedTestDbs>> = [];
	beforeEach(async () => {
		dbs = await createSharedTestDbs(2);
		useLimitStore(dbs[0]);
	});
	afterEach(async () => {
		resetAll();
		await destroyAll(dbs);
	});

	it('allows the limit, refuses with the wait, keeps keys apart and forgets a key on clear', async () => {
		for (let i = 0; i < 3; i++) expect((await hit('b', 'k', 3, 60_000)).ok).toBe(true);
		const refused = await hit('b', 'k', 3, 60_000);
		expect(refused).toEqual({ ok: false, retryAfterSeconds: expect.any(Number) });
		expect(refused.retryAfterSeconds).toBeGreaterThan(55);
		expect(refused.retryAfterSeconds).toBeLessThanOrEqual(60);
		expect((await hit('b', 'other', 3, 60_000)).ok).toBe(true);
		expect((await hit('c', 'k', 3, 60_000)).ok).toBe(true);
		await clear('b', 'k');
		expect((await hit('b', 'k', 3, 60_000)).ok).toBe(true);
	});

	it('starts a new window once the old one ended, and the sweep removes ended windows', async () => {
		await dbs[0].insertInto('rate_limit_count').values({ key: 'b:old', points: 99, expire_ms: Date.now() - 1 }).execute();
		expect((await hit('b', 'old', 2, 60_000)).ok).toBe(true);
		await dbs[0].insertInto('rate_limit_count').values({ key: 'b:gone', points: 1, expire_ms: Date.now() - 1 }).execute();
		expect(await sweepEndedWindows()).toBe(1);
		expect((await dbs[0].selectFrom('rate_limit_count').select(['key', 'points']).execute())).toEqual([{ key: 'b:old', points: 1 }]);
	});

	it('two processes on one database enforce one limit, also when their hits race', async () => {
		// each handle has its own connections, as two app processes would
		const verdicts = await Promise.all(
			Array.from({ length: 20 }, (_, i) => {
				useLimitStore(dbs[i % 2]);
				return hit('sign-in-email', 'a@example.test', 7, 60_000);
			})
		);
		expect(verdicts.filter((v) => v.ok)).toHaveLength(7);
		const row = await dbs[1].selectFrom('rate_limit_count').select('points').where('key', '=', 'sign-in-email:a@example.test').executeTakeFirstOrThrow();
		expect(Number(row.points)).toBe(20);
	});
	it('reserving counters on the main database admit the limit between them, also when they race', async () => {
		const processes = [reservingCounter(), reservingCounter()];
		const verdicts = await Promise.all(
			Array.from({ length: 150 }, (_, i) => {
				useLimitStore(dbs[i % 2]);
				return processes[i % 2].hit('calc-api', '192.0.2.9', 100, 60_000);
			})
		);
		const admitted = verdicts.filter((v) => v.ok).length;
		expect(admitted).toBeLessThanOrEqual(100);
		expect(admitted).toBeGreaterThanOrEqual(90);
	});
});
