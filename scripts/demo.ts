/**
 * `npm run demo`: builds the app when the build is missing or older than the sources,
 * starts the local fakes on free ports, then the built app with the demo scenario seeded
 * into DATA_DIR (default ./data/demo), and prints every address and login.
 * PORT (default 3000) and DATA_DIR let two copies run side by side. DEMO_STORAGE=s3 keeps the
 * files in a local S3 fake (under DATA_DIR/s3) instead of DATA_DIR/uploads.
 */
import { spawn, spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { startMailFake } from '../fakes/mail';
import { startPaymentsFake } from '../fakes/payments';
import { startS3Fake } from '../fakes/s3';
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../src/lib/server/demo-people';

const root = path.resolve(import.meta.dirname, '..');
const port = Number(process.env.PORT || 3000);
const dataDir = path.resolve(process.env.DATA_DIR || path.join(root, 'data', 'demo'));
fs.mkdirSync(dataDir, { recursive: true });

function newestMtime(dir: string): number {
	let newest = 0;
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		const full = path.join(dir, entry.name);
		newest = Math.max(newest, entry.isDirectory() ? newestMtime(full) : fs.statSync(full).mtimeMs);
	}
	return newest;
}

const buildDir = path.join(root, process.env.BUILD_DIR || 'build');
const built = path.join(buildDir, 'handler.js');
const sourcesChanged = ['src', 'content', 'migrations', 'static'].some(
	(d) => fs.existsSync(built) && newestMtime(path.join(root, d)) > fs.statSync(built).mtimeMs
);
if (!fs.existsSync(built) || sourcesChanged) {
	console.log('Building the app (about 20 s)...');
	const result = spawnSync('npx', ['vite', 'build'], { cwd: root, encoding: 'utf8' });
	if (result.status !== 0) {
		console.error(result.stdout, result.stderr);
		process.exit(result.status ?? 1);
	}
}

// A secret per data folder, so sign-ins survive a restart of the demo.
const secretFile = path.join(dataDir, 'auth-secret');
if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, randomBytes(32).toString('base64url'), { mode: 0o600 });

const mail = await startMailFake({ smtpPort: 0, httpPort: 0, dir: path.join(dataDir, 'mail') });

// The payments fake, with a webhook secret per data folder; the app reaches it through the SDK settings only.
const webhookSecretFile = path.join(dataDir, 'payments-webhook-secret');
if (!fs.existsSync(webhookSecretFile)) fs.writeFileSync(webhookSecretFile, `whsec_${randomBytes(24).toString('base64url')}`, { mode: 0o600 });
const webhookSecret = fs.readFileSync(webhookSecretFile, 'utf8');
const paymentsKey = 'sk_test_patchwright_demo';
const payments = await startPaymentsFake({
	port: Number(process.env.PAY_PORT || 0),
	dir: path.join(dataDir, 'payments'),
	webhookUrl: `http://127.0.0.1:${port}/api/v1/payments/webhook`,
	webhookSecret,
	secretKey: paymentsKey
});

const s3 = process.env.DEMO_STORAGE === 's3' ? await startS3Fake({ port: 0, dir: path.join(dataDir, 's3'), bucket: 'patchwright-demo' }) : null;

const app = spawn(process.execPath, [buildDir], {
	cwd: root,
	stdio: ['ignore', 'pipe', 'inherit'],
	env: {
		...process.env,
		PORT: String(port),
		// adapter-node assumes https unless told the public origin; form actions check it.
		ORIGIN: process.env.ORIGIN || `http://localhost:${port}`,
		DATA_DIR: dataDir,
		AUTH_SECRET: process.env.AUTH_SECRET || fs.readFileSync(secretFile, 'utf8'),
		SMTP_URL: mail.smtpUrl,
		FAKES: '1',
		FAKE_INBOX_URL: mail.inboxUrl,
		STRIPE_SECRET_KEY: paymentsKey,
		STRIPE_WEBHOOK_SECRET: webhookSecret,
		STRIPE_API_HOST: payments.host,
		STRIPE_API_PORT: String(payments.port),
		STRIPE_API_PROTOCOL: 'http',
		FAKE_PAYMENTS_URL: payments.url,
		SEED_DEMO: '1',
		// Evidence uploads: 8 files of 12 MB plus the form (the upload route enforces its own caps).
		BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT || '100M',
		...(s3 ? { ...s3.env, AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' } : {})
	}
});

let announced = false;
app.stdout!.on('data', (chunk: Buffer) => {
	process.stdout.write(chunk);
	if (!announced && chunk.toString().includes('Listening')) {
		announced = true;
		const url = process.env.ORIGIN || `http://localhost:${port}`;
		const width = Math.max(...DEMO_PEOPLE.map((p) => p.email.length));
		console.log(`
Patchwright demo is running.
  App:          ${url}
  Local inbox:  ${mail.inboxUrl}   (every e-mail the app sends)
  Payments:     ${payments.url}   (local test payment service; card 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined)
  Calculators:  ${url}/tools
  Data folder:  ${dataDir}
  Files:        ${s3 ? `S3 fake ${s3.url}, bucket ${s3.bucket}` : `${path.join(dataDir, 'uploads')}`}

Demo logins (password for all: ${DEMO_PASSWORD}):
${DEMO_PEOPLE.map((p) => `  ${p.email.padEnd(width)}  ${p.part}`).join('\n')}
  (Brindlewick's compliance board, at ${url}/company/board as admin@brindlewick.test, shows every state.)

Press Ctrl+C to stop.`);
	}
});

const stop = async () => {
	app.kill('SIGTERM');
	await mail.close();
	await payments.close();
	await s3?.close();
	process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
app.on('exit', async (code) => {
	await mail.close();
	await payments.close();
	await s3?.close();
	process.exit(code ?? 0);
});
