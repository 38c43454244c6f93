import { Cron } from 'croner';
import { closeDueAttempts } from './attempts';
import { sweepEndedWindows } from './rate-limit';

/**
 * Jobs that run while the server is up. Closing due test attempts is idempotent (a guarded
 * update per attempt), so a second process running the same job closes nothing twice.
 */
export function startSchedules(): Cron[] {
	const closeDue = new Cron('*/1 * * * *', { protect: true, catch: (e) => console.error('Closing due test attempts failed:', e) }, async () => {
		const closed = await closeDueAttempts();
		if (closed > 0) console.log(`Closed ${closed} test attempt(s) past their time limit.`);
	});
	// Rate-limit windows in the main database (PostgreSQL only): deleting ended ones twice is harmless.
	const sweepLimits = new Cron('17 * * * *', { protect: true, catch: (e) => console.error('Sweeping rate-limit windows failed:', e) }, async () => {
		await sweepEndedWindows();
	});
	return [closeDue, sweepLimits];
}
