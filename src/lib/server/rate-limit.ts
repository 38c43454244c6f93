import Database from 'better-sqlite3';
import { sql } from 'kysely';
import { rateLimitedAnswer, toResponse, whenReady, type Answer } from './api';
import { config } from './config';
import { getDb, type DB } from './db';
import { ensureWritableDir } from './db/engine';

/**
 * Fixed-window rate limits, counted per bucket ("sign-in-ip", "calc-api", ...) and key (an
 * address or a client address) in a table, so every process behind a load balancer enforces
 * one limit and a restart forgets nothing (the public APIs take their points in blocks, see
 * `reservingCounter`; what a process holds in memory is bounded and never more than the table
 * granted). A hit is one upsert (a new window starts at 1 when the key has
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
	take: Database.Statement<[string, number, number, number, number, number], { points: number; expire_ms: number }>;
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
		take: sqlite.prepare(
			`insert into rate_limit_count (key, points, expire_ms) values (?, ?, ?)
			 on conflict (key) do update set
			   points = case when rate_limit_count.expire_ms <= ? then excluded.points else rate_limit_count.points + ? end,
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
	apiCounter.reset();
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

interface Taken {
	/** Points used in the key's window, these included. */
	points: number;
	expireMs: number;
}

/**
 * Takes `n` points from a key's count: a new window starts at `n` when the key has none or its
 * window ended; otherwise the count goes up by `n`. One statement, so concurrent hits from any
 * number of processes each count exactly once.
 */
async function take(bucket: string, key: string, n: number, windowMs: number, now: number): Promise<Taken> {
	const s = limitStore();
	const id = `${bucket}:${key}`;
	const end = windowEnd(now, windowMs);
	if (s.kind === 'sqlite') {
		const row = s.take.get(id, n, end, now, n, now)!;
		return { points: row.points, expireMs: row.expire_ms };
	}
	const row = await s.db
		.insertInto('rate_limit_count')
		.values({ key: id, points: n, expire_ms: end })
		.onConflict((oc) =>
			oc.column('key').doUpdateSet({
				points: sql<number>`case when rate_limit_count.expire_ms <= ${now} then excluded.points else rate_limit_count.points + ${n} end`,
				expire_ms: sql<number>`case when rate_limit_count.expire_ms <= ${now} then excluded.expire_ms else rate_limit_count.expire_ms end`
			})
		)
		.returning(['points', 'expire_ms'])
		.executeTakeFirstOrThrow();
	return { points: Number(row.points), expireMs: Number(row.expire_ms) };
}

/** Removes windows that ended before `now` (the schedule runs it; a hit restarts an ended window anyway). */
export async function sweepEndedWindows(now = Date.now()): Promise<number> {
	const s = limitStore();
	if (s.kind === 'sqlite') return s.sweep.run(now).changes;
	const result = await s.db.deleteFrom('rate_limit_count').where('expire_ms', '<=', now).executeTakeFirst();
	return Number(result.numDeletedRows);
}

const refusal = (expireMs: number, now: number): RateLimitResult => ({ ok: false, retryAfterSeconds: Math.max(1, Math.ceil((expireMs - now) / 1000)) });
const ALLOWED: RateLimitResult = { ok: true, retryAfterSeconds: 0 };

/** Counts one attempt; `ok` is false once `limit` attempts were made within `windowMs`. */
export async function hit(bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> {
	const now = Date.now();
	const taken = await take(bucket, key, 1, windowMs, now);
	return taken.points <= limit ? ALLOWED : refusal(taken.expireMs, now);
}

/** Points a process took from the shared count ahead of use, for one bucket and key. */
interface Reservation {
	/** Points taken and not yet used. */
	left: number;
	/** The end of the shared window the points belong to. */
	expireMs: number;
	/** The shared count had nothing left: refused until `expireMs`. */
	refused: boolean;
}

const MAX_RESERVATIONS = 10_000;
/** A process takes a twentieth of a limit at a time (one point for limits under 20). */
const BLOCKS_PER_LIMIT = 20;

/** A verdict now when it can be given without waiting, otherwise a promise of one. */
export type Counter = (bucket: string, key: string, limit: number, windowMs: number) => RateLimitResult | Promise<RateLimitResult>;

/**
 * A counter for the public APIs, where every request is counted: like `hit`, but it takes
 * points from the shared count in blocks of limit / 20 and spends them in this process, so a
 * busy client costs one write per block instead of one per request. The limit still holds
 * across processes: no process is given more than the shared count has left, so all of them
 * together admit at most `limit` in a window. Points a process took and did not use count as
 * used, so with P processes a client may be refused up to (P - 1) blocks early (5 % of the
 * limit each). A refusal is remembered until the window ends, which is exact for a fixed window.
 * Memory is bounded: past `maxKeys` the oldest reservation is dropped, leaving its points unused.
 */
export function reservingCounter(maxKeys = MAX_RESERVATIONS): { hit: Counter; forget(bucket: string, key: string): void; reset(): void } {
	const reservations = new Map<string, Reservation>();
	// one refill per key at a time: requests arriving meanwhile wait for it and share its points
	const refills = new Map<string, Promise<void>>();
	const refill = async (id: string, bucket: string, key: string, limit: number, windowMs: number) => {
		const block = Math.max(1, Math.floor(limit / BLOCKS_PER_LIMIT));
		const taken = await take(bucket, key, block, windowMs, Date.now());
		const granted = Math.max(0, Math.min(block, limit - (taken.points - block)));
		reservations.delete(id);
		if (reservations.size >= maxKeys) reservations.delete(reservations.keys().next().value!);
		reservations.set(id, { left: granted, expireMs: taken.expireMs, refused: granted === 0 });
	};
	/** The verdict this process can give from the points it holds, or undefined when it must ask the table. */
	const fromHeld = (id: string, now: number): RateLimitResult | undefined => {
		const held = reservations.get(id);
		if (!held || held.expireMs <= now) return undefined;
		if (held.left > 0) {
			held.left--;
			return ALLOWED;
		}
		return held.refused ? refusal(held.expireMs, now) : undefined;
	};
	const afterRefill = async (id: string, bucket: string, key: string, limit: number, windowMs: number): Promise<RateLimitResult> => {
		for (;;) {
			let pending = refills.get(id);
			if (!pending) {
				pending = refill(id, bucket, key, limit, windowMs).finally(() => refills.delete(id));
				refills.set(id, pending);
			}
			await pending;
			const verdict = fromHeld(id, Date.now());
			if (verdict) return verdict;
		}
	};
	return {
		// Synchronous while the process holds points for the key (almost every request), so a
		// busy public API pays for no promise here.
		hit(bucket, key, limit, windowMs) {
			const id = `${bucket}:${key}`;
			return fromHeld(id, Date.now()) ?? afterRefill(id, bucket, key, limit, windowMs);
		},
		forget: (bucket, key) => void reservations.delete(`${bucket}:${key}`),
		reset: () => reservations.clear()
	};
}

const apiCounter = reservingCounter();

/** This process's reserving counter (see `reservingCounter`), for the public APIs' limits. */
export const hitReserving: Counter = apiCounter.hit;

/** Forgets one key's attempts in a bucket, for example after a successful sign-in. */
export async function clear(bucket: string, key: string): Promise<void> {
	apiCounter.forget(bucket, key);
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
 * Retry-After once the window is used up; null while the request may go ahead. Given at once
 * (no promise) while this process holds points for the address.
 */
export function limitAnswer(clientAddress: string, { bucket, limit, windowMs }: ApiLimit): Answer | null | Promise<Answer | null> {
	return whenReady(hitReserving(bucket, clientAddress, scaledLimit(limit), windowMs), answerFor);
}

function answerFor(verdict: RateLimitResult): Answer | null {
	if (verdict.ok) return null;
	return rateLimitedAnswer(verdict.retryAfterSeconds, `Too many requests from this address. Try again in ${verdict.retryAfterSeconds} s.`);
}

/** `limitAnswer` for a SvelteKit route, as a Response. */
export async function refuseIfLimited(event: { getClientAddress(): string }, limit: ApiLimit): Promise<Response | null> {
	const refused = await limitAnswer(event.getClientAddress(), limit);
	return refused && toResponse(refused);
}
