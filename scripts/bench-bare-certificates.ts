/**
 * The yardstick for the certificate look-up: a bare `node:http` server answering
 * GET /certificates/<number> with the same indexed query and JSON fields as
 * GET /api/v1/certificates/<number>, over the same SQLite file (DB_FILE, opened read-only).
 */
import { createServer } from 'node:http';
import Database from 'better-sqlite3';

const db = new Database(process.env.DB_FILE!, { readonly: true });
const lookUp = db.prepare(
	`select c.number, c.holder_name, c.course_code, c.course_title, c.scope, c.diameter_min_mm, c.diameter_max_mm,
	        c.issued_on, c.expires_on, c.revoked_at, r.number as replaced_by
	   from certificate c left join certificate r on r.id = c.replaced_by_id where c.number = ?`
);

const server = createServer((req, res) => {
	const number = decodeURIComponent((req.url ?? '').split('/').pop() ?? '').toUpperCase();
	const row = lookUp.get(number) as Record<string, string | number | null> | undefined;
	const today = new Date().toISOString().slice(0, 10);
	const body = row
		? JSON.stringify({
				number: row.number,
				status: row.revoked_at ? 'revoked' : row.replaced_by ? 'replaced' : (row.expires_on as string) < today ? 'expired' : 'valid',
				holder: row.holder_name,
				course: { code: row.course_code, title: row.course_title },
				scope: row.scope,
				diameterRangeMm: [row.diameter_min_mm, row.diameter_max_mm],
				issuedOn: row.issued_on,
				expiresOn: row.expires_on
			})
		: JSON.stringify({ error: { code: 'not_found', message: 'No certificate has this number.' } });
	res.writeHead(row ? 200 : 404, { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) });
	res.end(body);
});
server.listen(Number(process.env.PORT || 0), '127.0.0.1');
