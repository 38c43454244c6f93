/**
 * Page weight from a real browser load, for `npm run bench`: each page opened in Debian's
 * Chromium with the cache off, every response counted by what crossed the wire (headers and
 * compressed bodies), grouped by kind.
 *
 * Plain JavaScript run as its own process (`node scripts/bench-pages.mjs <app url> <e-mail>
 * <password>`): Playwright does not load under the TypeScript loader the bench runs with.
 */
import { chromium } from '@playwright/test';

/** @typedef {{ name: string, requests: number, js: number, css: number, fonts: number, total: number }} PageWeight */
/** @typedef {{ name: string, path: string, signedIn?: boolean, readToEnd?: boolean }} PageCase */

/** @type {PageCase[]} */
const PAGES = [
	{ name: 'home', path: '/' },
	{ name: 'catalogue', path: '/courses' },
	{ name: 'course', path: '/courses/point-repair-installer' },
	{ name: 'preview lesson, math', path: '/courses/point-repair-installer/the-job-and-defects' },
	{ name: 'lesson with math + calculator (signed in)', path: '/courses/point-repair-installer/resin-quantity', signedIn: true },
	// Lesson islands load as they come near the screen: the same lesson scrolled to its end counts them all.
	{ name: 'the same lesson, read to the end', path: '/courses/point-repair-installer/resin-quantity', signedIn: true, readToEnd: true },
	{ name: 'lesson without math (signed in)', path: '/courses/point-repair-installer/safety-first', signedIn: true },
	{ name: 'calculator list', path: '/tools' },
	{ name: 'calculator tool', path: '/tools/resin-quantity' },
	{ name: 'dashboard (signed in)', path: '/dashboard', signedIn: true }
];

/** Budget for each page's JavaScript on the wire (compressed). */
const JS_BUDGET_BYTES = 60 * 1024;

/** @param {string} resourceType @param {string} url */
function kindOf(resourceType, url) {
	if (resourceType === 'script' || /\.m?js(\?|$)/.test(url)) return 'js';
	if (resourceType === 'stylesheet' || /\.css(\?|$)/.test(url)) return 'css';
	if (resourceType === 'font' || /\.(woff2?|ttf|otf)(\?|$)/.test(url)) return 'fonts';
	return 'other';
}

/**
 * @param {import('@playwright/test').Page} page @param {string} baseUrl @param {PageCase} c
 * @returns {Promise<PageWeight>}
 */
async function weigh(page, baseUrl, c) {
	/** @type {Promise<{ kind: string, bytes: number }>[]} */
	const seen = [];
	/** @param {import('@playwright/test').Request} request */
	const onFinished = (request) => {
		seen.push(
			request.sizes().then((s) => ({ kind: kindOf(request.resourceType(), request.url()), bytes: s.responseBodySize + s.responseHeadersSize }))
		);
	};
	page.on('requestfinished', onFinished);
	const response = await page.goto(baseUrl + c.path, { waitUntil: 'networkidle' });
	if (!response?.ok()) throw new Error(`${c.path}: HTTP ${response?.status()}`);
	if (c.readToEnd) await readToEnd(page);
	page.off('requestfinished', onFinished);
	const weight = { name: `${c.name} ${c.path}`, requests: seen.length, js: 0, css: 0, fonts: 0, total: 0 };
	for (const { kind, bytes } of await Promise.all(seen)) {
		if (kind === 'js' || kind === 'css' || kind === 'fonts') weight[kind] += bytes;
		weight.total += bytes;
	}
	return weight;
}

/**
 * Scrolls a page down a screen at a time, as a reader would, until its calculators are live
 * and nothing more loads.
 * @param {import('@playwright/test').Page} page
 */
async function readToEnd(page) {
	for (let y = 0; y < (await page.evaluate(() => document.body.scrollHeight)); y += 600) {
		await page.evaluate((top) => window.scrollTo(0, top), y);
		await page.waitForTimeout(50);
	}
	await page.waitForFunction(() => [...document.querySelectorAll('[data-calculator]')].every((c) => c.getAttribute('data-live') === 'true'));
	await page.waitForLoadState('networkidle');
	await page.waitForTimeout(500);
}

/** @param {string} baseUrl @param {{ email: string, password: string }} person */
async function measurePageWeights(baseUrl, person) {
	const browser = await chromium.launch({
		executablePath: '/usr/bin/chromium',
		args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
	});
	try {
		const weights = [];
		const signingIn = await browser.newContext();
		const signInAnswer = await signingIn.request.post(`${baseUrl}/sign-in?/password`, {
			form: person,
			headers: { origin: baseUrl, accept: 'text/html' },
			maxRedirects: 0
		});
		if (signInAnswer.status() >= 400) throw new Error(`page weights: signing in failed (HTTP ${signInAnswer.status()})`);
		const signedIn = await signingIn.storageState();
		await signingIn.close();
		for (const c of PAGES) {
			// A fresh context per page: each page is weighed as a first visit, with nothing cached.
			const context = await browser.newContext(c.signedIn ? { storageState: signedIn } : {});
			weights.push(await weigh(await context.newPage(), baseUrl, c));
			await context.close();
		}
		return weights;
	} finally {
		await browser.close();
	}
}

/** @param {number} bytes */
const kb = (bytes) => `${(bytes / 1024).toFixed(1)} KB`;

/** @param {PageWeight[]} weights */
function printPageWeights(weights) {
	const width = Math.max(...weights.map((w) => w.name.length));
	console.log(`\nPage weight, first visit in Chromium (bytes on the wire; JavaScript budget ${kb(JS_BUDGET_BYTES)} per page)`);
	console.log(`${'page'.padEnd(width)}  ${'requests'.padStart(8)}  ${'JS'.padStart(9)}  ${'CSS'.padStart(9)}  ${'fonts'.padStart(9)}  ${'total'.padStart(9)}`);
	for (const w of weights) {
		const over = w.js > JS_BUDGET_BYTES ? '  JS over budget' : '';
		console.log(`${w.name.padEnd(width)}  ${String(w.requests).padStart(8)}  ${kb(w.js).padStart(9)}  ${kb(w.css).padStart(9)}  ${kb(w.fonts).padStart(9)}  ${kb(w.total).padStart(9)}${over}`);
	}
}

const [baseUrl, email, password] = process.argv.slice(2);
if (!baseUrl || !email || !password) {
	console.error('usage: node scripts/bench-pages.mjs <app url> <e-mail> <password>');
	process.exit(2);
}
printPageWeights(await measurePageWeights(baseUrl, { email, password }));
