import { defineConfig, devices } from '@playwright/test';

/**
 * End-to-end tests run the built app (`vite build` first) with the local fakes, in Debian's
 * Chromium. Each run starts from an empty data folder seeded with the demo scenario.
 */
const PORT = Number(process.env.E2E_PORT || 4173);
const MAIL_SMTP_PORT = Number(process.env.E2E_SMTP_PORT || 2626);
const MAIL_HTTP_PORT = Number(process.env.E2E_MAIL_HTTP_PORT || 8126);
const PAY_PORT = Number(process.env.E2E_PAY_PORT || 12117);
const S3_PORT = Number(process.env.E2E_S3_PORT || 12118);
const S3_BUCKET = 'patchwright-e2e';
const PAY_SECRET_KEY = 'sk_test_e2e_only';
const PAY_WEBHOOK_SECRET = 'whsec_e2e_only_not_for_production';
const artifacts = 'tests/.artifacts';
export const baseURL = `http://localhost:${PORT}`;
export const inboxURL = `http://127.0.0.1:${MAIL_HTTP_PORT}/`;
export const paymentsURL = `http://127.0.0.1:${PAY_PORT}/`;
/**
 * The app keeps its files in the S3 fake (s3rver, started with the other fakes) unless
 * E2E_STORAGE=filesystem: evidence uploads and certificate downloads go through the AWS SDK.
 */
export const useS3 = process.env.E2E_STORAGE !== 'filesystem';
// the AWS SDK's notice that its 2027 releases will need Node 22 (known; see README), in the tests and the app
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
export const s3URL = `http://127.0.0.1:${S3_PORT}`;
export const s3Bucket = S3_BUCKET;
export const e2eDataDir = `${artifacts}/e2e-data`;
const s3Settings: Record<string, string> = useS3
	? { S3_ENDPOINT: s3URL, S3_BUCKET, S3_REGION: 'us-east-1', S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: '1' }
	: {};

export default defineConfig({
	testDir: 'tests/e2e',
	outputDir: `${artifacts}/results`,
	fullyParallel: false,
	workers: 1,
	retries: 0,
	timeout: 30_000,
	reporter: process.env.CI ? [['list'], ['json', { outputFile: `${artifacts}/playwright.json` }]] : [['list'], ['json', { outputFile: `${artifacts}/playwright.json` }]],
	use: {
		baseURL,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
		}
	},
	projects: [{ name: 'chromium', use: { ...devices['Desktop Chrome'], channel: undefined } }],
	webServer: [
		{
			// the S3 fake starts last, so its answer means every fake is up
			url: useS3 ? `${s3URL}/` : inboxURL,
			reuseExistingServer: false,
			command: `rm -rf ${artifacts}/e2e-fakes && node --import jiti/register scripts/fakes.ts`,
			env: {
				DATA_DIR: `${artifacts}/e2e-fakes`,
				MAIL_SMTP_PORT: String(MAIL_SMTP_PORT),
				MAIL_HTTP_PORT: String(MAIL_HTTP_PORT),
				PAY_PORT: String(PAY_PORT),
				PAY_WEBHOOK_URL: `http://127.0.0.1:${PORT}/api/v1/payments/webhook`,
				PAY_WEBHOOK_SECRET,
				PAY_SECRET_KEY,
				PAY_RETRY_BASE_MS: '500',
				S3_FAKE_PORT: useS3 ? String(S3_PORT) : 'off',
				S3_FAKE_BUCKET: S3_BUCKET
			},
			stdout: 'ignore'
		},
		{
			command: `rm -rf ${artifacts}/e2e-data && node ${process.env.BUILD_DIR || 'build'}`,
			url: `${baseURL}/api/v1/health`,
			reuseExistingServer: false,
			timeout: 60_000,
			env: {
				PORT: String(PORT),
				ORIGIN: baseURL,
				DATA_DIR: `${artifacts}/e2e-data`,
				AUTH_SECRET: 'e2e-only-secret-not-for-production',
				SMTP_URL: `smtp://127.0.0.1:${MAIL_SMTP_PORT}`,
				FAKES: '1',
				FAKE_INBOX_URL: inboxURL,
				STRIPE_SECRET_KEY: PAY_SECRET_KEY,
				STRIPE_WEBHOOK_SECRET: PAY_WEBHOOK_SECRET,
				STRIPE_API_HOST: '127.0.0.1',
				STRIPE_API_PORT: String(PAY_PORT),
				STRIPE_API_PROTOCOL: 'http',
				FAKE_PAYMENTS_URL: paymentsURL,
				SEED_DEMO: '1',
				SIGN_IN_LIMIT_PER_IP: '100000',
				// Evidence uploads: 8 files of 12 MB plus the form (the upload route enforces its own caps).
				BODY_SIZE_LIMIT: '100M',
				CERTIFICATE_LOOKUP_LIMIT_PER_MINUTE: '100000',
				...s3Settings
			},
			stdout: 'pipe'
		}
	]
});
