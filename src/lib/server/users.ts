import { db as defaultDb, type DB } from './db';
import { hashPassword, verifyPassword } from './passwords';

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
		image: null
	};
	await db.insertInto('User').values(user).execute();
	return { id: user.id, email: user.email, name: user.name };
}

/** Returns the user when the password matches, otherwise null (same answer for unknown e-mail). */
export async function checkPassword(email: string, password: string, db: DB = defaultDb) {
	const row = await db
		.selectFrom('User')
		.select(['id', 'email', 'name', 'passwordHash'])
		.where('email', '=', normaliseEmail(email))
		.executeTakeFirst();
	const ok = await verifyPassword(row?.passwordHash ?? null, password);
	return ok && row ? { id: row.id, email: row.email, name: row.name } : null;
}

export async function setPassword(userId: string, password: string, db: DB = defaultDb) {
	await db
		.updateTable('User')
		.set({ passwordHash: await hashPassword(password) })
		.where('id', '=', userId)
		.execute();
}

export function searchUsers(query: string, db: DB = defaultDb) {
	const pattern = `%${query.trim().toLowerCase()}%`;
	return db
		.selectFrom('User')
		.select(publicColumns)
		.where((eb) => eb.or([eb('email', 'like', pattern), eb(eb.fn('lower', ['name']), 'like', pattern)]))
		.orderBy('email')
		.limit(50)
		.execute();
}

export async function countPeople(db: DB = defaultDb): Promise<number> {
	const row = await db.selectFrom('User').select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
	return Number(row.n);
}
