import Database from 'better-sqlite3';
import { sql } from 'kysely';
import { errorAnswer, toResponse, type Answer } from './api';
import { config } from './config';
import { getDb, type DB } from './db';
import { ensureWritableDir } from './db/engine';

/**
 * Fixed-window rate limits, counted per bucket ("sign-in-ip", "calc-api", ...) and key (an
 * address or a client address), never in process memory, so every process behind a load
 * balancer enforces one limit. A hit is one upsert (a new window starts at 1 when the key has
 * none or its window ended, otherwise the count goes up by one), the same statement as
 * rate-limiter-flexible's SQL stores use, on a table `rate_limit_count (key, points, expire_ms)`:
 *
 * - SQLite (the default): in a database file of its own (`rate-limits.sqlite` under DATA_DIR),
 *   so counting never waits for the main database's write lock; shared by the processes on one
 *   machine and surviving a restart. The statement is prepared once and runs synchronously
 *   (about 20 µs), which matters on the public APIs, where every request is counted.
 * - PostgreSQL (`DATABASE_URL`): the same table in the main database, so processes on any
 *   number of machines share the counts.
 *
 * Ended windows are swept by the schedule (`sweepEndedWindows`); a hit restarts an ended window
 * anyway, so the sweep only bounds the table's size.
 */

interface SqliteStore {
	kind: 'sqlite';
	hit: Database.Statement<[string, number, number, number], { points: number; expire_ms: number }>;
	clear: Database.Statement<[string]>;
	sweep: Database.Statement<[number]>;
}
type Store = SqliteStore | { kind: 'database'; db: DB };

let store: Store | undefined;

function sqliteStore(sqlite: Database.Database): SqliteStore {
	sqlite.exec('create table if not exists rate_limit_count (key text primary key, points integer not null, expire_ms integer not null)');
	// the table rate-limiter-flexible kept before; its windows are a minute long, so nothing of value is lost
	sqlite.exec('drop table if exists rate_limit');
	return {
		kind: 'sqlite',
		hit: sqlite.prepare(
			`insert into rate_limit_count (key, points, expire_ms) values (?, 1, ?)
			 on conflict (key) do update set
			   points = case when rate_limit_count.expire_ms <= ? then 1 else rate_limit_count.points + 1 end,
			   expire_ms = case when rate_limit_count.expire_ms <= ? then excluded.expire_ms else rate_limit_count.expire_ms end
			 returning points, expire_ms`
		),
		clear: sqlite.prepare('delete from rate_limit_count where key = ?'),
		sweep: sqlite.prepare('delete from rate_limit_count where expire_ms <= ?')
	};
}

function limitStore(): Store {
	if (!store) {
		if (config.databaseUrl) {
			store = { kind: 'database', db: getDb() };
		} else {
			ensureWritableDir(config.dataDir);
			const sqlite = new Database(config.limitsFile);
			sqlite.pragma('journal_mode = WAL');
			sqlite.pragma(`busy_timeout = ${config.dbBusyTimeoutMs}`);
			sqlite.pragma('synchronous = NORMAL');
			store = sqliteStore(sqlite);
		}
	}
	return store;
}

/**
 * Tests count in a store of their own: a better-sqlite3 handle (for example ':memory:') or a
 * migrated app database (its `rate_limit_count` table, as on PostgreSQL).
 */
export function useLimitStore(database: Database.Database | DB): void {
	store = database instanceof Database ? sqliteStore(database) : { kind: 'database', db: database };
}

/** A fixed limit raised by RATE_LIMIT_FACTOR (the sign-in limits have settings of their own). */
export function scaledLimit(limit: number): number {
	return limit * config.rateLimitFactor;
}

export interface RateLimitResult {
	ok: boolean;
	retryAfterSeconds: number;
}

/** When a window that starts now ends: whole seconds, as the limits are stated. */
const windowEnd = (now: number, windowMs: number) => now + Math.max(1, Math.ceil(windowMs / 1000)) * 1000;

/**
 * One hit on the database table: a new window starts with 1 when the key has none or its window
 * ended; otherwise the count goes up by one. One statement, so concurrent hits from any number
 * of processes each count exactly once.
 */
async function hitTable(db: DB, bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
	const now = Date.now();
	const row = await db
		.insertInto('rate_limit_count')
		.values({ key: `${bucket}:${key}`, points: 1, expire_ms: windowEnd(now, windowMs) })
		.onConflict((oc) =>
			oc.column('key').doUpdateSet({
				points: sql<number>`case when rate_limit_count.expire_ms <= ${now} then 1 else rate_limit_count.points + 1 end`,
				expire_ms: sql<number>`case when rate_limit_count.expire_ms <= ${now} then excluded.expire_ms else rate_limit_count.expire_ms end`
			})
		)
		.returning(['points', 'expire_ms'])
		.executeTakeFirstOrThrow();
	return verdict(Number(row.points), Number(row.expire_ms), limit, now);
}

/** Removes windows that ended before `now` (the schedule runs it; a hit restarts an ended window anyway). */
export async function sweepEndedWindows(now = Date.now()): Promise<number> {
	const s = limitStore();
	if (s.kind === 'sqlite') return s.sweep.run(now).changes;
	const result = await s.db.deleteFrom('rate_limit_count').where('expire_ms', '<=', now).executeTakeFirst();
	return Number(result.numDeletedRows);
}

function verdict(points: number, expireMs: number, limit: number, now: number): RateLimitResult {
	if (points <= limit) return { ok: true, retryAfterSeconds: 0 };
	return { ok: false, retryAfterSeconds: Math.max(1, Math.ceil((expireMs - now) / 1000)) };
}

/** Counts one attempt; `ok` is false once `limit` attempts were made within `windowMs`. */
export async function hit(bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
	const s = limitStore();
	if (s.kind === 'database') return hitTable(s.db, bucket, key, limit, windowMs);
	const now = Date.now();
	const row = s.hit.get(`${bucket}:${key}`, windowEnd(now, windowMs), now, now)!;
	return verdict(row.points, row.expire_ms, limit, now);
}

/** Forgets one key's attempts in a bucket, for example after a successful sign-in. */
export async function clear(bucket: string, key: string): Promise<void> {
	const s = limitStore();
	if (s.kind === 'database') await s.db.deleteFrom('rate_limit_count').where('key', '=', `${bucket}:${key}`).execute();
	else s.clear.run(`${bucket}:${key}`);
}

/** Tests start from a clean slate: counts move to a fresh in-memory table. */
export function resetAll(): void {
	useLimitStore(new Database(':memory:'));
}

export interface ApiLimit {
	bucket: string;
	limit: number;
	windowMs: number;
}

/**
 * For public JSON APIs: counts a request from the client's address and answers 429 with
 * Retry-After once the window is used up; null while the request may go ahead.
 */
export async function limitAnswer(clientAddress: string, { bucket, limit, windowMs }: ApiLimit): Promise<Answer | null> {
	const verdict = await hit(bucket, clientAddress, scaledLimit(limit), windowMs);
	if (verdict.ok) return null;
	return {
		...errorAnswer(429, 'rate_limited', `Too many requests from this address. Try again in ${verdict.retryAfterSeconds} s.`),
		headers: { 'Retry-After': String(verdict.retryAfterSeconds) }
	};
}

/** `limitAnswer` for a SvelteKit route, as a Response. */
export async function refuseIfLimited(event: { getClientAddress(): string }, limit: ApiLimit): Promise<Response | null> {
	const refused = await limitAnswer(event.getClientAddress(), limit);
	return refused && toResponse(refused);
}
