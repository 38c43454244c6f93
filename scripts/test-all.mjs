// Runs every test: installs the test dependencies (Debian's chromium, poppler-utils and
// postgresql), type-checks, runs the unit tests (vitest) once per database engine (SQLite,
// PGlite, and a real PostgreSQL server started here when one is installed), builds the app,
// runs the end-to-end tests (Playwright against the built app and the local fakes) and the
// two-process test (two built servers on one PostgreSQL database), then prints one closing line
// "N passed, N failed".
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import * as postgres from './postgres-server.mjs';

const artifacts = 'tests/.artifacts';
fs.mkdirSync(artifacts, { recursive: true });

function run(label, command, args, env = {}) {
	console.log(`\n=== ${label}: ${command} ${args.join(' ')}`);
	const result = spawnSync(command, args, { stdio: 'inherit', env: { ...process.env, ...env } });
	return result.status === 0;
}

function readJson(file) {
	try {
		return JSON.parse(fs.readFileSync(file, 'utf8'));
	} catch {
		return null;
	}
}

let passed = 0;
let failed = 0;
const lines = [];

/** Runs vitest with `env`, adds its counts, and keeps one summary line for the end. */
function vitest(label, env) {
	const out = `${artifacts}/vitest-${label.replace(/\W+/g, '-')}.json`;
	fs.rmSync(out, { force: true });
	run(label, 'npx', ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile=${out}`], env);
	const result = readJson(out);
	if (!result) {
		failed++;
		lines.push(`${label}: did not report (counted as 1 failed)`);
		return;
	}
	const suiteFailed = result.numFailedTestSuites > 0 && result.numFailedTests === 0 ? 1 : 0;
	passed += result.numPassedTests;
	failed += result.numFailedTests + suiteFailed;
	lines.push(`${label}: ${result.numPassedTests} passed, ${result.numFailedTests + suiteFailed} failed`);
}

if (!run('test dependencies', 'node', ['scripts/install-test-deps.mjs'])) process.exit(1);

const checked = run('type check', 'npx', ['svelte-check', '--tsconfig', './tsconfig.json', '--threshold', 'error', '--output', 'human']);
checked ? passed++ : failed++;
lines.push(`type check: ${checked ? '1 passed, 0 failed' : '0 passed, 1 failed'}`);

vitest('unit tests on SQLite', { TEST_DB: 'sqlite' });
vitest('unit tests on PGlite', { TEST_DB: 'pglite' });

// A real PostgreSQL server: started here when Debian's package is installed (install-test-deps
// installs it when run as root). In CI it must be there; elsewhere its absence is said plainly.
let serverUrl = null;
try {
	serverUrl = postgres.start();
} catch (e) {
	console.error(`The PostgreSQL test server did not start: ${e.message}`);
}
if (serverUrl) {
	vitest('unit tests on PostgreSQL', { TEST_DB: 'postgres', PG_TEST_URL: serverUrl });
} else {
	const message = 'unit tests on PostgreSQL: NOT RUN, no PostgreSQL server could be started';
	lines.push(message);
	if (process.env.CI) failed++;
}

if (run('build', 'npx', ['vite', 'build', '--logLevel', 'warn'])) {
	fs.rmSync(`${artifacts}/playwright.json`, { force: true });
	run('end-to-end tests', 'npx', ['playwright', 'test']);
	const e2e = readJson(`${artifacts}/playwright.json`);
	if (e2e) {
		passed += e2e.stats.expected + e2e.stats.flaky;
		failed += e2e.stats.unexpected;
		if (e2e.errors?.length) failed++;
		lines.push(`end-to-end tests (SQLite): ${e2e.stats.expected + e2e.stats.flaky} passed, ${e2e.stats.unexpected + (e2e.errors?.length ? 1 : 0)} failed`);
	} else {
		failed++;
		lines.push('end-to-end tests: did not report (counted as 1 failed)');
	}
	if (serverUrl) vitest('two processes on PostgreSQL', { SCALE_TESTS: '1', PG_TEST_URL: serverUrl });
	else {
		lines.push('two processes on PostgreSQL: NOT RUN, no PostgreSQL server could be started');
		if (process.env.CI) failed++;
	}
} else {
	failed++;
	lines.push('build: failed');
}

if (serverUrl) postgres.stop();

console.log('\nType check counts as one test; unit tests from vitest, once per engine; end-to-end tests from Playwright.');
for (const line of lines) console.log(`  ${line}`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 ? 0 : 1);
