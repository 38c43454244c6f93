import path from 'node:path';

/**
 * Runtime settings, read from the environment (see .env.example) on each use, so tests
 * and scripts that set process.env see their values. Server-only.
 */
const env = process.env;

export const config = {
	get dataDir() {
		return path.resolve(env.DATA_DIR || './data');
	},
	get databaseFile() {
		return path.join(this.dataDir, 'patchwright.sqlite');
	},
	get smtpUrl() {
		return env.SMTP_URL || 'smtp://127.0.0.1:2525';
	},
	get mailFrom() {
		return env.MAIL_FROM || 'Patchwright <no-reply@patchwright.test>';
	},
	/** The fake inbox page; shown in the navigation only when fakes are enabled. */
	get fakeInboxUrl() {
		return env.FAKES === '1' ? env.FAKE_INBOX_URL || 'http://127.0.0.1:8025/' : null;
	},
	/** The fake payment service's page (sessions, payments, events); shown only when fakes are enabled. */
	get fakePaymentsUrl() {
		return env.FAKES === '1' ? env.FAKE_PAYMENTS_URL || null : null;
	},
	/** Public origin for links that leave the app (QR codes, credential ids); adapter-node reads the same variable. */
	get origin() {
		return (env.ORIGIN || `http://localhost:${env.PORT || 3000}`).replace(/\/+$/, '');
	},
	/** The training provider that issues certificates. */
	get issuerName() {
		return env.ISSUER_NAME || 'Fenmoor Training Yard';
	},
	get seedDemo() {
		return env.SEED_DEMO === '1';
	}
};

/** Sign-in attempt limits (per 15 minutes); tests raise the per-IP one since every test shares 127.0.0.1. */
export const signInLimits = {
	get perEmail() {
		return Number(env.SIGN_IN_LIMIT_PER_EMAIL || 5);
	},
	get perIp() {
		return Number(env.SIGN_IN_LIMIT_PER_IP || 30);
	},
	windowMs: 15 * 60 * 1000
};

/**
 * The payment service, reached through the `stripe` SDK. Leaving STRIPE_API_HOST unset talks
 * to the real service; the local fake is only a different host, port and protocol.
 */
export const paymentSettings = {
	get secretKey() {
		return env.STRIPE_SECRET_KEY || '';
	},
	get webhookSecret() {
		return env.STRIPE_WEBHOOK_SECRET || '';
	},
	get apiHost() {
		return env.STRIPE_API_HOST || undefined;
	},
	get apiPort() {
		return env.STRIPE_API_PORT ? Number(env.STRIPE_API_PORT) : undefined;
	},
	get apiProtocol(): 'http' | 'https' | undefined {
		return env.STRIPE_API_PROTOCOL === 'http' ? 'http' : env.STRIPE_API_PROTOCOL === 'https' ? 'https' : undefined;
	},
	/** Webhook events signed longer ago than this are refused (the SDK's default is 300 s). */
	get webhookToleranceSeconds() {
		return Number(env.STRIPE_WEBHOOK_TOLERANCE_SECONDS || 300);
	},
	/** How long a checkout stays open; the service accepts 30 minutes to 24 hours. */
	get checkoutMinutes() {
		return Math.min(24 * 60, Math.max(30, Number(env.CHECKOUT_EXPIRES_MINUTES || 60)));
	}
};

const optionalCount = (value: string | undefined) => (value && /^\d+$/.test(value) ? Number(value) : undefined);

/**
 * Requests per client address per window for the public APIs, by limiter bucket, when set;
 * unset, each API keeps its own default. The HTTP benchmark raises them so that it measures
 * the pipeline rather than 429 answers.
 */
export const apiLimitOverrides: Record<string, number | undefined> = {
	get 'calc-api'() {
		return optionalCount(env.CALC_API_LIMIT_PER_MINUTE);
	},
	get 'practice-api'() {
		return optionalCount(env.PRACTICE_API_LIMIT_PER_MINUTE);
	}
};
