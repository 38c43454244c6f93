import { format, KyselyAdapter } from '@auth/kysely-adapter';
import type { Adapter } from '@auth/core/adapters';
import { CredentialsSignin } from '@auth/core/errors';
import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { dev } from '$app/environment';
import { config } from './config';
import { getDb } from './db';
import { sendMail } from './mail';
import { requestContext } from './request-context';
import { endSession, identityForSession, startSession } from './sessions';
import { countLinkMail, verifySignIn } from './sign-in-checks';
import { dropUnconfirmedPassword } from './users';
import { signInSchema } from '$lib/forms';

const DEV_SECRET = 'patchwright-development-secret-do-not-use-in-production';

export function authSecret(): string {
	const env = process.env;
	if (env.AUTH_SECRET) return env.AUTH_SECRET;
	if (dev || env.NODE_ENV === 'test') return DEV_SECRET;
	throw new Error('AUTH_SECRET must be set (see .env.example).');
}

/** Too many sign-in attempts: Auth.js puts `code=too_many_attempts` on its redirect to the sign-in page. */
class TooManyAttempts extends CredentialsSignin {
	code = 'too_many_attempts';
}

let authConfig: SvelteKitAuthConfig | undefined;

/**
 * Times in the Auth.js tables are ISO text on every engine, but the Kysely adapter turns Dates
 * into text (and back) only on SQLite; on PostgreSQL a link's expiry would come back as a string
 * that Auth.js cannot compare. Converting both ways around every call is a no-op on SQLite.
 */
function withTextDates(adapter: Adapter): Adapter {
	const toText = (value: unknown) => (value && typeof value === 'object' && !(value instanceof Date) ? format.to(value) : value);
	const wrapped: Record<string, unknown> = {};
	for (const [name, method] of Object.entries(adapter)) {
		if (typeof method !== 'function') continue;
		wrapped[name] = async (...args: unknown[]) => {
			const result = await method(...args.map(toText));
			if (!result || typeof result !== 'object') return result;
			if ('user' in result && 'session' in result) return { user: format.from(result.user), session: format.from(result.session) };
			return format.from(result);
		};
	}
	return wrapped as Adapter;
}

/** Built on first use so that importing this module opens no database (for example during a build). */
function getAuthConfig(): SvelteKitAuthConfig {
	if (authConfig) return authConfig;
	const db = getDb();
	// The adapter's types are generic over its own four tables; ours has more.
	const adapter = withTextDates(KyselyAdapter(db as never));
	authConfig = {
		adapter: {
			...adapter,
			// A link proves the address: a password set before it was confirmed may be a squatter's.
			async updateUser(user) {
				if (user.emailVerified) await dropUnconfirmedPassword(user.id, db);
				return adapter.updateUser!(user);
			},
			// Only the newest link for an address works.
			async createVerificationToken(token) {
				await db.deleteFrom('VerificationToken').where('identifier', '=', token.identifier).execute();
				return adapter.createVerificationToken!(token);
			}
		},
		secret: authSecret(),
		trustHost: true,
		// The cookie's own lifetime is the absolute limit; idle sessions end on the server (sessions.ts).
		session: { strategy: 'jwt', maxAge: config.sessionMaxAgeSeconds },
		pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in/error' },
		providers: [
			Nodemailer({
				server: config.smtpUrl,
				from: config.mailFrom,
				maxAge: 30 * 60,
				async sendVerificationRequest({ identifier, url }) {
					// Limited here, where the mail leaves, so Auth.js's own endpoint is limited too.
					// Over the limit nothing is sent and the answer is the same, so it tells nothing.
					if (!(await countLinkMail(identifier, requestContext())).ok) {
						console.warn('Sign-in link not sent: too many asked for this address or from this client.');
						return;
					}
					try {
						await sendMail({
							to: identifier,
							subject: 'Your Patchwright sign-in link',
							paragraphs: [
								'Someone (we hope you) asked to sign in to Patchwright with this e-mail address.',
								'The link below signs you in. It works once and expires in 30 minutes; only the newest link works.'
							],
							action: { label: 'Sign in to Patchwright', url },
							footnote: 'If you did not ask for this, ignore this message; nothing changes.'
						});
					} catch (error) {
						// Auth.js reports any failure here only as "Configuration": say what it was.
						console.error('Sign-in e-mail could not be sent:', error);
						throw error;
					}
				}
			}),
			Credentials({
				credentials: { email: {}, password: {} },
				async authorize(credentials) {
					const parsed = signInSchema.safeParse(credentials);
					if (!parsed.success) return null;
					const verdict = await verifySignIn(parsed.data.email, parsed.data.password, requestContext());
					if (verdict.outcome === 'limited') throw new TooManyAttempts();
					return verdict.outcome === 'ok' ? verdict.user : null;
				}
			})
		],
		callbacks: {
			async jwt({ token, user }) {
				// `user` is there only at sign-in: open the server-side session the cookie will name.
				if (user?.id) {
					token.sid = await startSession(user.id, db);
					return token;
				}
				// Auth.js's own session endpoint: an ended session is no session there either.
				return typeof token.sid === 'string' && (await identityForSession(token.sid, db)) ? token : null;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		},
		events: {
			async signOut(message) {
				const sid = 'token' in message ? message.token?.sid : undefined;
				if (typeof sid === 'string') await endSession(sid, 'sign-out', db);
			}
		}
	};
	return authConfig;
}

export const { handle: authHandle, signIn, signOut } = SvelteKitAuth(async () => getAuthConfig());
