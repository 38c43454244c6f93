/**
 * Starts the local service fakes and keeps them running (used by Playwright and `npm run fakes`).
 * Mail: MAIL_SMTP_PORT (default 2525), MAIL_HTTP_PORT (default 8025).
 * Payments: PAY_PORT (default 12111), PAY_WEBHOOK_URL (the app's webhook), PAY_WEBHOOK_SECRET
 * and PAY_SECRET_KEY (the same values the app gets as STRIPE_WEBHOOK_SECRET and STRIPE_SECRET_KEY).
 * Data under DATA_DIR.
 */
import path from 'node:path';
import { startMailFake } from '../fakes/mail';
import { startPaymentsFake } from '../fakes/payments';

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

const stop = async () => {
	await mail.close();
	await payments.close();
	process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
