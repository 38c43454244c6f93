import type { Kysely } from 'kysely';

/**
 * Trainer scope on the grant: `user_role.company_id` null means the training provider's own
 * trainer (works with everyone); a company id means that company's own trainer (works only
 * with that company's crew). Only trainer grants carry a company.
 *
 * Existing trainer grants migrate forward with least privilege: a trainer who belongs to
 * exactly one company is taken to be that company's trainer; every other trainer stays the
 * provider's. A registrar can change either in the people list.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('user_role')
		.addColumn('company_id', 'text', (c) => c.references('company.id').onDelete('cascade'))
		.execute();
	const single = db
		.selectFrom('membership')
		.select('membership.user_id')
		.groupBy('membership.user_id')
		.having((eb) => eb.fn.countAll(), '=', 1);
	await db
		.updateTable('user_role')
		.set((eb) => ({
			company_id: eb.selectFrom('membership').select('membership.company_id').whereRef('membership.user_id', '=', 'user_role.user_id').limit(1)
		}))
		.where('role', '=', 'trainer')
		.where('user_id', 'in', single)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('user_role').dropColumn('company_id').execute();
}
