import { createHash, randomBytes } from 'node:crypto';
import { recordAudit } from './audit';
import { db as defaultDb, inTransaction, type DB } from './db';
import { sendMail } from './mail';

/**
 * An account created with a password can sign in with it only once the address is confirmed
 * through a link sent to it, so nobody can claim someone else's address with a password of
 * their own. Only a hash of each link's token is stored; only the newest link works.
 */

const LIFETIME_MS = 24 * 60 * 60 * 1000;
const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export async function sendAddressConfirmation(user: { id: string; email: string }, origin: string, db: DB = defaultDb): Promise<void> {
	const token = randomBytes(32).toString('base64url');
	await inTransaction(db, async (trx) => {
		await trx.deleteFrom('address_confirmation').where('user_id', '=', user.id).execute();
		await trx
			.insertInto('address_confirmation')
			.values({ token_hash: hashToken(token), user_id: user.id, expires_at: new Date(Date.now() + LIFETIME_MS).toISOString(), used_at: null })
			.execute();
	});
	await sendMail({
		to: user.email,
		subject: 'Confirm your address for Patchwright',
		paragraphs: [
			'Someone (we hope you) created a Patchwright account with this e-mail address and a password.',
			'The password works once you confirm that this address is yours with the link below. The link works once and expires in 24 hours.'
		],
		action: { label: 'Confirm my address', url: `${origin}/sign-up/confirm/${token}` },
		footnote: 'If you did not create this account, ignore this message: without your confirmation nobody can sign in with that password.'
	});
}

export async function isConfirmationUsable(token: string, db: DB = defaultDb): Promise<boolean> {
	const row = await db
		.selectFrom('address_confirmation')
		.select(['expires_at', 'used_at'])
		.where('token_hash', '=', hashToken(token))
		.executeTakeFirst();
	return !!row && !row.used_at && row.expires_at > new Date().toISOString();
}

/** Confirms the address behind a link; the account's id, or null when the link is unknown, used or expired. */
export async function confirmAddress(token: string, db: DB = defaultDb): Promise<string | null> {
	return inTransaction(db, async (trx) => {
		const now = new Date().toISOString();
		const row = await trx
			.updateTable('address_confirmation')
			.set({ used_at: now })
			.where('token_hash', '=', hashToken(token))
			.where('used_at', 'is', null)
			.where('expires_at', '>', now)
			.returning('user_id')
			.executeTakeFirst();
		if (!row) return null;
		await trx.updateTable('User').set({ emailVerified: now }).where('id', '=', row.user_id).where('emailVerified', 'is', null).execute();
		await recordAudit({ actorId: row.user_id, action: 'user.address-confirmed', subjectType: 'user', subjectId: row.user_id }, trx);
		return row.user_id;
	});
}
