import { Cron } from 'croner';
import { closeDueAttempts } from './attempts';
import { runExclusive } from './job-lease';
import { sweepEndedWindows } from './rate-limit';

/**
 * Jobs that run while the server is up. Every process keeps the timers; each run takes the job's
 * lease first (job-lease.ts), so with several processes on one database one of them runs it per
 * period. The lease is shorter than the period and longer than a run.
 */
export function startSchedules(): Cron[] {
	const closeDue = new Cron('*/1 * * * *', { protect: true, catch: (e) => console.error('Closing due test attempts failed:', e) }, async () => {
		const outcome = await runExclusive('close-due-attempts', 50_000, () => closeDueAttempts());
		if (outcome.ran && outcome.result > 0) console.log(`Closed ${outcome.result} test attempt(s) past their time limit.`);
	});
	// Rate-limit windows in the main database (PostgreSQL only): deleting ended ones twice is harmless.
	const sweepLimits = new Cron('17 * * * *', { protect: true, catch: (e) => console.error('Sweeping rate-limit windows failed:', e) }, async () => {
		await runExclusive('sweep-rate-limit-windows', 50 * 60_000, () => sweepEndedWindows());
	});
	return [closeDue, sweepLimits];
}
