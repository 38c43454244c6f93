import { json } from '@sveltejs/kit';
import { sql } from 'kysely';
import { db } from '$lib/server/db';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	await sql`select 1`.execute(db);
	return json({ ok: true });
};
