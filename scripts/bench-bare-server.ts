/**
 * The yardstick for the HTTP benchmark: a bare `node:http` server that answers each request
 * with one better-sqlite3 point lookup over 100,000 rows, as JSON. What the app reaches is
 * reported as a share of what this reaches on the same machine in the same run.
 * Started by scripts/bench-http.ts as a child process; prints `listening <port>` when ready.
 */
import { createServer } from 'node:http';
import Database from 'better-sqlite3';

const ROWS = 100_000;
const db = new Database(':memory:');
db.exec('create table item (id integer primary key, name text not null, size_mm integer not null)');
const insert = db.prepare('insert into item (id, name, size_mm) values (?, ?, ?)');
db.transaction(() => {
	for (let i = 1; i <= ROWS; i++) insert.run(i, `item ${i}`, 100 + (i % 500));
})();
const byId = db.prepare('select id, name, size_mm from item where id = ?');

const server = createServer((req, res) => {
	const id = Number((req.url ?? '').split('/').pop()) || 1;
	const body = JSON.stringify(byId.get(id) ?? null);
	res.writeHead(200, { 'content-type': 'application/json', 'content-length': Buffer.byteLength(body) });
	res.end(body);
});
server.listen(Number(process.env.PORT || 0), '127.0.0.1', () => {
	const address = server.address();
	console.log(`listening ${typeof address === 'object' && address ? address.port : ''}`);
});
