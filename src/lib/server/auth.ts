import { KyselyAdapter } from '@auth/kysely-adapter';
import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { dev } from '$app/environment';
import { config } from './config';
import { getDb } from './db';
import { sendMail } from './mail';
import { checkPassword } from './users';
import { signInSchema } from '$lib/forms';

const DEV_SECRET = 'patchwright-development-secret-do-not-use-in-production';

function authSecret(): string {
	const env = process.env;
	if (env.AUTH_SECRET) return env.AUTH_SECRET;
	if (dev || env.NODE_ENV === 'test') return DEV_SECRET;
	throw new Error('AUTH_SECRET must be set (see .env.example).');
}

let authConfig: SvelteKitAuthConfig | undefined;

/** Built on first use so that importing this module opens no database (for example during a build). */
function getAuthConfig(): SvelteKitAuthConfig {
	authConfig ??= {
		// The adapter's types are generic over its own four tables; ours has more.
		adapter: KyselyAdapter(getDb() as never),
		secret: authSecret(),
		trustHost: true,
		session: { strategy: 'jwt', maxAge: 30 * 24 * 60 * 60 },
		pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in/error' },
		providers: [
			Nodemailer({
				server: config.smtpUrl,
				from: config.mailFrom,
				maxAge: 30 * 60,
				async sendVerificationRequest({ identifier, url }) {
					try {
						await sendMail({
							to: identifier,
							subject: 'Your Patchwright sign-in link',
							paragraphs: [
								'Someone (we hope you) asked to sign in to Patchwright with this e-mail address.',
								'The link below signs you in. It works once and expires in 30 minutes.'
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
					return checkPassword(parsed.data.email, parsed.data.password);
				}
			})
		],
		callbacks: {
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				return session;
			}
		}
	};
	return authConfig;
}

export const { handle: authHandle, signIn, signOut } = SvelteKitAuth(async () => getAuthConfig());
