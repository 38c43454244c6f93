import type { Kysely } from 'kysely';

/**
 * Orders paid through the payment service, the seats they grant, invitations that hand seats
 * to people, and the webhook events already applied (so a repeat delivery changes nothing).
 * Money is in the currency's minor unit (integer); times are UTC ISO strings.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('course_order')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('number', 'text', (c) => c.notNull().unique())
		.addColumn('buyer_id', 'text', (c) => c.notNull().references('User.id'))
		.addColumn('company_id', 'text', (c) => c.references('company.id'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('quantity', 'integer', (c) => c.notNull())
		.addColumn('unit_amount', 'integer', (c) => c.notNull())
		.addColumn('total_amount', 'integer', (c) => c.notNull())
		.addColumn('currency', 'text', (c) => c.notNull())
		.addColumn('state', 'text', (c) => c.notNull())
		.addColumn('checkout_session_id', 'text', (c) => c.unique())
		.addColumn('checkout_url', 'text')
		.addColumn('payment_intent_id', 'text', (c) => c.unique())
		.addColumn('refunded_quantity', 'integer', (c) => c.notNull())
		.addColumn('refunded_amount', 'integer', (c) => c.notNull())
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('paid_at', 'text')
		.addColumn('updated_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('course_order_buyer_index').on('course_order').column('buyer_id').execute();
	await db.schema.createIndex('course_order_company_index').on('course_order').column('company_id').execute();

	await db.schema
		.createTable('seat')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('order_id', 'text', (c) => c.notNull().references('course_order.id'))
		.addColumn('company_id', 'text', (c) => c.references('company.id'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('holder_id', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('assigned_at', 'text')
		.addColumn('used_at', 'text')
		.addColumn('refunded_at', 'text')
		.addColumn('created_at', 'text', (c) => c.notNull())
		.execute();
	await db.schema.createIndex('seat_company_course_index').on('seat').columns(['company_id', 'course_slug']).execute();
	await db.schema.createIndex('seat_order_index').on('seat').column('order_id').execute();
	await db.schema.createIndex('seat_holder_index').on('seat').columns(['holder_id', 'course_slug']).execute();

	await db.schema
		.createTable('invitation')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('token_hash', 'text', (c) => c.notNull().unique())
		.addColumn('company_id', 'text', (c) => c.notNull().references('company.id'))
		.addColumn('course_slug', 'text', (c) => c.notNull())
		.addColumn('email', 'text', (c) => c.notNull())
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('invited_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('created_at', 'text', (c) => c.notNull())
		.addColumn('expires_at', 'text', (c) => c.notNull())
		.addColumn('accepted_at', 'text')
		.addColumn('accepted_by', 'text', (c) => c.references('User.id').onDelete('set null'))
		.addColumn('withdrawn_at', 'text')
		.execute();
	await db.schema.createIndex('invitation_company_course_index').on('invitation').columns(['company_id', 'course_slug']).execute();

	await db.schema
		.createTable('payment_event')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('type', 'text', (c) => c.notNull())
		.addColumn('received_at', 'text', (c) => c.notNull())
		.addColumn('outcome', 'text', (c) => c.notNull())
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of ['payment_event', 'invitation', 'seat', 'course_order']) await db.schema.dropTable(table).execute();
}
