// A throwaway PostgreSQL server for the tests, from Debian's `postgresql` package (installed by
// scripts/install-test-deps.mjs when run as root): a fresh cluster in a temp folder, trust
// authentication on 127.0.0.1 only, on PG_TEST_PORT (default 55432), never the system's own
// instance. As root the server runs as the `postgres` user (PostgreSQL refuses to run as root).
//
//   node scripts/postgres-server.mjs start   prints the URL (postgres://postgres@127.0.0.1:PORT/postgres)
//   node scripts/postgres-server.mjs stop
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

export const port = Number(process.env.PG_TEST_PORT || 55432);
const dir = path.join(os.tmpdir(), `pg-wt-${port}`);
const data = path.join(dir, 'data');
const isRoot = process.getuid?.() === 0;

/** The folder with initdb and pg_ctl of the newest installed PostgreSQL, or null. */
export function binDir() {
	const base = '/usr/lib/postgresql';
	if (!fs.existsSync(base)) return null;
	const versions = fs.readdirSync(base).filter((v) => /^\d+$/.test(v)).sort((a, b) => Number(b) - Number(a));
	for (const v of versions) {
		const bin = path.join(base, v, 'bin');
		if (fs.existsSync(path.join(bin, 'pg_ctl')) && fs.existsSync(path.join(bin, 'initdb'))) return bin;
	}
	return null;
}

function asServerUser(command, args) {
	const full = isRoot ? ['runuser', ['-u', 'postgres', '--', command, ...args]] : [command, args];
	return execFileSync(full[0], full[1], { stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8' });
}

export const url = `postgres://postgres@127.0.0.1:${port}/postgres`;

/** Starts a fresh server; returns its URL, or null (with the reason on stderr) when none can run here. */
export function start() {
	const bin = binDir();
	if (!bin) {
		console.error('No PostgreSQL server installed (Debian package postgresql; installed by npm run test:setup as root).');
		return null;
	}
	stop();
	fs.rmSync(dir, { recursive: true, force: true });
	fs.mkdirSync(data, { recursive: true });
	if (isRoot) execFileSync('chown', ['-R', 'postgres:postgres', dir]);
	asServerUser(path.join(bin, 'initdb'), ['-D', data, '-U', 'postgres', '-A', 'trust', '-E', 'UTF8', '--locale=C.UTF-8', '--no-sync']);
	asServerUser(path.join(bin, 'pg_ctl'), [
		'start', '-D', data, '-w', '-t', '60', '-l', path.join(dir, 'server.log'),
		'-o', `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=300`
	]);
	return url;
}

export function stop() {
	const bin = binDir();
	if (!bin || !fs.existsSync(path.join(data, 'postmaster.pid'))) return;
	try {
		asServerUser(path.join(bin, 'pg_ctl'), ['stop', '-D', data, '-m', 'fast', '-w']);
	} catch (e) {
		console.error(`Stopping the test PostgreSQL server: ${e.message}`);
	}
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
	const what = process.argv[2];
	if (what === 'start') {
		const started = start();
		if (!started) process.exit(1);
		console.log(started);
	} else if (what === 'stop') {
		stop();
		fs.rmSync(dir, { recursive: true, force: true });
	} else {
		console.error('usage: node scripts/postgres-server.mjs start|stop');
		process.exit(2);
	}
}
