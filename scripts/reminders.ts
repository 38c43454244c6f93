/**
 * `npm run reminders [-- --now 2027-01-03T06:00:00Z]`: runs the expiry reminder job once, as
 * the server does at start-up and daily (src/lib/server/reminders.ts), against DATA_DIR's
 * database and SMTP_URL. `--now` moves the job's clock (for tests and rehearsals); reminders
 * already sent or claimed are never sent again, whatever the clock says.
 */
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { FileMigrationProvider, Migrator } from 'kysely';
import { getDb } from '../src/lib/server/db/index.ts';
import { sendDueReminders } from '../src/lib/server/reminders.ts';

function parseNow(args: string[]): Date {
	const i = args.findIndex((a) => a === '--now' || a.startsWith('--now='));
	if (i < 0) return new Date();
	const value = args[i].includes('=') ? args[i].slice(args[i].indexOf('=') + 1) : args[i + 1];
	const now = new Date(value ?? '');
	if (!value || Number.isNaN(now.getTime())) {
		console.error(`--now needs a date or time, such as 2027-01-03 or 2027-01-03T06:00:00Z (got ${JSON.stringify(value ?? '')}).`);
		process.exit(2);
	}
	return now;
}

const now = parseNow(process.argv.slice(2));
const db = getDb();
const migrator = new Migrator({
	db,
	provider: new FileMigrationProvider({ fs, path, migrationFolder: path.resolve(import.meta.dirname, '../migrations') }),
	allowUnorderedMigrations: true
});
const { error } = await migrator.migrateToLatest();
if (error) throw error;
const run = await sendDueReminders({ now });
console.log(`Expiry reminders for ${now.toISOString().slice(0, 10)}: ${run.sent} sent, ${run.skipped} already sent or claimed, ${run.failed} not sent.`);
await db.destroy();
process.exit(run.failed ? 1 : 0);
