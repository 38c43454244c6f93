import { db as defaultDb, inTransaction, type DB } from './db';
import { isUniqueViolation } from './db/errors';
import { hashPassword, verifyPassword } from './passwords';
import { containsText } from './db/engine';

/** E-mail addresses are compared lower-cased and trimmed everywhere. */
export function normaliseEmail(email: string): string {
	return email.trim().toLowerCase();
}

/** Columns safe to hand to pages: never the password hash. */
const publicColumns = ['id', 'name', 'email', 'emailVerified', 'createdAt'] as const;

export function findUserByEmail(email: string, db: DB = defaultDb) {
	return db
		.selectFrom('User')
		.select(publicColumns)
		.where('email', '=', normaliseEmail(email))
		.executeTakeFirst();
}

export function findUserById(id: string, db: DB = defaultDb) {
	return db.selectFrom('User').select(publicColumns).where('id', '=', id).executeTakeFirst();
}

export class EmailTakenError extends Error {
	constructor() {
		super('An account with this e-mail address already exists.');
	}
}

export async function createUser(
	input: { email: string; name: string; password?: string; emailVerified?: boolean },
	db: DB = defaultDb
) {
	const email = normaliseEmail(input.email);
	if (await findUserByEmail(email, db)) throw new EmailTakenError();
	const user = {
		id: crypto.randomUUID(),
		email,
		name: input.name.trim(),
		passwordHash: input.password ? await hashPassword(input.password) : null,
		emailVerified: input.emailVerified ? new Date().toISOString() : null,
		image: null,
		createdAt: new Date().toISOString()
	};
	try {
		await db.insertInto('User').values(user).execute();
	} catch (e) {
		// Two requests for the same address at once (a double click): the second finds it taken.
		if (isUniqueViolation(e)) throw new EmailTakenError();
		throw e;
	}
	return { id: user.id, email: user.email, name: user.name };
}

/**
 * Sign-up. A new address gets an account whose password (if any) is unusable until the address
 * is confirmed by an e-mailed link. An address with an account that was never confirmed is
 * taken over by the newest sign-up, since nobody has proved it theirs yet; a confirmed one is
 * refused with EmailTakenError. Racing requests for one address answer as one.
 */
export async function signUp(input: { email: string; name: string; password?: string }, db: DB = defaultDb) {
	const email = normaliseEmail(input.email);
	const passwordHash = input.password ? await hashPassword(input.password) : null;
	for (let attempt = 0; ; attempt++) {
		try {
			return await inTransaction(db, async (trx) => {
				const existing = await trx.selectFrom('User').select(['id', 'emailVerified']).where('email', '=', email).executeTakeFirst();
				if (existing?.emailVerified) throw new EmailTakenError();
				if (existing) {
					await trx.updateTable('User').set({ name: input.name.trim(), passwordHash }).where('id', '=', existing.id).execute();
					return { id: existing.id, email, isNew: false };
				}
				const id = crypto.randomUUID();
				await trx.insertInto('User').values({ id, email, name: input.name.trim(), passwordHash, emailVerified: null, image: null, createdAt: new Date().toISOString() }).execute();
				return { id, email, isNew: true };
			});
		} catch (e) {
			if (attempt === 0 && isUniqueViolation(e)) continue;
			throw e;
		}
	}
}

export type PasswordCheck =
	| { outcome: 'ok'; user: { id: string; email: string; name: string | null } }
	| { outcome: 'wrong' }
	| { outcome: 'unconfirmed' };

/**
 * Checks a password (the same work for an unknown address). A right password on an account
 * whose address is not confirmed yet does not sign in.
 */
export async function checkPassword(email: string, password: string, db: DB = defaultDb): Promise<PasswordCheck> {
	const row = await db
		.selectFrom('User')
		.select(['id', 'email', 'name', 'passwordHash', 'emailVerified'])
		.where('email', '=', normaliseEmail(email))
		.executeTakeFirst();
	const ok = await verifyPassword(row?.passwordHash ?? null, password);
	if (!ok || !row) return { outcome: 'wrong' };
	if (!row.emailVerified) return { outcome: 'unconfirmed' };
	return { outcome: 'ok', user: { id: row.id, email: row.email, name: row.name } };
}

/** A password set before the address was confirmed is forgotten when the address is confirmed by a sign-in link. */
export async function dropUnconfirmedPassword(userId: string, db: DB = defaultDb): Promise<void> {
	await db.updateTable('User').set({ passwordHash: null }).where('id', '=', userId).where('emailVerified', 'is', null).execute();
}

export function searchUsers(query: string, db: DB = defaultDb) {
	const text = query.trim();
	return db
		.selectFrom('User')
		.select(publicColumns)
		.where((eb) => eb.or([containsText(eb, eb.ref('email'), text), containsText(eb, eb.ref('name'), text)]))
		.orderBy('email')
		.limit(50)
		.execute();
}

export async function countPeople(db: DB = defaultDb): Promise<number> {
	const row = await db.selectFrom('User').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
	return Number(row.n);
}
