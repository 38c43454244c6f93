import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { startPaymentsFake } from '../../fakes/payments';
import { startMailFake } from '../../fakes/mail';
import { receivePaymentWebhook } from '$lib/server/payment-webhook';
import type { DB } from '$lib/server/db';

export const WEBHOOK_SECRET = 'whsec_unit_test_secret';

/**
 * The payments fake and the mail fake on free ports, with webhooks delivered to a small server
 * that hands each delivery to the app's webhook handler against the given database. Sets the
 * environment the app reads (STRIPE_*, SMTP_URL) as the demo would.
 */
export async function startPaymentsHarness(getDb: () => DB) {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-pay-'));
	const receiver = http.createServer((req, res) => {
		const chunks: Buffer[] = [];
		req.on('data', (c: Buffer) => chunks.push(c));
		req.on('end', async () => {
			const answer = await receivePaymentWebhook(Buffer.concat(chunks).toString('utf8'), (req.headers['stripe-signature'] as string) ?? null, getDb());
			res.writeHead(answer.status, { 'content-type': 'application/json' });
			res.end(JSON.stringify(answer.body));
		});
	});
	await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', () => r()));
	const receiverPort = (receiver.address() as { port: number }).port;
	const fake = await startPaymentsFake({ port: 0, dir: path.join(dir, 'payments'), webhookUrl: `http://127.0.0.1:${receiverPort}/`, webhookSecret: WEBHOOK_SECRET, retryBaseMs: 50, maxAttempts: 4 });
	const mail = await startMailFake({ smtpPort: 0, httpPort: 0, dir: path.join(dir, 'mail') });
	Object.assign(process.env, {
		STRIPE_SECRET_KEY: 'sk_test_unit',
		STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
		STRIPE_API_HOST: '127.0.0.1',
		STRIPE_API_PORT: String(fake.port),
		STRIPE_API_PROTOCOL: 'http',
		SMTP_URL: mail.smtpUrl
	});
	return {
		fake,
		mail,
		/** Pays a session on the hosted test page with a card number; returns where the page sent the buyer. */
		async pay(sessionId: string, card: string) {
			const response = await fetch(`${fake.url}pay/${sessionId}`, { method: 'POST', body: new URLSearchParams({ card }), redirect: 'manual' });
			return response.headers.get('location');
		},
		/** Waits until every event the fake has emitted was answered (2xx or given up). */
		async settled(timeoutMs = 5000) {
			const until = Date.now() + timeoutMs;
			while (Date.now() < until) {
				await new Promise((r) => setTimeout(r, 30));
				if (fake.state.events.every((e) => e.delivered || e.deliveries.length >= 4)) {
					await new Promise((r) => setTimeout(r, 80));
					if (fake.state.events.every((e) => e.delivered || e.deliveries.length >= 4)) return;
				}
			}
			throw new Error('webhook deliveries did not settle');
		},
		async close() {
			await fake.close();
			await mail.close();
			receiver.closeAllConnections();
			await new Promise<void>((r) => receiver.close(() => r()));
			fs.rmSync(dir, { recursive: true, force: true });
		}
	};
}
