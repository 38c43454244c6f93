/**
 * Starts the local service fakes and keeps them running (used by Playwright and `npm run fakes`).
 * Ports: MAIL_SMTP_PORT (default 2525), MAIL_HTTP_PORT (default 8025); data under DATA_DIR.
 */
import path from 'node:path';
import { startMailFake } from '../fakes/mail';

const dataDir = path.resolve(process.env.DATA_DIR || './data');
const mail = await startMailFake({
	smtpPort: Number(process.env.MAIL_SMTP_PORT || 2525),
	httpPort: Number(process.env.MAIL_HTTP_PORT || 8025),
	dir: path.join(dataDir, 'mail')
});
console.log(`Mail fake: SMTP ${mail.smtpUrl}, inbox ${mail.inboxUrl}`);

const stop = async () => {
	await mail.close();
	process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
