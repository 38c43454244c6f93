/**
 * Certificates in `npm run bench`:
 *  - PDF generation (pdf-lib + fontkit, Lora subset, QR, embedded credential): median and p90
 *    time and file size per format, against the targets (under 30 ms median, under 60 KB);
 *  - GET /api/v1/certificates/{number} on the built app at 50 connections over a database
 *    holding 100,000 certificates, beside a bare node:http + better-sqlite3 server running the
 *    same query on the same file in the same run (target: at least 40 % of its requests per
 *    second, p99 under 20 ms). Numbers rotate over the whole table.
 */
import { spawn } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import path from 'node:path';
import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import { formatNumber, generateNumber } from '../src/lib/certificates/number.ts';
import { renderCertificatePdf, documentFormats } from '../src/lib/server/pdf/certificate.ts';
import { freePort, startApp, stop, waitFor, type LoadResult } from './bench-http.ts';

const root = path.resolve(import.meta.dirname, '..');
const CERTIFICATES = 100_000;
const CONNECTIONS = 50;
const SECONDS = Number(process.env.BENCH_SECONDS || 6);

const sample = {
	number: '7K2M-9QXD-4T0B-HWRC',
	holderName: 'Zoë Ashdown-Łęcka',
	courseCode: 'TP-200',
	courseTitle: 'Transition patches',
	scope: 'Point repairs across one concentric or eccentric change of diameter within DN100-DN300, by a certified point-repair installer.',
	diameterMinMm: 100,
	diameterMaxMm: 300,
	testOn: '2026-11-02',
	practicalOn: '2026-11-20',
	issuedOn: '2026-11-20',
	expiresOn: '2029-11-20',
	trainers: ['Mira Calloway'],
	issuerName: 'Fenmoor Training Yard',
	verifyUrl: 'https://patchwright.example.test/verify/7K2M-9QXD-4T0B-HWRC',
	checkUrl: 'patchwright.example.test/verify',
	// a credential JWT is about 1.9 KB
	credentialJwt: `eyJhbGciOiJFZERTQSJ9.${'x'.repeat(1800)}.${'y'.repeat(86)}`,
	issuedAt: '2026-11-20T10:00:00Z'
};

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];

export async function pdfBench(runs = 40): Promise<void> {
	console.log(`\nCertificate PDFs: ${runs} runs per format after a warm-up (target: median under 30 ms, under 60 KB)`);
	console.log(`${'format'.padEnd(8)}  ${'median ms'.padStart(9)}  ${'p90 ms'.padStart(7)}  ${'CPU ms'.padStart(7)}  ${'size KB'.padStart(8)}  target`);
	for (const format of documentFormats) {
		for (let i = 0; i < 5; i++) await renderCertificatePdf({ ...sample, holderName: `Warm Up ${i}` }, format);
		const wall: number[] = [];
		const cpu: number[] = [];
		let size = 0;
		for (let i = 0; i < runs; i++) {
			const started = performance.now();
			const used = process.cpuUsage();
			const bytes = await renderCertificatePdf({ ...sample, holderName: `${sample.holderName} ${i}` }, format);
			const spent = process.cpuUsage(used);
			wall.push(performance.now() - started);
			cpu.push((spent.user + spent.system) / 1000);
			size = Math.max(size, bytes.length);
		}
		wall.sort((a, b) => a - b);
		cpu.sort((a, b) => a - b);
		const median = quantile(wall, 0.5);
		const ok = median < 30 && size < 60 * 1024;
		console.log(`${format.padEnd(8)}  ${median.toFixed(1).padStart(9)}  ${quantile(wall, 0.9).toFixed(1).padStart(7)}  ${quantile(cpu, 0.5).toFixed(1).padStart(7)}  ${(size / 1024).toFixed(1).padStart(8)}  ${ok ? 'met' : 'MISSED'}`);
	}
}

/** Writes `count` certificates straight into the app's database (the app has migrated it). */
function fillCertificates(file: string, count: number): string[] {
	const db = new Database(file);
	db.pragma('busy_timeout = 10000');
	const user = db.prepare('select id from "User" limit 1').get() as { id: string };
	const insert = db.prepare(
		`insert into certificate (id, number, slot, user_id, course_slug, holder_name, course_code, course_title, scope, diameter_min_mm, diameter_max_mm,
		  practical_on, test_on, issued_at, issued_on, expires_on, trainers, issuer_name, credential_jwt)
		 values (?, ?, null, ?, 'point-repair-installer', ?, 'PR-100', 'Point-repair installer', 'Straight point repairs DN100-DN300.', 100, 300,
		  '2026-01-01', '2026-01-01', '2026-01-02T10:00:00Z', '2026-01-02', ?, '[]', 'Fenmoor Training Yard', 'x')`
	);
	const numbers: string[] = [];
	db.transaction(() => {
		for (let i = 0; i < count; i++) {
			const number = formatNumber(generateNumber());
			numbers.push(number);
			insert.run(crypto.randomUUID(), number, user.id, `Bench Holder ${i}`, i % 3 === 0 ? '2025-06-01' : '2029-01-02');
		}
	})();
	db.close();
	return numbers;
}

function rotate(url: string, prefix: string, numbers: string[]): Promise<LoadResult> {
	let next = 0;
	return new Promise((resolve, reject) => {
		autocannon(
			{
				url,
				connections: CONNECTIONS,
				duration: SECONDS,
				requests: [{ method: 'GET', setupRequest: (req: { path: string }) => ({ ...req, path: `${prefix}${numbers[next++ % numbers.length]}` }) }]
			},
			(err, result) => {
				if (err) return reject(err);
				resolve({
					name: '',
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

export async function lookupBench(): Promise<void> {
	const buildDir = path.join(root, process.env.BUILD_DIR || 'build');
	if (!existsSync(path.join(buildDir, 'index.js'))) {
		console.error('\nCertificate look-up: no build. Run `npm run build` first.');
		process.exitCode = 1;
		return;
	}
	const app = await startApp(buildDir);
	let bare: ReturnType<typeof spawn> | null = null;
	try {
		const file = path.join(app.dataDir, 'patchwright.sqlite');
		const numbers = fillCertificates(file, CERTIFICATES);
		const port = await freePort();
		bare = spawn(process.execPath, ['--import', 'jiti/register', path.join(root, 'scripts/bench-bare-certificates.ts')], {
			cwd: root,
			env: { ...process.env, PORT: String(port), DB_FILE: file },
			stdio: ['ignore', 'ignore', 'inherit']
		});
		const bareUrl = `http://127.0.0.1:${port}`;
		await waitFor(`${bareUrl}/certificates/${numbers[0]}`, bare);
		const shuffled = [...numbers].sort(() => Math.random() - 0.5).slice(0, 20_000);
		// warm both, then bare / app / bare so load from other work weighs on both sides
		await rotate(bareUrl, '/certificates/', shuffled.slice(0, 500));
		await rotate(app.url, '/api/v1/certificates/', shuffled.slice(0, 500));
		const before = await rotate(bareUrl, '/certificates/', shuffled);
		const appResult = await rotate(app.url, '/api/v1/certificates/', shuffled);
		const after = await rotate(bareUrl, '/certificates/', shuffled);
		const bareRps = (before.requestsPerSecond + after.requestsPerSecond) / 2;
		const ratio = (100 * appResult.requestsPerSecond) / bareRps;
		console.log(`\nCertificate look-up over ${CERTIFICATES.toLocaleString('en-US')} certificates: ${CONNECTIONS} connections, ${SECONDS} s each (autocannon)`);
		console.log(`${'target'.padEnd(44)}  ${'req/s'.padStart(8)}  ${'p50 ms'.padStart(7)}  ${'p99 ms'.padStart(7)}  ${'non-2xx'.padStart(7)}  vs bare`);
		console.log(`${'bare node:http + better-sqlite3 (mean)'.padEnd(44)}  ${Math.round(bareRps).toString().padStart(8)}  ${((before.p50 + after.p50) / 2).toFixed(1).padStart(7)}  ${((before.p99 + after.p99) / 2).toFixed(1).padStart(7)}  ${String(before.non2xx + after.non2xx).padStart(7)}  100 %`);
		console.log(`${'GET /api/v1/certificates/{number}'.padEnd(44)}  ${Math.round(appResult.requestsPerSecond).toString().padStart(8)}  ${appResult.p50.toFixed(1).padStart(7)}  ${appResult.p99.toFixed(1).padStart(7)}  ${String(appResult.non2xx).padStart(7)}  ${ratio.toFixed(1)} %`);
		const met = ratio >= 40 && appResult.p99 < 20;
		console.log(`target (>= 40 % of bare, p99 < 20 ms): ${met ? 'met' : 'MISSED'}`);
	} finally {
		if (bare) await stop(bare);
		await stop(app.child);
		rmSync(app.dataDir, { recursive: true, force: true });
	}
}
