import { hasRole, type Identity } from '$lib/roles';
import { db as defaultDb, type DB } from './db';

/** The holder, a registrar, or an admin of a company the holder belongs to. */
export async function mayDownload(user: Identity, certificate: { user_id: string }, db: DB = defaultDb): Promise<boolean> {
	if (certificate.user_id === user.id || hasRole(user, 'registrar')) return true;
	const adminOf = user.companies.filter((c) => c.role === 'admin').map((c) => c.id);
	if (adminOf.length === 0) return false;
	const member = await db
		.selectFrom('membership')
		.select('user_id')
		.where('user_id', '=', certificate.user_id)
		.where('company_id', 'in', adminOf)
		.executeTakeFirst();
	return !!member;
}
