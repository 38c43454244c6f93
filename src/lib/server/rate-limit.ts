import Database from 'better-sqlite3';
import { sql } from 'kysely';
import { RateLimiterRes, RateLimiterSQLite } from 'rate-limiter-flexible';
import { apiError } from './api';
import { config } from './config';
import { getDb, type DB } from './db';
import { ensureWritableDir } from './db/engine';

/**
 * Fixed-window rate limits, counted per bucket ("sign-in-ip", "calc-api", ...) and key (an
 * address or a client address), never in process memory, so every process behind a load
 * balancer enforces one limit:
 *
 * - SQLite (the default): rate-limiter-flexible in a SQLite table of its own file
 *   (`rate-limits.sqlite` under DATA_DIR), shared by the processes on one machine, surviving a
 *   restart, expired rows swept by the library;
 * - PostgreSQL (`DATABASE_URL`): table `rate_limit_count` in the main database, one atomic
 *   upsert per hit, so processes on any number of machines share the counts.
 */

type Store = { kind: 'sqlite'; sqlite: Database.Database } | { kind: 'database'; db: DB };

let store: Store | undefined;
const limiters = new Map<string, RateLimiterSQLite>();

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
			store = { kind: 'sqlite', sqlite };
		}
	}
	return store;
}

function sqliteStore(): Database.Database {
	const s = limitStore();
	if (s.kind !== 'sqlite') throw new Error('rate limits are kept in the main database');
	return s.sqlite;
}

/**
 * Tests count in a store of their own: a better-sqlite3 handle (for example ':memory:') or a
 * migrated app database (its `rate_limit_count` table, as on PostgreSQL).
 */
export function useLimitStore(database: Database.Database | DB): void {
	store = database instanceof Database ? { kind: 'sqlite', sqlite: database } : { kind: 'database', db: database };
	limiters.clear();
}

function limiter(bucket: string, limit: number, windowMs: number): RateLimiterSQLite {
	const points = limit;
	const duration = Math.max(1, Math.ceil(windowMs / 1000));
	const id = `${bucket}/${points}/${duration}`;
	let found = limiters.get(id);
	if (!found) {
		const storeClient = sqliteStore();
		storeClient.prepare('create table if not exists rate_limit (key text primary key, points integer not null default 0, expire integer)').run();
		found = new RateLimiterSQLite({
			storeClient,
			storeType: 'better-sqlite3',
			tableName: 'rate_limit',
			tableCreated: true,
			clearExpiredByTimeout: true,
			keyPrefix: bucket,
			points,
			duration
		});
		limiters.set(id, found);
	}
	return found;
}

/** A fixed limit raised by RATE_LIMIT_FACTOR (the sign-in limits have settings of their own). */
export function scaledLimit(limit: number): number {
	return limit * config.rateLimitFactor;
}

export interface RateLimitResult {
	ok: boolean;
	retryAfterSeconds: number;
}

/**
 * One hit on the database table: a new window starts with 1 when the key has none or its window
 * ended; otherwise the count goes up by one. One statement, so concurrent hits from any number
 * of processes each count exactly once.
 */
async function hitTable(db: DB, bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
	const now = Date.now();
	const windowEnd = now + Math.max(1, Math.ceil(windowMs / 1000)) * 1000;
	const row = await db
		.insertInto('rate_limit_count')
		.values({ key: `${bucket}:${key}`, points: 1, expire_ms: windowEnd })
		.onConflict((oc) =>
			oc.column('key').doUpdateSet({
				points: sql<number>`case when rate_limit_count.expire_ms <= ${now} then 1 else rate_limit_count.points + 1 end`,
				expire_ms: sql<number>`case when rate_limit_count.expire_ms <= ${now} then excluded.expire_ms else rate_limit_count.expire_ms end`
			})
		)
		.returning(['points', 'expire_ms'])
		.executeTakeFirstOrThrow();
	if (Number(row.points) <= limit) return { ok: true, retryAfterSeconds: 0 };
	return { ok: false, retryAfterSeconds: Math.max(1, Math.ceil((Number(row.expire_ms) - now) / 1000)) };
}

/** Removes windows that ended before `now` (the schedule runs it; a hit restarts an ended window anyway). */
export async function sweepEndedWindows(now = Date.now()): Promise<number> {
	const s = limitStore();
	if (s.kind !== 'database') return 0;
	const result = await s.db.deleteFrom('rate_limit_count').where('expire_ms', '<=', now).executeTakeFirst();
	return Number(result.numDeletedRows);
}

/** Counts one attempt; `ok` is false once `limit` attempts were made within `windowMs`. */
export async function hit(bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
	const s = limitStore();
	if (s.kind === 'database') return hitTable(s.db, bucket, key, limit, windowMs);
	try {
		await limiter(bucket, limit, windowMs).consume(key);
		return { ok: true, retryAfterSeconds: 0 };
	} catch (e) {
		if (e instanceof RateLimiterRes) return { ok: false, retryAfterSeconds: Math.max(1, Math.ceil(e.msBeforeNext / 1000)) };
		throw e;
	}
}

/** Forgets one key's attempts in a bucket, for example after a successful sign-in. */
export async function clear(bucket: string, key: string): Promise<void> {
	const s = limitStore();
	if (s.kind === 'database') await s.db.deleteFrom('rate_limit_count').where('key', '=', `${bucket}:${key}`).execute();
	else s.sqlite.prepare('delete from rate_limit where key = ?').run(`${bucket}:${key}`);
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
export async function refuseIfLimited(event: { getClientAddress(): string }, { bucket, limit, windowMs }: ApiLimit): Promise<Response | null> {
	const verdict = await hit(bucket, event.getClientAddress(), scaledLimit(limit), windowMs);
	if (verdict.ok) return null;
	return apiError(429, 'rate_limited', `Too many requests from this address. Try again in ${verdict.retryAfterSeconds} s.`, undefined, {
		headers: { 'Retry-After': String(verdict.retryAfterSeconds) }
	});
}
