/**
 * Starts the local service fakes and keeps them running (used by Playwright and `npm run fakes`).
 * Mail: MAIL_SMTP_PORT (default 2525), MAIL_HTTP_PORT (default 8025).
 * Payments: PAY_PORT (default 12111), PAY_WEBHOOK_URL (the app's webhook), PAY_WEBHOOK_SECRET
 * and PAY_SECRET_KEY (the same values the app gets as STRIPE_WEBHOOK_SECRET and STRIPE_SECRET_KEY).
 * S3-compatible storage: S3_FAKE_PORT (default 4569) and S3_FAKE_BUCKET (default patchwright-files);
 * S3_FAKE_PORT=off leaves it out. Data under DATA_DIR.
 */
import path from 'node:path';
import { startMailFake } from '../fakes/mail';
import { startPaymentsFake } from '../fakes/payments';
import { startS3Fake } from '../fakes/s3';

const dataDir = path.resolve(process.env.DATA_DIR || './data');
const mail = await startMailFake({
	smtpPort: Number(process.env.MAIL_SMTP_PORT || 2525),
	httpPort: Number(process.env.MAIL_HTTP_PORT || 8025),
	dir: path.join(dataDir, 'mail')
});
console.log(`Mail fake: SMTP ${mail.smtpUrl}, inbox ${mail.inboxUrl}`);

const payments = await startPaymentsFake({
	port: Number(process.env.PAY_PORT || 12111),
	dir: path.join(dataDir, 'payments'),
	webhookUrl: process.env.PAY_WEBHOOK_URL || 'http://localhost:3000/api/v1/payments/webhook',
	webhookSecret: process.env.PAY_WEBHOOK_SECRET || 'whsec_local_fake_only',
	secretKey: process.env.PAY_SECRET_KEY || undefined,
	retryBaseMs: Number(process.env.PAY_RETRY_BASE_MS || 1000)
});
console.log(`Payments fake: API and pages on ${payments.url}`);

const s3 =
	process.env.S3_FAKE_PORT === 'off'
		? null
		: await startS3Fake({
				port: Number(process.env.S3_FAKE_PORT || 4569),
				dir: path.join(dataDir, 's3'),
				bucket: process.env.S3_FAKE_BUCKET || 'patchwright-files'
			});
if (s3) {
	const settings = Object.entries(s3.env).map(([name, value]) => `${name}=${value}`).join(' ');
	console.log(`S3 fake: ${s3.url}, bucket ${s3.bucket}; the app uses it with ${settings}`);
}

const stop = async () => {
	await mail.close();
	await payments.close();
	await s3?.close();
	process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
