/**
 * A separate process that takes a job lease and holds it until killed (tests/unit/job-lease.test.ts).
 * Usage: node --import jiti/register tests/helpers/lease-holder.ts <sqlite file> <job> <lease ms>
 */
import { openDatabase } from '../../src/lib/server/db/engine';
import { runExclusive } from '../../src/lib/server/job-lease';

const [file, job, leaseMs] = process.argv.slice(2);
const db = openDatabase(file);
// keeps the process alive while the work below waits forever (the lease's own timer does not)
setInterval(() => {}, 60_000);
const outcome = await runExclusive(job, Number(leaseMs), async () => {
	console.log('holding');
	await new Promise(() => {});
}, db);
if (!outcome.ran) {
	console.log(`not taken: held by ${outcome.heldBy}`);
	process.exit(0);
}
