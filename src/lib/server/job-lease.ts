import { randomBytes } from 'node:crypto';
import { hostname } from 'node:os';
import { db as defaultDb, type DB } from './db';
import { isDatabaseBusy, isUniqueViolation } from './db/errors';

/**
 * Scheduled jobs run once across processes: every process's timer fires, and the one that takes
 * the job's lease (a row in `job_lease`) runs it; the others skip this period. The lease is taken
 * with a guarded update (only a lease that has run out can be taken over) or, the first time, an
 * insert that the primary key lets only one process win. Both are single statements that hold on
 * SQLite and PostgreSQL alike (on PostgreSQL a racing UPDATE re-checks its WHERE against the
 * winner's row). Times are the app's clock in UTC ISO text; keep the processes' clocks in step.
 *
 * While the work runs, the holder renews the lease every third of `leaseMs`; a process that dies
 * stops renewing, and its lease runs out after at most `leaseMs`. When the work ends the lease is
 * kept until it runs out, so a process whose timer fires a little later in the same period finds
 * it taken: choose `leaseMs` shorter than the period and longer than the slowest expected run.
 */

/** This process, as named in `job_lease.holder` (host, pid and a random tag). */
const thisProcess = `${hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`;

export type ExclusiveOutcome<T> = { ran: true; result: T } | { ran: false; heldBy: string | null };

/** Tries once to take `jobName`'s lease for `holder`; true when taken. A busy database counts as "not now". */
export async function takeLease(jobName: string, holder: string, leaseMs: number, db: DB = defaultDb, now = new Date()): Promise<boolean> {
	const at = now.toISOString();
	const until = new Date(now.getTime() + leaseMs).toISOString();
	try {
		const takenOver = await db
			.updateTable('job_lease')
			.set({ holder, lease_until: until, taken_at: at })
			.where('job_name', '=', jobName)
			.where('lease_until', '<=', at)
			.executeTakeFirst();
		if (Number(takenOver.numUpdatedRows) === 1) return true;
		await db.insertInto('job_lease').values({ job_name: jobName, holder, lease_until: until, taken_at: at }).execute();
		return true;
	} catch (e) {
		if (isUniqueViolation(e) || isDatabaseBusy(e)) return false;
		throw e;
	}
}

/** Extends a lease this holder still has; false when it has lost it (ran out and taken over). */
export async function renewLease(jobName: string, holder: string, leaseMs: number, db: DB = defaultDb, now = new Date()): Promise<boolean> {
	const result = await db
		.updateTable('job_lease')
		.set({ lease_until: new Date(now.getTime() + leaseMs).toISOString() })
		.where('job_name', '=', jobName)
		.where('holder', '=', holder)
		.executeTakeFirst();
	return Number(result.numUpdatedRows) === 1;
}

/** Who holds a job's lease now, if anyone. */
export async function leaseHolder(jobName: string, db: DB = defaultDb, now = new Date()): Promise<string | null> {
	const row = await db.selectFrom('job_lease').select(['holder', 'lease_until']).where('job_name', '=', jobName).executeTakeFirst();
	return row && row.lease_until > now.toISOString() ? row.holder : null;
}

/**
 * Runs `work` only if this call takes `jobName`'s lease; otherwise returns `{ ran: false }` at
 * once. The signal passed to `work` aborts if the lease is lost while it runs (the database was
 * unreachable for longer than the lease), so long jobs can stop between steps. Must be called
 * outside a transaction: the lease has to be visible to other processes as soon as it is taken.
 */
export async function runExclusive<T>(jobName: string, leaseMs: number, work: (signal: AbortSignal) => Promise<T>, db: DB = defaultDb): Promise<ExclusiveOutcome<T>> {
	if (db.isTransaction) throw new Error('runExclusive must be called outside a transaction');
	if (!Number.isInteger(leaseMs) || leaseMs < 100) throw new Error('leaseMs must be a whole number of at least 100');
	const holder = `${thisProcess}:${randomBytes(4).toString('hex')}`;
	if (!(await takeLease(jobName, holder, leaseMs, db))) return { ran: false, heldBy: await leaseHolder(jobName, db).catch(() => null) };

	const lost = new AbortController();
	let renewing: Promise<unknown> = Promise.resolve();
	const timer = setInterval(() => {
		renewing = renewLease(jobName, holder, leaseMs, db).then(
			(held) => {
				if (!held && !lost.signal.aborted) {
					console.error(`Job ${jobName}: lease lost while running (another process took it over).`);
					lost.abort(new Error(`Lease on ${jobName} lost`));
				}
			},
			() => {
				// busy or unreachable: try again at the next tick; the lease outlasts two missed renewals
			}
		);
	}, Math.max(50, Math.floor(leaseMs / 3)));
	timer.unref();
	try {
		return { ran: true, result: await work(lost.signal) };
	} finally {
		clearInterval(timer);
		await renewing;
	}
}
