import { createHash, randomBytes } from 'node:crypto';
import { recordAudit } from './audit';
import { db as defaultDb, inTransaction, type DB } from './db';
import { sendMail } from './mail';
import { hashPassword } from './passwords';
import { endAllSessions } from './sessions';
import { findUserByEmail } from './users';

const LIFETIME_MS = 60 * 60 * 1000;

/** Only the hash of a reset token is stored, so a copy of the database cannot be used to reset. */
const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/**
 * Sends a reset link when the address belongs to an account. Answers the same either way,
 * so the form cannot be used to find out who has an account. Only the newest link works.
 */
export async function requestPasswordReset(email: string, origin: string, db: DB = defaultDb): Promise<void> {
	const user = await findUserByEmail(email, db);
	if (!user) return;
	const token = randomBytes(32).toString('base64url');
	await inTransaction(db, async (trx) => {
		await trx.deleteFrom('password_reset').where('user_id', '=', user.id).where('used_at', 'is', null).execute();
		await trx
			.insertInto('password_reset')
			.values({ token_hash: hashToken(token), user_id: user.id, expires_at: new Date(Date.now() + LIFETIME_MS).toISOString(), used_at: null })
			.execute();
	});
	await sendMail({
		to: user.email,
		subject: 'Reset your Patchwright password',
		paragraphs: [
			`Hello ${user.name ?? ''}`.trim() + ',',
			'We received a request to reset the password of your Patchwright account. The link below lets you choose a new one. It works once and expires in one hour; only the newest link works.'
		],
		action: { label: 'Choose a new password', url: `${origin}/reset-password/${token}` },
		footnote: 'If you did not ask for this, ignore this message: your password stays as it is.'
	});
}

export async function isResetTokenUsable(token: string, db: DB = defaultDb): Promise<boolean> {
	const row = await db
		.selectFrom('password_reset')
		.select(['expires_at', 'used_at'])
		.where('token_hash', '=', hashToken(token))
		.executeTakeFirst();
	return !!row && !row.used_at && row.expires_at > new Date().toISOString();
}

/**
 * Sets the new password and spends the token; false when the token is unknown, used or expired.
 * The link proved the address, so it counts as confirmed. Every other reset or sign-in link
 * and every session of the person end with it: whoever knew the old password is out.
 */
export async function resetPassword(token: string, password: string, db: DB = defaultDb): Promise<boolean> {
	const passwordHash = await hashPassword(password);
	return inTransaction(db, async (trx) => {
		const now = new Date().toISOString();
		const row = await trx
			.updateTable('password_reset')
			.set({ used_at: now })
			.where('token_hash', '=', hashToken(token))
			.where('used_at', 'is', null)
			.where('expires_at', '>', now)
			.returning('user_id')
			.executeTakeFirst();
		if (!row) return false;
		await trx.deleteFrom('password_reset').where('user_id', '=', row.user_id).where('used_at', 'is', null).execute();
		const user = await trx
			.updateTable('User')
			.set({ passwordHash })
			.where('id', '=', row.user_id)
			.returning(['email', 'emailVerified'])
			.executeTakeFirstOrThrow();
		if (!user.emailVerified) await trx.updateTable('User').set({ emailVerified: now }).where('id', '=', row.user_id).execute();
		await trx.deleteFrom('VerificationToken').where('identifier', '=', user.email).execute();
		await trx.deleteFrom('address_confirmation').where('user_id', '=', row.user_id).execute();
		await endAllSessions(row.user_id, 'password-reset', trx);
		await recordAudit({ actorId: row.user_id, action: 'password.reset', subjectType: 'user', subjectId: row.user_id }, trx);
		return true;
	});
}
