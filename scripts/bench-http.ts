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
 * the app under `node --cpu-prof` and leaves the profile there when the bench ends.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
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
const TRAINEE = { email: 'sam@brindlewick.test', password: 'patchwright-demo' };
const SIGNED_IN_LESSON = '/courses/point-repair-installer/resin-quantity';

export interface Target {
	name: string;
	path: string;
	method?: 'GET' | 'POST';
	body?: string;
	signedIn?: boolean;
}

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
}

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.once('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
		});
	});
}

async function waitFor(url: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
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

function stop(child: ChildProcess): Promise<void> {
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

async function startApp(buildDir: string): Promise<{ url: string; child: ChildProcess; dataDir: string }> {
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
			RATE_LIMIT_FACTOR: '1000000'
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

function load(url: string, target: Target, cookie: string | null, seconds: number): Promise<LoadResult> {
	const headers: Record<string, string> = {};
	if (target.body) headers['content-type'] = 'application/json';
	if (target.signedIn && cookie) headers.cookie = cookie;
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
					tooMany: result.statusCodeStats?.['429']?.count ?? 0
				});
			}
		);
	});
}

async function measure(url: string, target: Target, cookie: string | null): Promise<LoadResult> {
	await load(url, target, cookie, WARM_UP_SECONDS);
	return load(url, target, cookie, SECONDS);
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
		{ name: 'GET /courses (catalogue)', path: '/courses' },
		{ name: `GET ${SIGNED_IN_LESSON} (signed in)`, path: SIGNED_IN_LESSON, signedIn: true },
		{ name: 'GET /api/v1/me (signed in)', path: '/api/v1/me', signedIn: true },
		{ name: 'GET /api/v1/health (signed in)', path: '/api/v1/health', signedIn: true }
	];
}

function meanOf(a: LoadResult, b: LoadResult): LoadResult {
	const mean = (x: number, y: number) => (x + y) / 2;
	return {
		name: a.name,
		requestsPerSecond: mean(a.requestsPerSecond, b.requestsPerSecond),
		p50: mean(a.p50, b.p50),
		p99: mean(a.p99, b.p99),
		errors: a.errors + b.errors,
		non2xx: a.non2xx + b.non2xx,
		tooMany: a.tooMany + b.tooMany
	};
}

function printLoad(bare: LoadResult, rows: LoadResult[]) {
	const width = Math.max(...[bare, ...rows].map((r) => r.name.length));
	const line = (r: LoadResult, ratio: string) =>
		`${r.name.padEnd(width)}  ${Math.round(r.requestsPerSecond).toLocaleString('en-US').padStart(8)}  ${r.p50.toFixed(1).padStart(7)}  ${r.p99.toFixed(1).padStart(7)}  ${String(r.errors).padStart(6)}  ${String(r.non2xx).padStart(7)}  ${String(r.tooMany).padStart(5)}  ${ratio.padStart(7)}`;
	console.log(`\nHTTP: ${CONNECTIONS} connections, ${SECONDS} s per target after ${WARM_UP_SECONDS} s warm-up (autocannon)`);
	console.log(`${'target'.padEnd(width)}  ${'req/s'.padStart(8)}  ${'p50 ms'.padStart(7)}  ${'p99 ms'.padStart(7)}  ${'errors'.padStart(6)}  ${'non-2xx'.padStart(7)}  ${'429'.padStart(5)}  ${'vs bare'.padStart(7)}`);
	console.log(line(bare, '100 %'));
	for (const r of rows) console.log(line(r, `${((100 * r.requestsPerSecond) / bare.requestsPerSecond).toFixed(1)} %`));
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
		// The bare server is measured before and after the app and the mean is the yardstick,
		// so that load from other work on the machine during the run weighs on both sides.
		const bareTarget: Target = { name: 'bare node:http + better-sqlite3 lookup', path: '/items/4242' };
		const bareBefore = await measure(bare.url, bareTarget, null);
		app = await startApp(buildDir);
		const cookie = await signIn(app.url, TRAINEE.email, TRAINEE.password);
		const rows: LoadResult[] = [];
		for (const target of appTargets()) rows.push(await measure(app.url, target, cookie));
		const bareAfter = await measure(bare.url, bareTarget, null);
		printLoad(meanOf(bareBefore, bareAfter), rows);
		console.log(`(bare server before the app: ${Math.round(bareBefore.requestsPerSecond)} req/s, after: ${Math.round(bareAfter.requestsPerSecond)} req/s)`);
		await weighPages(app.url);
	} finally {
		await stop(bare.child);
		if (app) {
			await stop(app.child);
			rmSync(app.dataDir, { recursive: true, force: true });
		}
	}
}
