import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startMailFake } from '../../fakes/mail';

// The app reads SMTP_URL at send time; point it at a fake started on a free port.
describe('sending e-mail through SMTP into the local fake', () => {
	let fake: Awaited<ReturnType<typeof startMailFake>>;
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-mail-'));

	beforeAll(async () => {
		fake = await startMailFake({ smtpPort: 0, httpPort: 0, dir });
		vi.stubEnv('SMTP_URL', fake.smtpUrl);
	});
	afterAll(async () => {
		vi.unstubAllEnvs();
		await fake.close();
	});

	it('delivers a message with a plain-text and an HTML part, listed by the inbox API', async () => {
		const { sendMail } = await import('$lib/server/mail');
		await sendMail({
			to: 'Crew@Example.test',
			subject: 'Test <message>',
			paragraphs: ['First line & more.'],
			action: { label: 'Open it', url: 'http://localhost/x?a=1&b=2' }
		});
		const response = await fetch(`${fake.inboxUrl}api/messages?to=crew@example.test`);
		const messages = await response.json();
		expect(messages).toHaveLength(1);
		expect(messages[0].subject).toBe('Test <message>');
		expect(messages[0].text).toContain('http://localhost/x?a=1&b=2');
		expect(messages[0].html).toContain('First line &amp; more.');
		expect(messages[0].html).toContain('href="http://localhost/x?a=1&amp;b=2"');
		const inbox = await (await fetch(fake.inboxUrl)).text();
		expect(inbox).toContain('Test &lt;message&gt;');
	});
});
