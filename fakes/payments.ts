/**
 * Local stand-in for the payment service: an HTTP server that answers the part of its REST API
 * the app calls through the unmodified `stripe` SDK (Checkout Sessions, refunds), serves a
 * hosted test payment page per session, and delivers signed webhooks to the app.
 *
 * Shapes follow the service's published API reference (https://docs.stripe.com/api):
 * form-encoded request bodies with bracketed keys, JSON answers, errors as
 * `{ error: { type, code, message, param } }`, `Idempotency-Key` on POSTs, and webhook
 * signatures `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload">`
 * (https://docs.stripe.com/webhooks#verify-manually), which `stripe.webhooks.constructEvent`
 * verifies. Test card numbers are the service's published ones (https://docs.stripe.com/testing).
 *
 * State lives in memory and in `state.json` under the given folder, so a restart keeps it.
 */
import { createHash, createHmac, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';

export type DeliveryMode = 'normal' | 'twice' | 'reverse';

export interface PaymentsFakeOptions {
	port: number;
	dir: string;
	host?: string;
	/** Where events are POSTed; null keeps them undelivered (listed on the page only). */
	webhookUrl: string | null;
	webhookSecret: string;
	/** The secret key the app must send as its Bearer token; any `sk_test_` key when absent. */
	secretKey?: string;
	/** First retry delay; each further retry doubles it. */
	retryBaseMs?: number;
	maxAttempts?: number;
	delivery?: DeliveryMode;
}

interface LineItem {
	name: string;
	currency: string;
	unit_amount: number;
	quantity: number;
}

interface Session {
	id: string;
	object: 'checkout.session';
	created: number;
	expires_at: number;
	mode: 'payment';
	status: 'open' | 'complete' | 'expired';
	payment_status: 'unpaid' | 'paid';
	currency: string;
	amount_subtotal: number;
	amount_total: number;
	client_reference_id: string | null;
	customer_email: string | null;
	metadata: Record<string, string>;
	success_url: string;
	cancel_url: string | null;
	payment_intent: string | null;
	url: string | null;
	line_items: LineItem[];
	livemode: false;
	/** Last message shown on the payment page (a declined card). */
	last_decline: string | null;
}

interface Charge {
	id: string;
	object: 'charge';
	created: number;
	amount: number;
	amount_refunded: number;
	currency: string;
	payment_intent: string;
	refunded: boolean;
	status: 'succeeded';
	metadata: Record<string, string>;
	refunds: { object: 'list'; data: Refund[] };
}

interface Refund {
	id: string;
	object: 'refund';
	created: number;
	amount: number;
	currency: string;
	charge: string;
	payment_intent: string;
	status: 'succeeded';
	reason: string | null;
	metadata: Record<string, string>;
}

interface StoredEvent {
	id: string;
	object: 'event';
	type: string;
	created: number;
	api_version: string;
	livemode: false;
	data: { object: unknown };
	deliveries: { at: string; status: number | string }[];
	delivered: boolean;
}

interface State {
	sessions: Session[];
	charges: Charge[];
	events: StoredEvent[];
	idempotency: Record<string, { fingerprint: string; status: number; body: unknown }>;
}

/** The service's published test cards (https://docs.stripe.com/testing#declined-payments). */
export const TEST_CARDS: Record<string, { outcome: 'paid' } | { outcome: 'declined'; code: string; message: string }> = {
	'4242424242424242': { outcome: 'paid' },
	'5555555555554444': { outcome: 'paid' },
	'4000000000000002': { outcome: 'declined', code: 'generic_decline', message: 'Your card was declined.' },
	'4000000000009995': { outcome: 'declined', code: 'insufficient_funds', message: 'Your card has insufficient funds.' },
	'4000000000000069': { outcome: 'declined', code: 'expired_card', message: 'Your card has expired.' }
};

const API_VERSION = '2025-01-01.fake';
const now = () => Math.floor(Date.now() / 1000);
const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString('base64url').replace(/[-_]/g, 'x')}`;

/** Signs a payload exactly as the service does: HMAC-SHA256 over `${t}.${payload}`, hex. */
export function signatureHeader(payload: string, secret: string, timestamp = now()): string {
	const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
	return `t=${timestamp},v1=${v1}`;
}

class ApiError extends Error {
	constructor(
		readonly status: number,
		readonly type: string,
		message: string,
		readonly code?: string,
		readonly param?: string
	) {
		super(message);
	}
}

const forbiddenKeys = new Set(['__proto__', 'constructor', 'prototype']);

/**
 * Decodes `a[b][0][c]=v` form bodies (the SDK's encoding) into nested objects and arrays.
 * Keys that could reach an object's prototype are refused.
 */
export function parseFormBody(body: string): Record<string, unknown> {
	const root: Record<string, unknown> = {};
	for (const [fullKey, value] of new URLSearchParams(body)) {
		const parts = fullKey.replace(/\]/g, '').split('[');
		if (parts.some((p) => forbiddenKeys.has(p))) throw new ApiError(400, 'invalid_request_error', `Invalid parameter name: ${fullKey}`, 'parameter_unknown', fullKey);
		let node: Record<string, unknown> = root;
		parts.forEach((part, i) => {
			if (i === parts.length - 1) {
				node[part] = value;
				return;
			}
			const nextIsIndex = /^\d+$/.test(parts[i + 1]);
			if (typeof node[part] !== 'object' || node[part] === null) node[part] = nextIsIndex ? [] : {};
			node = node[part] as Record<string, unknown>;
		});
	}
	return root;
}

const esc = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function money(minor: number, currency: string) {
	const format = new Intl.NumberFormat('en-GB', { style: 'currency', currency: currency.toUpperCase() });
	const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
	return format.format(minor / 10 ** digits);
}

/** Its own look: a grey-violet test bench with a striped "test" band, unlike the app. */
const page = (title: string, body: string) => `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1"><title>${esc(title)}</title>
<style>
body{margin:0;font-family:system-ui,sans-serif;background:#eeedf4;color:#1d1b2e;font-size:17px;line-height:1.5}
.band{background:repeating-linear-gradient(45deg,#3b3561,#3b3561 14px,#4a4377 14px,#4a4377 28px);color:#fff;padding:10px 16px;font-weight:700}
main{max-width:560px;margin:0 auto;padding:16px}
.box{background:#fff;border:2px solid #c9c5dd;border-radius:10px;padding:16px;margin:16px 0}
h1{font-size:1.5rem;margin:.5rem 0}table{border-collapse:collapse;width:100%;background:#fff}
td,th{padding:8px;border-bottom:1px solid #ddd;text-align:left;vertical-align:top}
label{display:block;font-weight:600;margin-top:12px}
input{font:inherit;width:100%;box-sizing:border-box;min-height:44px;padding:8px;border:2px solid #8a85a8;border-radius:6px}
button,.button{font:inherit;font-weight:700;min-height:44px;padding:8px 18px;border-radius:6px;border:0;background:#3b3561;color:#fff;cursor:pointer;display:inline-flex;align-items:center;text-decoration:none;margin-top:16px}
.quiet{background:#fff;color:#3b3561;border:2px solid #3b3561}
.error{background:#fde8e8;border:2px solid #a61b1b;color:#5e0d0d;padding:10px;border-radius:6px}
code{background:#f3f2f8;padding:1px 4px;white-space:nowrap}.wide{max-width:1100px}.scroll{overflow-x:auto}
</style></head><body><div class="band" role="note">LOCAL TEST PAYMENT SERVICE: no real card is charged, nothing leaves this machine</div><main${title.startsWith('Payments') ? ' class="wide"' : ''}>${body}</main></body></html>`;

export async function startPaymentsFake(options: PaymentsFakeOptions) {
	const host = options.host ?? '127.0.0.1';
	const retryBaseMs = options.retryBaseMs ?? 1000;
	const maxAttempts = options.maxAttempts ?? 8;
	let delivery: DeliveryMode = options.delivery ?? 'normal';
	fs.mkdirSync(options.dir, { recursive: true });
	const stateFile = path.join(options.dir, 'state.json');
	const state: State = fs.existsSync(stateFile)
		? JSON.parse(fs.readFileSync(stateFile, 'utf8'))
		: { sessions: [], charges: [], events: [], idempotency: {} };
	const save = () => fs.writeFileSync(stateFile, JSON.stringify(state, null, 1));
	const timers = new Set<NodeJS.Timeout>();
	let held: StoredEvent | null = null;
	let baseUrl = '';

	const later = (ms: number, fn: () => void) => {
		const t = setTimeout(() => {
			timers.delete(t);
			fn();
		}, ms);
		timers.add(t);
	};

	async function deliver(event: StoredEvent, attempt = 1): Promise<void> {
		if (!options.webhookUrl) return;
		const payload = JSON.stringify({ ...event, deliveries: undefined, delivered: undefined });
		let status: number | string;
		try {
			const response = await fetch(options.webhookUrl, {
				method: 'POST',
				headers: { 'content-type': 'application/json; charset=utf-8', 'stripe-signature': signatureHeader(payload, options.webhookSecret), 'user-agent': 'PaymentsFake/1.0' },
				body: payload,
				signal: AbortSignal.timeout(10_000)
			});
			status = response.status;
			await response.arrayBuffer();
		} catch (e) {
			status = (e as Error).message;
		}
		event.deliveries.push({ at: new Date().toISOString(), status });
		if (typeof status === 'number' && status >= 200 && status < 300) event.delivered = true;
		save();
		// Back-off as the service documents it: retried with growing delays until answered 2xx.
		if (!event.delivered && attempt < maxAttempts) later(retryBaseMs * 2 ** (attempt - 1), () => void deliver(event, attempt + 1));
	}

	function emit(type: string, object: unknown) {
		const event: StoredEvent = { id: newId('evt'), object: 'event', type, created: now(), api_version: API_VERSION, livemode: false, data: { object: structuredClone(object) }, deliveries: [], delivered: false };
		state.events.push(event);
		save();
		if (delivery === 'twice') {
			void deliver(event);
			later(50, () => void deliver(event));
		} else if (delivery === 'reverse') {
			// Holds each event until the next one arrives (or 1.5 s pass), then sends the newer first.
			if (held) {
				const older = held;
				held = null;
				void deliver(event).then(() => deliver(older));
			} else {
				held = event;
				later(1500, () => {
					if (held === event) {
						held = null;
						void deliver(event);
					}
				});
			}
		} else void deliver(event);
	}

	const publicSession = (s: Session) => {
		// eslint-disable-next-line @typescript-eslint/no-unused-vars
		const { line_items, last_decline, ...rest } = s;
		return rest;
	};

	function expireSession(s: Session) {
		if (s.status !== 'open') throw new ApiError(400, 'invalid_request_error', `Only open sessions can be expired; this one is ${s.status}.`, 'checkout_session_not_open');
		s.status = 'expired';
		s.url = null;
		emit('checkout.session.expired', publicSession(s));
	}

	// Sessions past their expires_at expire on their own, as on the real service.
	const sweeper = setInterval(() => {
		for (const s of state.sessions) if (s.status === 'open' && s.expires_at <= now()) expireSession(s);
	}, 1000);

	function int(value: unknown, param: string, min = 0): number {
		const n = Number(value);
		if (typeof value !== 'string' || !/^\d+$/.test(value) || !Number.isSafeInteger(n) || n < min) {
			throw new ApiError(400, 'invalid_request_error', `Invalid integer: ${String(value)}`, 'parameter_invalid_integer', param);
		}
		return n;
	}
	const str = (value: unknown, param: string, required = false): string | null => {
		if (value === undefined || value === '') {
			if (required) throw new ApiError(400, 'invalid_request_error', `Missing required param: ${param}.`, 'parameter_missing', param);
			return null;
		}
		if (typeof value !== 'string') throw new ApiError(400, 'invalid_request_error', `Invalid string: ${param}`, 'parameter_invalid_string', param);
		return value;
	};
	const metadataOf = (value: unknown): Record<string, string> => {
		const out: Record<string, string> = {};
		if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) if (typeof v === 'string') out[k] = v;
		return out;
	};

	function createSession(p: Record<string, unknown>): Session {
		if (p.mode !== 'payment') throw new ApiError(400, 'invalid_request_error', 'This test service supports mode=payment only.', 'parameter_invalid', 'mode');
		const success_url = str(p.success_url, 'success_url', true)!;
		const rawItems = p.line_items;
		if (!Array.isArray(rawItems) || rawItems.length === 0) throw new ApiError(400, 'invalid_request_error', 'Missing required param: line_items.', 'parameter_missing', 'line_items');
		const line_items = rawItems.map((item, i): LineItem => {
			const pd = (item as Record<string, Record<string, unknown>>)?.price_data;
			if (!pd) throw new ApiError(400, 'invalid_request_error', 'Each line item needs price_data.', 'parameter_missing', `line_items[${i}][price_data]`);
			return {
				name: str((pd.product_data as Record<string, unknown>)?.name, `line_items[${i}][price_data][product_data][name]`, true)!,
				currency: str(pd.currency, `line_items[${i}][price_data][currency]`, true)!.toLowerCase(),
				unit_amount: int(pd.unit_amount, `line_items[${i}][price_data][unit_amount]`),
				quantity: int((item as Record<string, unknown>).quantity, `line_items[${i}][quantity]`, 1)
			};
		});
		if (new Set(line_items.map((l) => l.currency)).size > 1) throw new ApiError(400, 'invalid_request_error', 'All line items must share one currency.', 'parameter_invalid', 'line_items');
		const expires_at = p.expires_at === undefined ? now() + 24 * 3600 : int(p.expires_at, 'expires_at');
		if (expires_at < now() + 30 * 60 - 5 || expires_at > now() + 24 * 3600 + 5) {
			throw new ApiError(400, 'invalid_request_error', 'expires_at must be between 30 minutes and 24 hours from now.', 'parameter_invalid', 'expires_at');
		}
		const total = line_items.reduce((sum, l) => sum + l.unit_amount * l.quantity, 0);
		const id = newId('cs_test');
		const session: Session = {
			id,
			object: 'checkout.session',
			created: now(),
			expires_at,
			mode: 'payment',
			status: 'open',
			payment_status: 'unpaid',
			currency: line_items[0].currency,
			amount_subtotal: total,
			amount_total: total,
			client_reference_id: str(p.client_reference_id, 'client_reference_id'),
			customer_email: str(p.customer_email, 'customer_email'),
			metadata: metadataOf(p.metadata),
			success_url,
			cancel_url: str(p.cancel_url, 'cancel_url'),
			payment_intent: null,
			url: `${baseUrl}/pay/${id}`,
			line_items,
			livemode: false,
			last_decline: null
		};
		state.sessions.push(session);
		return session;
	}

	function findSession(id: string): Session {
		const s = state.sessions.find((x) => x.id === id);
		if (!s) throw new ApiError(404, 'invalid_request_error', `No such checkout.session: '${id}'`, 'resource_missing', 'id');
		return s;
	}

	function createRefund(p: Record<string, unknown>): Refund {
		const pi = str(p.payment_intent, 'payment_intent') ?? null;
		const chargeId = str(p.charge, 'charge');
		if (!pi && !chargeId) throw new ApiError(400, 'invalid_request_error', 'Provide a payment_intent or a charge.', 'parameter_missing', 'payment_intent');
		const charge = state.charges.find((c) => (pi ? c.payment_intent === pi : c.id === chargeId));
		if (!charge) throw new ApiError(404, 'invalid_request_error', `No such payment_intent: '${pi ?? chargeId}'`, 'resource_missing', pi ? 'payment_intent' : 'charge');
		const left = charge.amount - charge.amount_refunded;
		if (left === 0) throw new ApiError(400, 'invalid_request_error', `Charge ${charge.id} has already been refunded.`, 'charge_already_refunded');
		const amount = p.amount === undefined ? left : int(p.amount, 'amount', 1);
		if (amount > left) throw new ApiError(400, 'invalid_request_error', `Refund amount (${money(amount, charge.currency)}) is greater than unrefunded amount on charge (${money(left, charge.currency)})`, 'amount_too_large', 'amount');
		const refund: Refund = { id: newId('re'), object: 'refund', created: now(), amount, currency: charge.currency, charge: charge.id, payment_intent: charge.payment_intent, status: 'succeeded', reason: str(p.reason, 'reason'), metadata: metadataOf(p.metadata) };
		charge.amount_refunded += amount;
		charge.refunded = charge.amount_refunded === charge.amount;
		charge.refunds.data.unshift(refund);
		emit('charge.refunded', charge);
		return refund;
	}

	function pay(s: Session, card: string): string | null {
		const digits = card.replace(/[\s-]/g, '');
		const rule = TEST_CARDS[digits];
		if (!rule) return 'Use one of the test card numbers listed on this page.';
		if (rule.outcome === 'declined') return rule.message;
		const pi = newId('pi');
		s.status = 'complete';
		s.payment_status = 'paid';
		s.payment_intent = pi;
		s.url = null;
		state.charges.push({ id: newId('ch'), object: 'charge', created: now(), amount: s.amount_total, amount_refunded: 0, currency: s.currency, payment_intent: pi, refunded: false, status: 'succeeded', metadata: s.metadata, refunds: { object: 'list', data: [] } });
		emit('checkout.session.completed', publicSession(s));
		return null;
	}

	function authorised(req: http.IncomingMessage): boolean {
		const token = /^Bearer (.+)$/.exec(req.headers.authorization ?? '')?.[1];
		return options.secretKey ? token === options.secretKey : !!token && token.startsWith('sk_test_');
	}

	function api(method: string, pathname: string, body: Record<string, unknown>): unknown {
		let m: RegExpExecArray | null;
		if (method === 'POST' && pathname === '/v1/checkout/sessions') return publicSession(createSession(body));
		if (method === 'GET' && (m = /^\/v1\/checkout\/sessions\/([\w]+)$/.exec(pathname))) return publicSession(findSession(m[1]));
		if (method === 'POST' && (m = /^\/v1\/checkout\/sessions\/([\w]+)\/expire$/.exec(pathname))) {
			const s = findSession(m[1]);
			expireSession(s);
			return publicSession(s);
		}
		if (method === 'POST' && pathname === '/v1/refunds') return createRefund(body);
		throw new ApiError(404, 'invalid_request_error', `Unrecognized request URL (${method}: ${pathname}).`, 'resource_missing');
	}

	const readBody = (req: http.IncomingMessage) =>
		new Promise<string>((resolve, reject) => {
			let size = 0;
			const chunks: Buffer[] = [];
			req.on('data', (c: Buffer) => {
				size += c.length;
				if (size > 256 * 1024) {
					reject(new ApiError(413, 'invalid_request_error', 'Request body too large.'));
					req.destroy();
				} else chunks.push(c);
			});
			req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
			req.on('error', reject);
		});

	const server = http.createServer(async (req, res) => {
		const url = new URL(req.url ?? '/', `http://${host}`);
		const send = (status: number, type: string, body: string, headers: Record<string, string> = {}) => {
			res.writeHead(status, { 'content-type': type, ...headers });
			res.end(body);
		};
		const json = (status: number, body: unknown) => send(status, 'application/json', JSON.stringify(body, null, 2), { 'request-id': newId('req') });
		try {
			const method = req.method ?? 'GET';
			if (url.pathname.startsWith('/v1/')) {
				if (!authorised(req)) throw new ApiError(401, 'invalid_request_error', 'Invalid API Key provided.', 'api_key_invalid');
				const raw = method === 'POST' ? await readBody(req) : '';
				const body = parseFormBody(raw);
				const key = method === 'POST' ? req.headers['idempotency-key'] : undefined;
				if (typeof key === 'string' && key) {
					const fingerprint = createHash('sha256').update(`${method} ${url.pathname} ${raw}`).digest('hex');
					const seen = state.idempotency[key];
					if (seen) {
						if (seen.fingerprint !== fingerprint) {
							throw new ApiError(400, 'idempotency_error', `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`);
						}
						return send(seen.status, 'application/json', JSON.stringify(seen.body), { 'idempotent-replayed': 'true' });
					}
					try {
						const result = api(method, url.pathname, body);
						state.idempotency[key] = { fingerprint, status: 200, body: result };
						save();
						return json(200, result);
					} catch (e) {
						if (e instanceof ApiError && e.status < 500) state.idempotency[key] = { fingerprint, status: e.status, body: errorBody(e) };
						throw e;
					}
				}
				const result = api(method, url.pathname, body);
				save();
				return json(200, result);
			}

			if (url.pathname === '/_fake/delivery' && method === 'POST') {
				const mode = parseFormBody(await readBody(req)).mode;
				if (mode !== 'normal' && mode !== 'twice' && mode !== 'reverse') throw new ApiError(400, 'invalid_request_error', 'mode is normal, twice or reverse', 'parameter_invalid', 'mode');
				delivery = mode;
				return json(200, { delivery });
			}
			if (url.pathname === '/_fake/state' && method === 'GET') return json(200, { delivery, sessions: state.sessions, charges: state.charges, events: state.events });

			let m: RegExpExecArray | null;
			if ((m = /^\/pay\/([\w]+)$/.exec(url.pathname))) {
				const s = state.sessions.find((x) => x.id === m![1]);
				if (!s) return send(404, 'text/html; charset=utf-8', page('No such payment', '<h1>No such payment</h1><p>This test payment does not exist.</p>'));
				if (method === 'POST') {
					const form = new URLSearchParams(await readBody(req));
					if (s.status !== 'open') return send(303, 'text/plain', '', { location: `/pay/${s.id}` });
					const problem = pay(s, form.get('card') ?? '');
					s.last_decline = problem;
					save();
					if (!problem) return send(303, 'text/plain', '', { location: s.success_url.replace('{CHECKOUT_SESSION_ID}', s.id) });
					return send(303, 'text/plain', '', { location: `/pay/${s.id}` });
				}
				return send(200, 'text/html; charset=utf-8', payPage(s));
			}
			if (url.pathname === '/' && method === 'GET') return send(200, 'text/html; charset=utf-8', listPage());
			send(404, 'text/plain', 'Not found');
		} catch (e) {
			if (e instanceof ApiError) return json(e.status, errorBody(e));
			console.error('payments fake:', e);
			json(500, { error: { type: 'api_error', message: 'The test payment service failed.' } });
		}
	});

	function errorBody(e: ApiError) {
		return { error: { type: e.type, message: e.message, ...(e.code ? { code: e.code } : {}), ...(e.param ? { param: e.param } : {}) } };
	}

	function payPage(s: Session): string {
		const items = s.line_items
			.map((l) => `<tr><td>${esc(l.name)}</td><td>${l.quantity} × ${money(l.unit_amount, l.currency)}</td></tr>`)
			.join('');
		const summary = `<div class="box"><table><tbody>${items}<tr><th>Total</th><th>${money(s.amount_total, s.currency)}</th></tr></tbody></table>
${s.customer_email ? `<p>Receipt to <b>${esc(s.customer_email)}</b></p>` : ''}</div>`;
		if (s.status !== 'open') {
			const done = s.status === 'complete' ? `<p>This test payment is complete.</p><a class="button" href="${esc(s.success_url.replace('{CHECKOUT_SESSION_ID}', s.id))}">Back to the shop</a>` : '<p>This test payment has expired.</p>';
			return page('Test payment', `<h1>Test payment</h1>${summary}${done}`);
		}
		const cards = Object.entries(TEST_CARDS)
			.map(([n, r]) => `<tr><td><code>${n.replace(/(\d{4})/g, '$1 ').trim()}</code></td><td>${r.outcome === 'paid' ? 'pays' : esc(r.message)}</td></tr>`)
			.join('');
		return page(
			'Test payment',
			`<h1>Test payment</h1><p>A local stand-in for the payment page. Enter one of the test card numbers below; any future expiry date and any 3 digits work.</p>
${summary}${s.last_decline ? `<p class="error" role="alert">${esc(s.last_decline)}</p>` : ''}
<form method="post" class="box"><label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" required>
<label for="expiry">Expiry (MM / YY)</label><input id="expiry" name="expiry" value="12 / 34" autocomplete="off">
<label for="cvc">Security code</label><input id="cvc" name="cvc" value="123" autocomplete="off">
<button type="submit">Pay ${money(s.amount_total, s.currency)} (test)</button></form>
${s.cancel_url ? `<p><a class="button quiet" href="${esc(s.cancel_url)}">Cancel and go back</a></p>` : ''}
<div class="box"><h2>Test card numbers</h2><table><tbody>${cards}</tbody></table></div>`
		);
	}

	function listPage(): string {
		const when = (t: number) => new Date(t * 1000).toISOString().slice(0, 19).replace('T', ' ');
		const sessions = [...state.sessions].reverse().map((s) => `<tr><td>${when(s.created)}</td><td><a href="/pay/${s.id}"><code>${s.id}</code></a></td><td>${esc(s.customer_email ?? '')}</td><td>${money(s.amount_total, s.currency)}</td><td>${s.status} / ${s.payment_status}</td></tr>`).join('');
		const charges = [...state.charges].reverse().map((c) => `<tr><td>${when(c.created)}</td><td><code>${c.payment_intent}</code></td><td>${money(c.amount, c.currency)}</td><td>${money(c.amount_refunded, c.currency)} refunded</td></tr>`).join('');
		const events = [...state.events].reverse().map((e) => `<tr><td>${when(e.created)}</td><td><code>${e.id}</code></td><td>${esc(e.type)}</td><td>${e.delivered ? 'delivered' : 'not delivered'}: ${e.deliveries.map((d) => esc(String(d.status))).join(', ') || 'no attempt yet'}</td></tr>`).join('');
		const table = (head: string[], rows: string, cols: number) => `<div class="scroll"><table><thead><tr>${head.map((h) => `<th>${h}</th>`).join('')}</tr></thead><tbody>${rows || `<tr><td colspan="${cols}">None yet.</td></tr>`}</tbody></table></div>`;
		return page(
			'Payments (local test service)',
			`<h1>Payments (local test service)</h1><p>Every checkout, payment and webhook event the app has caused. Events go to <code>${esc(options.webhookUrl ?? '(no endpoint set)')}</code>. Delivery mode: <b>${delivery}</b>.</p>
<h2>Checkout sessions</h2>${table(['Created (UTC)', 'Session', 'Buyer', 'Total', 'Status'], sessions, 5)}
<h2>Payments</h2>${table(['Created (UTC)', 'Payment', 'Amount', 'Refunded'], charges, 4)}
<h2>Webhook events</h2>${table(['Created (UTC)', 'Event', 'Type', 'Delivery'], events, 4)}`
		);
	}

	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port, host, () => resolve());
	});
	const port = (server.address() as { port: number }).port;
	baseUrl = `http://${host}:${port}`;
	// Sessions created before a restart point at the old address.
	for (const s of state.sessions) if (s.status === 'open') s.url = `${baseUrl}/pay/${s.id}`;

	return {
		port,
		host,
		url: `${baseUrl}/`,
		setDelivery(mode: DeliveryMode) {
			delivery = mode;
		},
		state,
		async close() {
			clearInterval(sweeper);
			for (const t of timers) clearTimeout(t);
			server.closeAllConnections();
			await new Promise<void>((resolve) => server.close(() => resolve()));
		}
	};
}
