import { Cron } from 'croner';
import { closeDueAttempts } from './attempts';
import { runExclusive } from './job-lease';
import { sendDueReminders } from './reminders';
import { sweepEndedWindows } from './rate-limit';

/**
 * Jobs that run while the server is up. Every process keeps the timers; each run takes the job's
 * lease first (job-lease.ts), so with several processes on one database one of them runs it per
 * period. The lease is shorter than the period and longer than a run. Expiry reminders also
 * claim each message in the database before sending it (see reminders.ts), so a run that
 * overlaps another still sends each reminder once; they run at start-up (catching up after
 * downtime) and daily.
 */
export function startSchedules(): Cron[] {
	const closeDue = new Cron('*/1 * * * *', { protect: true, catch: (e) => console.error('Closing due test attempts failed:', e) }, async () => {
		const outcome = await runExclusive('close-due-attempts', 50_000, () => closeDueAttempts());
		if (outcome.ran && outcome.result > 0) console.log(`Closed ${outcome.result} test attempt(s) past their time limit.`);
	});
	const reminders = new Cron('15 6 * * *', { protect: true, timezone: 'UTC', catch: (e) => console.error('Sending expiry reminders failed:', e) }, runReminders);
	// at start-up too, a moment after the server is listening
	setTimeout(() => {
		if (!reminders.isStopped()) void reminders.trigger();
	}, 2_000).unref?.();
	// Rate-limit windows in the main database (PostgreSQL only): deleting ended ones twice is harmless.
	const sweepLimits = new Cron('17 * * * *', { protect: true, catch: (e) => console.error('Sweeping rate-limit windows failed:', e) }, async () => {
		await runExclusive('sweep-rate-limit-windows', 50 * 60_000, () => sweepEndedWindows());
	});
	return [closeDue, reminders, sweepLimits];
}

async function runReminders(): Promise<void> {
	const outcome = await runExclusive('expiry-reminders', 30 * 60_000, () => sendDueReminders());
	if (!outcome.ran) return;
	const run = outcome.result;
	if (run.sent || run.failed) console.log(`Expiry reminders: ${run.sent} sent, ${run.failed} not sent (retried next run).`);
}
