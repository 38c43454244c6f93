import { z } from 'zod';

/** Form schemas shared by the server (authoritative) and pages (hints). */

export const email = z
	.string({ error: 'Enter your e-mail address.' })
	.trim()
	.min(1, 'Enter your e-mail address.')
	.max(254, 'That e-mail address is too long.')
	.pipe(z.email('Enter an e-mail address like name@example.com.'))
	.transform((s) => s.toLowerCase());

export const newPassword = z
	.string({ error: 'Choose a password.' })
	.min(10, 'Use at least 10 characters.')
	.max(200, 'Use at most 200 characters.');

export const signInSchema = z.object({
	email,
	password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200)
});

export const magicLinkSchema = z.object({ email });

/**
 * Control characters (Unicode general category Cc) and the explicit directional formatting
 * characters of the Unicode Bidirectional Algorithm (UAX #9: ALM, LRM, RLM, LRE..RLO, LRI..PDI),
 * which can make a name shown to others read differently from what it is.
 */
export const hiddenCharacters = /[\p{Cc}\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/u;

export const personName = z
	.string({ error: 'Enter your name.' })
	.trim()
	.min(1, 'Enter your name.')
	.max(120, 'Use at most 120 characters.')
	.refine((s) => !hiddenCharacters.test(s), 'Use letters, spaces and punctuation only: no control or text-direction characters.');

export const signUpSchema = z.object({
	name: personName,
	email,
	/** Optional: without one, the person signs in by e-mail link. */
	password: z
		.string()
		.optional()
		.transform((s) => (s ? s : undefined))
		.pipe(newPassword.optional())
});

export const resetRequestSchema = z.object({ email });

export const resetPasswordSchema = z
	.object({ password: newPassword, confirm: z.string() })
	.refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });
