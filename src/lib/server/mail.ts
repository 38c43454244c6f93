import nodemailer, { type Transporter } from 'nodemailer';
import { config } from './config';

let transport: Transporter | undefined;
let transportUrl: string | undefined;

/** One SMTP transport per SMTP_URL; a real server is configuration, not code. */
function getTransport(): Transporter {
	if (!transport || transportUrl !== config.smtpUrl) {
		transportUrl = config.smtpUrl;
		transport = nodemailer.createTransport(transportUrl);
	}
	return transport;
}

export interface MailContent {
	to: string;
	subject: string;
	/** Short paragraphs of plain text; they are also rendered into the HTML part. */
	paragraphs: string[];
	action?: { label: string; url: string };
	footnote?: string;
	/** A fixed Message-ID, so a repeat of the same message can be recognised. */
	messageId?: string;
}

export async function sendMail(content: MailContent): Promise<void> {
	await getTransport().sendMail({
		from: config.mailFrom,
		to: content.to,
		subject: content.subject,
		...(content.messageId ? { messageId: content.messageId } : {}),
		text: renderText(content),
		html: renderHtml(content)
	});
}

export function renderText({ paragraphs, action, footnote }: MailContent): string {
	const lines = [...paragraphs];
	if (action) lines.push(`${action.label}:\n${action.url}`);
	if (footnote) lines.push(footnote);
	lines.push('-- \nPatchwright: training and certification for point-repair liner crews');
	return lines.join('\n\n') + '\n';
}

const escapeHtml = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

/** Inline styles only: mail clients ignore style sheets. Colours are Patchwright's palette. */
export function renderHtml({ subject, paragraphs, action, footnote }: MailContent): string {
	const body = paragraphs.map((p) => `<p style="margin:0 0 16px">${escapeHtml(p)}</p>`).join('');
	const button = action
		? `<p style="margin:24px 0"><a href="${escapeHtml(action.url)}" style="display:inline-block;background:#9a4628;color:#ffffff;padding:14px 24px;border-radius:8px;font-weight:bold;text-decoration:none">${escapeHtml(action.label)}</a></p>
<p style="margin:0 0 16px;font-size:14px;color:#455766">If the button does not work, copy this address into your browser:<br>${escapeHtml(action.url)}</p>`
		: '';
	const foot = footnote ? `<p style="margin:0 0 16px;font-size:14px;color:#455766">${escapeHtml(footnote)}</p>` : '';
	return `<!doctype html><html><head><meta charset="utf-8"><title>${escapeHtml(subject)}</title></head>
<body style="margin:0;background:#fbf8f2;font-family:Georgia,serif;color:#171f27;font-size:17px;line-height:1.6">
<div style="max-width:560px;margin:0 auto;padding:24px">
<div style="border-bottom:4px solid #b65833;padding-bottom:8px;margin-bottom:24px;font-weight:bold;font-size:22px;color:#7b3822">Patchwright</div>
${body}${button}${foot}
<p style="margin:32px 0 0;font-size:13px;color:#5a6e7e;font-family:Arial,sans-serif">Patchwright: training and certification for point-repair liner crews</p>
</div></body></html>`;
}
