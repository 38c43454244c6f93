import { Migrator, type Kysely, type Migration, type MigrationProvider } from 'kysely';

/**
 * Migrations are bundled with the app through Vite's glob import, so the same list runs
 * in `vite dev`, in the built server and in vitest (a file provider breaks once bundled).
 */
const modules = import.meta.glob<Migration>('/migrations/*.ts', { eager: true });

export const bundledMigrations: MigrationProvider = {
	async getMigrations() {
		const migrations: Record<string, Migration> = {};
		for (const [path, migration] of Object.entries(modules)) {
			const name = path.split('/').pop()!.replace(/\.ts$/, '');
			migrations[name] = migration;
		}
		return migrations;
	}
};

/**
 * Brings the schema to the newest migration; throws with the failing migration's error.
 * Unordered migrations are allowed: work merged from parallel branches may add a lower number
 * than one a database already ran.
 */
export async function migrateToLatest(db: Kysely<any>): Promise<string[]> {
	const migrator = new Migrator({ db, provider: bundledMigrations, allowUnorderedMigrations: true });
	const { error, results } = await migrator.migrateToLatest();
	if (error) {
		const failed = results?.find((r) => r.status === 'Error')?.migrationName ?? 'unknown';
		throw new Error(`Migration ${failed} failed: ${error instanceof Error ? error.message : String(error)}`);
	}
	return (results ?? []).map((r) => r.migrationName);
}
