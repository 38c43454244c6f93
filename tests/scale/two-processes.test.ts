/**
 * Two app processes (the built server, `node build`) on two ports behind one public origin, as a
 * load balancer would run them, sharing one PostgreSQL database and one S3 bucket (the local S3
 * fake), each with a data folder of its own: nothing they share may live in a local folder. Needs a real
 * PostgreSQL server at PG_TEST_URL and a build (BUILD_DIR, default `build`); test-all runs it with
 * the server it starts (SCALE_TESTS=1 selects this folder).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { calculateJwkThumbprint, exportJWK, generateKeyPair } from 'jose';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openPostgres } from '$lib/server/db/engine';
import { migrateToLatest } from '$lib/server/db/migrate';
import { enrol } from '$lib/server/enrolments';
import { createUser } from '$lib/server/users';
import { startS3Fake } from '../../fakes/s3';

const COURSE = 'packer-pressure-safety';
const PUBLIC_ORIGIN = 'http://patchwright.test';
const PASSWORD = 'two processes, one database';
const LIMIT_PER_EMAIL = 4;

const adminUrl = process.env.PG_TEST_URL;
const buildDir = path.resolve(process.env.BUILD_DIR || 'build');
const database = `pw_scale_${process.pid}`;

function databaseUrl(name: string): string {
	const url = new URL(adminUrl!);
	url.pathname = `/${name}`;
	return url.toString();
}

async function admin(text: string): Promise<void> {
	const client = new pg.Client({ connectionString: adminUrl });
	await client.connect();
	try {
		await client.query(text);
	} finally {
		await client.end();
	}
}

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = net.createServer();
		server.listen(0, '127.0.0.1', () => {
			const { port } = server.address() as net.AddressInfo;
			server.close(() => resolve(port));
		});
		server.on('error', reject);
	});
}

interface AppProcess {
	base: string;
	child: ChildProcess;
	output: string[];
}

async function startApp(dataDir: string, storageEnv: Record<string, string>): Promise<AppProcess> {
	const port = await freePort();
	const output: string[] = [];
	const child = spawn(process.execPath, [buildDir], {
		env: {
			...process.env,
			NODE_ENV: 'production',
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: PUBLIC_ORIGIN,
			DATA_DIR: dataDir,
			...storageEnv,
			AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
			DATABASE_URL: databaseUrl(database),
			AUTH_SECRET: 'scale-test-only-secret-not-for-production',
			SIGN_IN_LIMIT_PER_EMAIL: String(LIMIT_PER_EMAIL),
			SIGN_IN_LIMIT_PER_IP: '100000',
			RATE_LIMIT_FACTOR: '1000',
			SEED_DEMO: '0',
			SMTP_URL: 'smtp://127.0.0.1:9'
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout!.on('data', (d) => output.push(String(d)));
	child.stderr!.on('data', (d) => output.push(String(d)));
	const base = `http://127.0.0.1:${port}`;
	for (let i = 0; i < 240; i++) {
		if (child.exitCode !== null) throw new Error(`app exited: ${output.join('')}`);
		try {
			if ((await fetch(`${base}/api/v1/health`)).ok) return { base, child, output };
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`app did not answer: ${output.join('')}`);
}

const formHeaders = { origin: PUBLIC_ORIGIN, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' };

function signIn(app: AppProcess, email: string, password: string): Promise<Response> {
	return fetch(`${app.base}/sign-in?/password`, {
		method: 'POST',
		headers: formHeaders,
		body: new URLSearchParams({ intent: 'password', email, password }),
		redirect: 'manual'
	});
}

function cookieOf(response: Response): string {
	return response.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.filter((c) => !c.endsWith('='))
		.join('; ');
}

describe('two app processes on one PostgreSQL database', () => {
	let a: AppProcess;
	let b: AppProcess;
	let db: ReturnType<typeof openPostgres>;
	let dataDir: string;
	let s3: Awaited<ReturnType<typeof startS3Fake>> | undefined;
	let issuerKid = '';

	beforeAll(async () => {
		if (!adminUrl) throw new Error('PG_TEST_URL is not set: this test needs a PostgreSQL server (test-all starts one).');
		if (!fs.existsSync(path.join(buildDir, 'index.js'))) throw new Error(`No build at ${buildDir}: run vite build first.`);
		await admin(`drop database if exists ${database}`);
		await admin(`create database ${database}`);
		db = openPostgres(databaseUrl(database), { poolSize: 2 });
		await migrateToLatest(db);
		for (const who of ['crew', 'guessed']) {
			const user = await createUser({ email: `${who}@scale.test`, name: who, password: PASSWORD, emailVerified: true }, db);
			await enrol(null, user.id, COURSE, 'registrar', db);
		}
		dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-scale-'));
		s3 = await startS3Fake({ port: 0, dir: path.join(dataDir, 's3'), bucket: 'patchwright-scale' });
		// one signing key for both, given as a setting (neither data folder is shared)
		const pair = await generateKeyPair('EdDSA', { crv: 'Ed25519', extractable: true });
		const issuerJwk = await exportJWK(pair.privateKey);
		issuerKid = await calculateJwkThumbprint(issuerJwk);
		const shared = { ...s3.env, ISSUER_KEY: JSON.stringify(issuerJwk) };
		a = await startApp(path.join(dataDir, 'a'), shared);
		b = await startApp(path.join(dataDir, 'b'), shared);
	}, 180_000);

	afterAll(async () => {
		// SIGTERM, then SIGKILL for a server still running after 5 s: no server outlives the test
		await Promise.all(
			[a, b].map(async (app) => {
				if (!app || app.child.exitCode !== null) return;
				const exited = new Promise((r) => app.child.once('exit', r));
				app.child.kill('SIGTERM');
				const timer = setTimeout(() => app.child.kill('SIGKILL'), 5000);
				await exited;
				clearTimeout(timer);
			})
		);
		await db?.destroy();
		await s3?.close();
		if (adminUrl) await admin(`drop database if exists ${database}`).catch(() => undefined);
		if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
	});

	it('a session started on one process works on the other, and signing out on one ends it on both', async () => {
		const signedIn = await signIn(a, 'crew@scale.test', PASSWORD);
		expect(signedIn.status).toBe(302);
		const cookie = cookieOf(signedIn);
		expect(cookie).toMatch(/session-token=/);
		for (const app of [a, b]) {
			const me = await fetch(`${app.base}/api/v1/me`, { headers: { cookie } });
			expect(me.status).toBe(200);
			expect(await me.json()).toMatchObject({ email: 'crew@scale.test' });
		}
		const other = cookieOf(await signIn(b, 'crew@scale.test', PASSWORD));
		const out = await fetch(`${b.base}/sign-out`, { method: 'POST', headers: { ...formHeaders, cookie: other }, body: '', redirect: 'manual' });
		expect(out.status).toBeLessThan(400);
		expect((await fetch(`${a.base}/api/v1/me`, { headers: { cookie: other } })).status).toBe(401);
		expect((await fetch(`${a.base}/api/v1/me`, { headers: { cookie } })).status).toBe(200);
	}, 120_000);

	it('the sign-in limit counts attempts made on both processes', async () => {
		for (let i = 0; i < LIMIT_PER_EMAIL; i++) {
			const wrong = await signIn(i % 2 === 0 ? a : b, 'guessed@scale.test', `guess ${i}`);
			expect(wrong.status).toBe(400);
		}
		// the right password now, on either process: the limit is reached across both
		for (const app of [a, b]) {
			const refused = await signIn(app, 'guessed@scale.test', PASSWORD);
			expect(refused.status).toBe(429);
			expect(await refused.text()).toContain('Too many sign-in attempts');
		}
	}, 120_000);

	it('50 concurrent submits split across both processes grade the attempt once', async () => {
		const cookie = cookieOf(await signIn(b, 'crew@scale.test', PASSWORD));
		const started = await fetch(`${a.base}/api/v1/courses/${COURSE}/attempts`, { method: 'POST', headers: { cookie, origin: PUBLIC_ORIGIN } });
		expect(started.status).toBe(201);
		const { attempt } = (await started.json()) as { attempt: { id: string } };
		const answers = await Promise.all(
			Array.from({ length: 50 }, (_, i) =>
				fetch(`${(i % 2 === 0 ? a : b).base}/api/v1/attempts/${attempt.id}/submit`, { method: 'POST', headers: { cookie, origin: PUBLIC_ORIGIN } })
			)
		);
		const statuses = answers.map((r) => r.status);
		expect(statuses.filter((s) => s === 200)).toHaveLength(1);
		expect(statuses.filter((s) => s === 409)).toHaveLength(49);
		const audit = await db.selectFrom('audit_log').select('id').where('action', '=', 'test.submit').where('subject_id', '=', attempt.id).execute();
		expect(audit).toHaveLength(1);
		const row = await db.selectFrom('test_attempt').select(['item_count', 'closed_by']).where('id', '=', attempt.id).executeTakeFirstOrThrow();
		expect(row.closed_by).toBe('person');
		const results = await db.selectFrom('test_item_result').select('position').where('attempt_id', '=', attempt.id).execute();
		expect(results).toHaveLength(row.item_count);
	}, 120_000);

	it('both processes publish the one configured signing key', async () => {
		for (const app of [a, b]) {
			const jwks = (await (await fetch(`${app.base}/.well-known/jwks.json`)).json()) as { keys: { kid: string; d?: string }[] };
			expect(jwks.keys.map((k) => k.kid.split("#").pop()), JSON.stringify(jwks)).toEqual([issuerKid]);
			expect(jwks.keys[0].d).toBeUndefined();
		}
	});

	it('each process ends by itself after SIGTERM (jobs stopped, pool closed)', async () => {
		const codes = await Promise.all(
			[a, b].map((app) => {
				const exited = new Promise<number | null>((r) => app.child.once('exit', (code) => r(code)));
				app.child.kill('SIGTERM');
				return Promise.race([exited, new Promise<string>((r) => setTimeout(() => r('still running after 10 s'), 10_000))]);
			})
		);
		expect(codes).toEqual([0, 0]);
	}, 30_000);
});
