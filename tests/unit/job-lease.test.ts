import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '$lib/server/db/engine';
import type { DB } from '$lib/server/db';
import { migrateToLatest } from '$lib/server/db/migrate';
import { leaseHolder, runExclusive } from '$lib/server/job-lease';

/**
 * Several processes share one database file here, the way several app processes would: each
 * "process" is its own connection (and in the last test, its own operating-system process).
 */

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-lease-'));
const file = path.join(dir, 'leases.sqlite');
const connections: DB[] = [];
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

beforeAll(async () => {
	const first = openDatabase(file, 2000);
	await migrateToLatest(first);
	connections.push(first);
	for (let i = 1; i < 8; i++) connections.push(openDatabase(file, 2000));
});
afterEach(async () => {
	await connections[0].deleteFrom('job_lease').execute();
});
afterAll(async () => {
	for (const db of connections) await db.destroy();
	fs.rmSync(dir, { recursive: true, force: true });
});

describe('runExclusive', () => {
	it('lets exactly one of two concurrent callers run; the other learns who holds it', async () => {
		const ran: string[] = [];
		const [a, b] = await Promise.all(
			['a', 'b'].map((name, i) =>
				runExclusive('nightly-sweep', 5_000, async () => {
					ran.push(name);
					await sleep(50);
					return name;
				}, connections[i])
			)
		);
		expect(ran).toHaveLength(1);
		const winner = a.ran ? a : b;
		const loser = a.ran ? b : a;
		expect(winner).toEqual({ ran: true, result: ran[0] });
		expect(loser.ran).toBe(false);
		expect(loser.ran === false && loser.heldBy).toBe(await leaseHolder('nightly-sweep', connections[0]));
		expect(loser.ran === false && loser.heldBy).toMatch(new RegExp(`:${process.pid}:`));
	});

	it('runs a job once per period with eight callers, period after period', async () => {
		const runsPerRound: number[] = [];
		for (let round = 0; round < 4; round++) {
			let runs = 0;
			await Promise.all(
				connections.map((db) =>
					runExclusive('reminders', 150, async () => {
						runs += 1;
						await sleep(20);
					}, db)
				)
			);
			runsPerRound.push(runs);
			await sleep(200);
		}
		expect(runsPerRound).toEqual([1, 1, 1, 1]);
	});

	it('keeps the lease after the work ends, until it runs out', async () => {
		const work = async () => 'done';
		expect((await runExclusive('expiry-sweep', 300, work, connections[0])).ran).toBe(true);
		expect((await runExclusive('expiry-sweep', 300, work, connections[1])).ran).toBe(false);
		expect((await runExclusive('expiry-sweep', 300, work, connections[0])).ran).toBe(false);
		await sleep(350);
		expect((await runExclusive('expiry-sweep', 300, work, connections[1])).ran).toBe(true);
	});

	it('renews the lease while a run lasts longer than the lease, so nobody joins it', async () => {
		const attempts: boolean[] = [];
		// renewed every 200 ms; without renewal it would run out at 600 ms, before the last two attempts
		const long = runExclusive('slow-job', 600, () => sleep(1_500), connections[0]);
		for (let i = 0; i < 4; i++) {
			await sleep(300);
			attempts.push((await runExclusive('slow-job', 600, async () => {}, connections[1])).ran);
		}
		expect((await long).ran).toBe(true);
		expect(attempts).toEqual([false, false, false, false]);
	});

	it('tells a long run that it lost its lease when another holder took it over', async () => {
		let aborted = false;
		const run = runExclusive('contested', 300, async (signal) => {
			// someone rewrites the row (what a takeover after a long database outage looks like)
			await connections[1].updateTable('job_lease').set({ holder: 'elsewhere' }).where('job_name', '=', 'contested').execute();
			await sleep(250);
			aborted = signal.aborted;
		}, connections[0]);
		expect((await run).ran).toBe(true);
		expect(aborted).toBe(true);
	});

	it('refuses to take a lease inside a transaction (it would be invisible to other processes)', async () => {
		await expect(connections[0].transaction().execute((trx) => runExclusive('x', 1000, async () => {}, trx))).rejects.toThrow('outside a transaction');
	});
});

describe('a lease held by another operating-system process', () => {
	let child: ChildProcess | undefined;
	afterEach(() => {
		child?.kill('SIGKILL');
	});

	it('blocks this process while its holder lives, and frees itself after the holder is killed', async () => {
		const leaseMs = 1_500;
		child = spawn(process.execPath, ['--import', 'jiti/register', 'tests/helpers/lease-holder.ts', file, 'cross-process', String(leaseMs)], { stdio: ['ignore', 'pipe', 'inherit'] });
		await new Promise<void>((resolve, reject) => {
			child!.stdout!.on('data', (chunk: Buffer) => chunk.toString().includes('holding') && resolve());
			child!.on('exit', (code) => reject(new Error(`lease holder exited (${code}) before holding`)));
		});
		const work = async () => 'ran here';
		// alive for longer than one lease: it renews, and this process keeps being refused
		for (let i = 0; i < 3; i++) {
			const outcome = await runExclusive('cross-process', leaseMs, work, connections[0]);
			expect(outcome.ran).toBe(false);
			expect(outcome.ran === false && outcome.heldBy).toMatch(new RegExp(`:${child.pid}:`));
			await sleep(700);
		}
		child.kill('SIGKILL');
		await new Promise((r) => child!.once('exit', r));
		const killedAt = Date.now();
		expect((await runExclusive('cross-process', leaseMs, work, connections[0])).ran).toBe(false);
		let outcome = await runExclusive('cross-process', leaseMs, work, connections[0]);
		while (!outcome.ran && Date.now() - killedAt < leaseMs + 1_000) {
			await sleep(100);
			outcome = await runExclusive('cross-process', leaseMs, work, connections[0]);
		}
		expect(outcome).toEqual({ ran: true, result: 'ran here' });
		expect(Date.now() - killedAt).toBeLessThanOrEqual(leaseMs + 1_000);
	}, 30_000);
});
