import type { Kysely } from 'kysely';

/**
 * Renewals of certificates and the product an order or seat is for.
 *
 * - renewal: a holder's renewal of one certificate: started (with the seat it used), then
 *   completed by the new certificate. At most one renewal per certificate (unique), so a
 *   double click or two tabs start one.
 * - course_order.product / seat.product: 'course' (the full course, as before) or 'renewal'
 *   (the shorter renewal path). Existing rows are course orders and seats.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('renewal')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('certificate_id', 'text', (c) => c.notNull().unique().references('certificate.id').onDelete('cascade'))
		.addColumn('user_id', 'text', (c) => c.notNull().references('User.id').onDelete('cascade'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('seat_id', 'text', (c) => c.references('seat.id'))
		.addColumn('started_at', 'text', (c) => c.notNull())
		.addColumn('completed_at', 'text')
		.addColumn('new_certificate_id', 'text', (c) => c.references('certificate.id'))
		.execute();
	await db.schema.createIndex('renewal_user_course_index').on('renewal').columns(['user_id', 'course_slug']).execute();

	await db.schema.alterTable('course_order').addColumn('product', 'text', (c) => c.notNull().defaultTo('course')).execute();
	await db.schema.alterTable('seat').addColumn('product', 'text', (c) => c.notNull().defaultTo('course')).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('seat').dropColumn('product').execute();
	await db.schema.alterTable('course_order').dropColumn('product').execute();
	await db.schema.dropTable('renewal').execute();
}
