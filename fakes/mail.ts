/**
 * Local stand-in for an SMTP provider: a real SMTP server (smtp-server) that parses each
 * message (mailparser), keeps it as JSON under a folder, and serves an inbox page and a
 * JSON API over HTTP. The app reaches it only through nodemailer and SMTP_URL.
 */
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface StoredMessage {
	id: string;
	receivedAt: string;
	from: string;
	to: string[];
	subject: string;
	text: string;
	html: string | null;
}

export interface MailFakeOptions {
	smtpPort: number;
	httpPort: number;
	dir: string;
	host?: string;
}

export function readMessages(dir: string): StoredMessage[] {
	if (!fs.existsSync(dir)) return [];
	return fs
		.readdirSync(dir)
		.filter((f) => f.endsWith('.json'))
		.map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), 'utf8')) as StoredMessage)
		.sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id));
}

const esc = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

const page = (title: string, body: string) => `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1"><title>${esc(title)}</title>
<style>body{font-family:system-ui,sans-serif;background:#fbf8f2;color:#171f27;margin:0;padding:16px;font-size:17px}
h1{font-family:Georgia,serif;color:#7b3822}a{color:#7b3822}table{border-collapse:collapse;width:100%;background:#fff}
td,th{padding:10px;border-bottom:1px solid #e4dccd;text-align:left}pre{white-space:pre-wrap;background:#fff;padding:12px;border:1px solid #e4dccd}
iframe{width:100%;height:480px;border:1px solid #e4dccd;background:#fff}</style></head><body>${body}</body></html>`;

export async function startMailFake(options: MailFakeOptions) {
	const host = options.host ?? '127.0.0.1';
	fs.mkdirSync(options.dir, { recursive: true });
	let counter = 0;

	const smtp = new SMTPServer({
		authOptional: true,
		allowInsecureAuth: true,
		disabledCommands: ['STARTTLS'],
		onAuth(_auth, _session, callback) {
			callback(null, { user: 'fake' });
		},
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((parsed) => {
					const receivedAt = new Date().toISOString();
					const id = `${Date.now()}-${process.pid}-${++counter}`;
					const message: StoredMessage = {
						id,
						receivedAt,
						from: parsed.from?.text ?? String(session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
						to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
						subject: parsed.subject ?? '',
						text: parsed.text ?? '',
						html: typeof parsed.html === 'string' ? parsed.html : null
					};
					fs.writeFileSync(path.join(options.dir, `${id}.json`), JSON.stringify(message, null, 2));
					callback();
				})
				.catch((error: Error) => callback(error));
		}
	});
	await new Promise<void>((resolve, reject) => {
		smtp.once('error', reject);
		smtp.listen(options.smtpPort, host, () => resolve());
	});

	const web = http.createServer((req, res) => {
		const url = new URL(req.url ?? '/', `http://${host}`);
		const send = (status: number, type: string, body: string) => {
			res.writeHead(status, { 'content-type': type });
			res.end(body);
		};
		if (url.pathname === '/api/messages' && req.method === 'GET') {
			const to = url.searchParams.get('to')?.toLowerCase();
			const messages = readMessages(options.dir).filter((m) => !to || m.to.includes(to));
			return send(200, 'application/json', JSON.stringify(messages));
		}
		if (url.pathname === '/api/messages' && req.method === 'DELETE') {
			for (const f of fs.readdirSync(options.dir)) if (f.endsWith('.json')) fs.rmSync(path.join(options.dir, f));
			return send(200, 'application/json', '{"ok":true}');
		}
		const match = url.pathname.match(/^\/messages\/([\w-]+)$/);
		if (match) {
			const message = readMessages(options.dir).find((m) => m.id === match[1]);
			if (!message) return send(404, 'text/html; charset=utf-8', page('Not found', '<p>No such message. <a href="/">Inbox</a></p>'));
			const html = message.html
				? `<h2>HTML part</h2><iframe sandbox title="HTML part" srcdoc="${esc(message.html)}"></iframe>`
				: '';
			return send(
				200,
				'text/html; charset=utf-8',
				page(
					message.subject,
					`<p><a href="/">← Inbox</a></p><h1>${esc(message.subject)}</h1>
<p><b>From</b> ${esc(message.from)}<br><b>To</b> ${esc(message.to.join(', '))}<br><b>Received</b> ${esc(message.receivedAt)}</p>
<h2>Plain-text part</h2><pre>${esc(message.text).replace(/(https?:\/\/[^\s<]+)/g, '<a href="$1">$1</a>')}</pre>${html}`
				)
			);
		}
		if (url.pathname === '/') {
			const rows = readMessages(options.dir)
				.map((m) => `<tr><td>${esc(m.receivedAt.slice(0, 19).replace('T', ' '))}</td><td>${esc(m.to.join(', '))}</td><td><a href="/messages/${m.id}">${esc(m.subject || '(no subject)')}</a></td></tr>`)
				.join('');
			return send(
				200,
				'text/html; charset=utf-8',
				page('Local inbox', `<h1>Local inbox</h1><p>Every e-mail the app sends in demo and test mode lands here. Nothing leaves this machine.</p>
<table><thead><tr><th>Received (UTC)</th><th>To</th><th>Subject</th></tr></thead><tbody>${rows || '<tr><td colspan="3">No messages yet.</td></tr>'}</tbody></table>`)
			);
		}
		send(404, 'text/plain', 'Not found');
	});
	await new Promise<void>((resolve, reject) => {
		web.once('error', reject);
		web.listen(options.httpPort, host, () => resolve());
	});

	// Port 0 asks the system for a free port; report the ones actually bound.
	const smtpPort = (smtp.server.address() as { port: number }).port;
	const httpPort = (web.address() as { port: number }).port;
	return {
		smtpUrl: `smtp://${host}:${smtpPort}`,
		inboxUrl: `http://${host}:${httpPort}/`,
		async close() {
			await new Promise<void>((resolve) => smtp.close(() => resolve()));
			await new Promise<void>((resolve) => web.close(() => resolve()));
		}
	};
}
