import { Cron } from 'croner';
import { closeDueAttempts } from './attempts';
import { sendDueReminders } from './reminders';

/**
 * Jobs that run while the server is up. Closing due test attempts is idempotent (a guarded
 * update per attempt), so a second process running the same job closes nothing twice. Expiry
 * reminders claim each message in the database before sending it (see reminders.ts), so they
 * run at start-up (catching up after downtime) and daily, in any number of processes.
 */
export function startSchedules(): Cron[] {
	const closeDue = new Cron('*/1 * * * *', { protect: true, catch: (e) => console.error('Closing due test attempts failed:', e) }, async () => {
		const closed = await closeDueAttempts();
		if (closed > 0) console.log(`Closed ${closed} test attempt(s) past their time limit.`);
	});
	const reminders = new Cron('15 6 * * *', { protect: true, timezone: 'UTC', catch: (e) => console.error('Sending expiry reminders failed:', e) }, runReminders);
	// at start-up too, a moment after the server is listening
	setTimeout(() => reminders.trigger(), 2_000).unref?.();
	return [closeDue, reminders];
}

async function runReminders(): Promise<void> {
	const run = await sendDueReminders();
	if (run.sent || run.failed) console.log(`Expiry reminders: ${run.sent} sent, ${run.failed} not sent (retried next run).`);
}
