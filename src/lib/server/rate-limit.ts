import Database from 'better-sqlite3';
import { RateLimiterRes, RateLimiterSQLite } from 'rate-limiter-flexible';
import { apiError } from './api';
import { config } from './config';
import { ensureWritableDir } from './db/engine';

/**
 * Fixed-window rate limits kept by rate-limiter-flexible in a SQLite table of their own file
 * (`rate-limits.sqlite` under DATA_DIR): memory stays flat however many keys are counted, the
 * counts survive a restart, and several app processes on one machine share them. Expired rows
 * are swept by the library. Windows are kept per bucket ("sign-in-ip", "calc-api", ...) and
 * key (an address or a client address).
 */

let store: Database.Database | undefined;
const limiters = new Map<string, RateLimiterSQLite>();

function limitStore(): Database.Database {
	if (!store) {
		ensureWritableDir(config.dataDir);
		store = new Database(config.limitsFile);
		store.pragma('journal_mode = WAL');
		store.pragma(`busy_timeout = ${config.dbBusyTimeoutMs}`);
		store.pragma('synchronous = NORMAL');
	}
	return store;
}

/** Tests count in a database of their own (for example ':memory:'). */
export function useLimitStore(database: Database.Database): void {
	store = database;
	limiters.clear();
}

function limiter(bucket: string, limit: number, windowMs: number): RateLimiterSQLite {
	const points = limit;
	const duration = Math.max(1, Math.ceil(windowMs / 1000));
	const id = `${bucket}/${points}/${duration}`;
	let found = limiters.get(id);
	if (!found) {
		const storeClient = limitStore();
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

/** Counts one attempt; `ok` is false once `limit` attempts were made within `windowMs`. */
export async function hit(bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
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
	limitStore().prepare('delete from rate_limit where key = ?').run(`${bucket}:${key}`);
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
