// Runs every test: installs the browser (Debian's chromium), type-checks, builds the app,
// runs the unit tests (vitest) and the end-to-end tests (Playwright against the built app
// and the local fakes), then prints one closing line "N passed, N failed".
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';

const artifacts = 'tests/.artifacts';
fs.mkdirSync(artifacts, { recursive: true });

function run(label, command, args) {
	console.log(`\n=== ${label}: ${command} ${args.join(' ')}`);
	const result = spawnSync(command, args, { stdio: 'inherit', env: process.env });
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

if (!run('test dependencies', 'node', ['scripts/install-test-deps.mjs'])) process.exit(1);

const checked = run('type check', 'npx', ['svelte-check', '--tsconfig', './tsconfig.json', '--threshold', 'error', '--output', 'human']);
checked ? passed++ : failed++;

fs.rmSync(`${artifacts}/vitest.json`, { force: true });
run('unit tests', 'npx', ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile=${artifacts}/vitest.json`]);
const unit = readJson(`${artifacts}/vitest.json`);
if (unit) {
	passed += unit.numPassedTests;
	failed += unit.numFailedTests + (unit.numFailedTestSuites > 0 && unit.numFailedTests === 0 ? 1 : 0);
} else failed++;

if (run('build', 'npx', ['vite', 'build', '--logLevel', 'warn'])) {
	fs.rmSync(`${artifacts}/playwright.json`, { force: true });
	run('end-to-end tests', 'npx', ['playwright', 'test']);
	const e2e = readJson(`${artifacts}/playwright.json`);
	if (e2e) {
		passed += e2e.stats.expected + e2e.stats.flaky;
		failed += e2e.stats.unexpected;
		if (e2e.errors?.length) failed++;
	} else failed++;
} else failed++;

console.log(`\nType check counts as one test; unit tests from vitest; end-to-end tests from Playwright.`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 ? 0 : 1);
