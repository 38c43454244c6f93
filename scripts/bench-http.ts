/**
 * The HTTP part of `npm run bench`: the built app under load, beside a bare `node:http` +
 * better-sqlite3 server on the same machine, with autocannon (50 connections), and the
 * transfer size of a few pages loaded in Chromium.
 *
 * Builds nothing: it runs the build in BUILD_DIR (default `build`) and stops with a clear
 * message when there is none. The app gets a fresh data folder seeded with the demo
 * scenario, a free port and API limits raised through its configuration, so the figures
 * measure the pipeline and not the 429 answers (the 429 count is reported all the same).
 *
 * BENCH_SECONDS (default 6) sets each target's measured run; BENCH_CPU_PROF=<folder> runs
 * the app under `node --cpu-prof` and leaves the profile there when the bench ends;
 * BENCH_TARGETS=<text> loads only the targets whose name contains it (no page weights then),
 * to profile one path at a time.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import autocannon from 'autocannon';
import { calculators, defaultInputs } from '../src/lib/calc/index.ts';
import { listGenerators } from '../src/lib/practice/index.ts';

const root = path.resolve(import.meta.dirname, '..');
const CONNECTIONS = 50;
const SECONDS = Number(process.env.BENCH_SECONDS || 6);
const WARM_UP_SECONDS = 2;
/** Each target's measured time is split into rounds, each right after a round of the bare server. */
const ROUNDS = Math.max(1, Number(process.env.BENCH_ROUNDS || 3));
const ROUND_SECONDS = Math.max(1, Math.round(SECONDS / ROUNDS));
const TRAINEE = { email: 'sam@brindlewick.test', password: 'patchwright-demo' };
const SIGNED_IN_LESSON = '/courses/point-repair-installer/resin-quantity';

export interface Target {
	name: string;
	path: string;
	method?: 'GET' | 'POST';
	body?: string;
	signedIn?: boolean;
	/** A page: sent with the Accept and Accept-Encoding a browser sends (every browser takes gzip). */
	page?: boolean;
}

const BROWSER_HEADERS = { accept: 'text/html,application/xhtml+xml', 'accept-encoding': 'gzip, deflate, br, zstd' };

export interface LoadResult {
	name: string;
	requestsPerSecond: number;
	p50: number;
	p99: number;
	/** Socket errors and timeouts. */
	errors: number;
	/** Answers other than 2xx, 429s included. */
	non2xx: number;
	tooMany: number;
	/** Server CPU time (user + system) per answered request, in µs; null where /proc cannot tell. */
	cpuMicros: number | null;
}

const CLOCK_TICKS_PER_SECOND = 100; // Linux USER_HZ, the unit of utime and stime in /proc/<pid>/stat (proc(5))

/** CPU seconds a process has used so far (proc(5): fields 14 and 15 of /proc/<pid>/stat), or null. */
function cpuSeconds(pid: number | undefined): number | null {
	if (!pid) return null;
	try {
		const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
		return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS_PER_SECOND;
	} catch {
		return null;
	}
}

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.once('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
		});
	});
}

export async function waitFor(url: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
	const until = Date.now() + timeoutMs;
	while (Date.now() < until) {
		if (child.exitCode !== null) throw new Error(`${url}: the server exited with code ${child.exitCode}`);
		try {
			if ((await fetch(url)).ok) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

export function stop(child: ChildProcess): Promise<void> {
	if (child.exitCode !== null) return Promise.resolve();
	return new Promise((resolve) => {
		const force = setTimeout(() => child.kill('SIGKILL'), 10_000);
		child.once('exit', () => {
			clearTimeout(force);
			resolve();
		});
		child.kill('SIGTERM');
	});
}

async function startBare(): Promise<{ url: string; child: ChildProcess }> {
	const port = await freePort();
	const child = spawn(process.execPath, ['--import', 'jiti/register', path.join(root, 'scripts/bench-bare-server.ts')], {
		cwd: root,
		env: { ...process.env, PORT: String(port) },
		stdio: ['ignore', 'ignore', 'inherit']
	});
	const url = `http://127.0.0.1:${port}`;
	await waitFor(`${url}/items/1`, child);
	return { url, child };
}

export async function startApp(buildDir: string): Promise<{ url: string; child: ChildProcess; dataDir: string }> {
	const port = await freePort();
	const dataDir = mkdtempSync(path.join(tmpdir(), 'patchwright-bench-'));
	const url = `http://127.0.0.1:${port}`;
	const profile = process.env.BENCH_CPU_PROF;
	const args = profile ? ['--cpu-prof', `--cpu-prof-dir=${path.resolve(profile)}`, buildDir] : [buildDir];
	const child = spawn(process.execPath, args, {
		cwd: root,
		env: {
			...process.env,
			NODE_ENV: 'production',
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: url,
			DATA_DIR: dataDir,
			AUTH_SECRET: randomBytes(32).toString('hex'),
			SEED_DEMO: '1',
			FAKES: '0',
			SIGN_IN_LIMIT_PER_IP: '1000000',
			SIGN_IN_LIMIT_PER_EMAIL: '1000000',
			RATE_LIMIT_FACTOR: '1000000',
			CERTIFICATE_LOOKUP_LIMIT_PER_MINUTE: '1000000000'
		},
		stdio: ['ignore', 'ignore', 'inherit']
	});
	await waitFor(`${url}/api/v1/health`, child);
	return { url, child, dataDir };
}

/** Signs in through the sign-in form as a browser would and returns the Cookie header. */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
	const response = await fetch(`${baseUrl}/sign-in?/password`, {
		method: 'POST',
		headers: { origin: baseUrl, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, password }),
		redirect: 'manual'
	});
	const cookies = response.headers.getSetCookie().map((c) => c.split(';')[0]).filter((c) => !c.endsWith('='));
	if (response.status >= 400 || cookies.length === 0) throw new Error(`Signing in as ${email} failed: HTTP ${response.status}`);
	return cookies.join('; ');
}

export function load(url: string, target: Target, cookie: string | null, seconds: number, serverPid?: number): Promise<LoadResult> {
	const headers: Record<string, string> = {};
	const cpuBefore = cpuSeconds(serverPid);
	if (target.body) headers['content-type'] = 'application/json';
	if (target.signedIn && cookie) headers.cookie = cookie;
	if (target.page) Object.assign(headers, BROWSER_HEADERS);
	return new Promise((resolve, reject) => {
		autocannon(
			{ url: url + target.path, method: target.method ?? 'GET', body: target.body, headers, connections: CONNECTIONS, duration: seconds },
			(err, result) => {
				if (err) return reject(err);
				resolve({
					name: target.name,
					requestsPerSecond: result.requests.average,
					p50: result.latency.p50,
					p99: result.latency.p99,
					errors: result.errors + result.timeouts,
					non2xx: result.non2xx,
					tooMany: result.statusCodeStats?.['429']?.count ?? 0,
					cpuMicros: cpuPerRequest(cpuBefore, cpuSeconds(serverPid), result.requests.total)
				});
			}
		);
	});
}

function cpuPerRequest(before: number | null, after: number | null, requests: number): number | null {
	return before === null || after === null || requests === 0 ? null : ((after - before) * 1e6) / requests;
}

/** Page weight runs in its own plain Node process (see scripts/bench-pages.mjs). */
function weighPages(appUrl: string): Promise<void> {
	const child = spawn(process.execPath, [path.join(root, 'scripts/bench-pages.mjs'), appUrl, TRAINEE.email, TRAINEE.password], { cwd: root, stdio: 'inherit' });
	return new Promise((resolve, reject) => {
		child.once('error', reject);
		child.once('exit', (code) => (code === 0 ? resolve() : reject(new Error(`page weights: exit code ${code}`))));
	});
}

export function appTargets(): Target[] {
	const calc = Object.values(calculators).find((c) => c.id === 'resin-quantity') ?? Object.values(calculators)[0];
	const generator = listGenerators()[0].id;
	return [
		{ name: 'GET /api/v1/health', path: '/api/v1/health' },
		{ name: `POST /api/v1/calculations/${calc.id}`, path: `/api/v1/calculations/${calc.id}`, method: 'POST', body: JSON.stringify({ inputs: defaultInputs(calc) }) },
		{ name: `GET /api/v1/practice/${generator}?seed=7`, path: `/api/v1/practice/${generator}?seed=7` },
		{ name: 'GET /courses (catalogue)', path: '/courses', page: true },
		{ name: `GET ${SIGNED_IN_LESSON} (signed in)`, path: SIGNED_IN_LESSON, signedIn: true, page: true },
		{ name: 'GET /api/v1/me (signed in)', path: '/api/v1/me', signedIn: true },
		{ name: 'GET /api/v1/health (signed in)', path: '/api/v1/health', signedIn: true }
	];
}

interface PairedResult {
	app: LoadResult;
	/** The bare server, measured just before this target. */
	bare: LoadResult;
	/** The lowest and highest "vs bare" of the rounds, in %. */
	spread: [number, number];
}

const vsBare = (pair: { app: LoadResult; bare: LoadResult }) => (100 * pair.app.requestsPerSecond) / pair.bare.requestsPerSecond;

/**
 * A target measured in rounds, each right after a round of the bare server, so a change in the
 * machine's speed during the run (other load, a slower period of a shared host) weighs on both
 * sides of each pair; the round with the median ratio is the result, the others give its spread.
 */
async function measurePaired(bareUrl: string, barePid: number | undefined, appUrl: string, target: Target, cookie: string, appPid: number | undefined): Promise<PairedResult> {
	await load(appUrl, target, cookie, WARM_UP_SECONDS);
	const pairs: { app: LoadResult; bare: LoadResult }[] = [];
	for (let round = 0; round < ROUNDS; round++) {
		const bare = await load(bareUrl, BARE_TARGET, null, ROUND_SECONDS, barePid);
		pairs.push({ bare, app: await load(appUrl, target, cookie, ROUND_SECONDS, appPid) });
	}
	pairs.sort((a, b) => vsBare(a) - vsBare(b));
	const median = pairs[Math.floor(pairs.length / 2)];
	return { ...median, spread: [vsBare(pairs[0]), vsBare(pairs[pairs.length - 1])] };
}

const BARE_TARGET: Target = { name: 'bare', path: '/items/4242' };

const micros = (n: number | null) => (n === null ? '-' : Math.round(n).toLocaleString('en-US'));
const cpuRatio = (bare: number | null, app: number | null) => (bare === null || !app ? '-' : `${((100 * bare) / app).toFixed(1)} %`);

function printLoad(rows: PairedResult[]) {
	const width = Math.max(...rows.map((r) => r.app.name.length), 6);
	const num = (n: number) => Math.round(n).toLocaleString('en-US');
	console.log(`\nHTTP: ${CONNECTIONS} connections, ${ROUNDS} rounds of ${ROUND_SECONDS} s per target after ${WARM_UP_SECONDS} s warm-up (autocannon)`);
	console.log('Each round of a target is measured right after a round of the bare node:http + better-sqlite3 point lookup');
	console.log('(100,000 rows) on the same machine, and "vs bare" is the ratio of the two: other load on the machine weighs');
	console.log('on both. The round with the median ratio is shown; "spread" is the lowest and highest ratio of the rounds.');
	console.log('"CPU µs" is the server\'s CPU time per answer (from /proc); "by CPU" is bare CPU per answer over the app\'s,');
	console.log('the share of the bare server\'s rate the app would reach on an idle core, which other load disturbs far less.');
	console.log('Pages are asked for as a browser asks (Accept-Encoding: gzip, deflate, br, zstd).');
	console.log(
		`${'target'.padEnd(width)}  ${'req/s'.padStart(8)}  ${'p50 ms'.padStart(7)}  ${'p99 ms'.padStart(7)}  ${'errors'.padStart(6)}  ${'non-2xx'.padStart(7)}  ${'429'.padStart(5)}  ${'bare req/s'.padStart(10)}  ${'bare p99'.padStart(8)}  ${'vs bare'.padStart(7)}  ${'spread'.padStart(13)}  ${'CPU µs'.padStart(7)}  ${'bare CPU'.padStart(8)}  ${'by CPU'.padStart(7)}`
	);
	for (const { app: r, bare, spread } of rows) {
		const ratio = `${((100 * r.requestsPerSecond) / bare.requestsPerSecond).toFixed(1)} %`;
		const range = `${spread[0].toFixed(0)}–${spread[1].toFixed(0)} %`;
		console.log(
			`${r.name.padEnd(width)}  ${num(r.requestsPerSecond).padStart(8)}  ${r.p50.toFixed(1).padStart(7)}  ${r.p99.toFixed(1).padStart(7)}  ${String(r.errors).padStart(6)}  ${String(r.non2xx).padStart(7)}  ${String(r.tooMany).padStart(5)}  ${num(bare.requestsPerSecond).padStart(10)}  ${bare.p99.toFixed(1).padStart(8)}  ${ratio.padStart(7)}  ${range.padStart(13)}  ${micros(r.cpuMicros).padStart(7)}  ${micros(bare.cpuMicros).padStart(8)}  ${cpuRatio(bare.cpuMicros, r.cpuMicros).padStart(7)}`
		);
	}
}

export async function runHttpBench(): Promise<void> {
	const buildDir = path.join(root, process.env.BUILD_DIR || 'build');
	if (!existsSync(path.join(buildDir, 'index.js'))) {
		console.error(`\nHTTP benchmark: no build in ${buildDir}. Run \`npm run build\` first (the bench builds nothing itself).`);
		process.exitCode = 1;
		return;
	}
	const bare = await startBare();
	let app: Awaited<ReturnType<typeof startApp>> | null = null;
	try {
		await load(bare.url, BARE_TARGET, null, WARM_UP_SECONDS);
		app = await startApp(buildDir);
		const cookie = await signIn(app.url, TRAINEE.email, TRAINEE.password);
		const only = process.env.BENCH_TARGETS;
		const rows: PairedResult[] = [];
		for (const target of appTargets()) {
			if (only && !target.name.includes(only)) continue;
			rows.push(await measurePaired(bare.url, bare.child.pid, app.url, target, cookie, app.child.pid));
		}
		printLoad(rows);
		if (!only) await weighPages(app.url);
	} finally {
		await stop(bare.child);
		if (app) {
			await stop(app.child);
			rmSync(app.dataDir, { recursive: true, force: true });
		}
	}
}
