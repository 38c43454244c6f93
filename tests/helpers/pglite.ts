import { PGlite } from '@electric-sql/pglite';
import {
	CompiledQuery,
	Kysely,
	PostgresAdapter,
	PostgresIntrospector,
	PostgresQueryCompiler,
	type DatabaseConnection,
	type Dialect,
	type Driver,
	type QueryResult
} from 'kysely';

/**
 * PGlite (PostgreSQL in WebAssembly, in process) for the tests. Starting an instance takes
 * seconds, so each test process starts ONE, and every test database is a schema of its own in
 * it: the driver sets `search_path` to that schema whenever it takes the single connection
 * (taken by one query or one whole transaction at a time, so schemas never mix). A destroyed
 * test database's schema is emptied (`truncate`) and handed to the next test, already migrated.
 */

const NUMERIC_OID = 1700;
let instance: PGlite | undefined;

function pglite(): PGlite {
	// numeric as a number, as the app's pg pool returns it (engine.ts); PGlite returns bigint as a number already
	instance ??= new PGlite({ parsers: { [NUMERIC_OID]: (value: string) => Number(value) } });
	return instance;
}

let holder: Promise<void> = Promise.resolve();

/** One user of the connection at a time, in order of asking. */
function takeTurn(): Promise<() => void> {
	let release!: () => void;
	const mine = new Promise<void>((resolve) => (release = resolve));
	const before = holder;
	holder = before.then(() => mine);
	return before.then(() => release);
}

class SchemaConnection implements DatabaseConnection {
	constructor(readonly release: () => void) {}

	async executeQuery<R>(compiled: CompiledQuery): Promise<QueryResult<R>> {
		const result = await pglite().query<R>(compiled.sql, [...compiled.parameters]);
		return { rows: result.rows, numAffectedRows: result.affectedRows === undefined ? undefined : BigInt(result.affectedRows) };
	}

	// eslint-disable-next-line require-yield
	async *streamQuery<R>(): AsyncIterableIterator<QueryResult<R>> {
		throw new Error('streaming is not used by the app');
	}
}

class SchemaDriver implements Driver {
	constructor(
		private readonly schema: string,
		private readonly onDestroy: () => Promise<void>
	) {}
	async init(): Promise<void> {}
	async acquireConnection(): Promise<DatabaseConnection> {
		const release = await takeTurn();
		try {
			await pglite().exec(`set search_path to "${this.schema}"`);
		} catch (e) {
			release();
			throw e;
		}
		return new SchemaConnection(release);
	}
	async beginTransaction(c: DatabaseConnection): Promise<void> {
		await c.executeQuery(CompiledQuery.raw('begin'));
	}
	async commitTransaction(c: DatabaseConnection): Promise<void> {
		await c.executeQuery(CompiledQuery.raw('commit'));
	}
	async rollbackTransaction(c: DatabaseConnection): Promise<void> {
		await c.executeQuery(CompiledQuery.raw('rollback'));
	}
	async releaseConnection(c: DatabaseConnection): Promise<void> {
		(c as SchemaConnection).release();
	}
	async destroy(): Promise<void> {
		await this.onDestroy();
	}
}

function schemaDialect(schema: string, onDestroy: () => Promise<void>): Dialect {
	return {
		createAdapter: () => new PostgresAdapter(),
		createDriver: () => new SchemaDriver(schema, onDestroy),
		createIntrospector: (db) => {
			// Only this test database's own tables: the migrator looks for its tables by name.
			const all = new PostgresIntrospector(db);
			return {
				getSchemas: () => all.getSchemas(),
				getMetadata: async (options) => ({ tables: (await all.getMetadata(options)).tables.filter((t) => t.schema === schema) }),
				getTables: async (options) => (await all.getTables(options)).filter((t) => t.schema === schema)
			};
		},
		createQueryCompiler: () => new PostgresQueryCompiler()
	};
}

let serial = 0;
const migratedAndFree: string[] = [];

/** Runs SQL on the shared instance outside any test database's turn order. */
async function exclusive(text: string): Promise<void> {
	const release = await takeTurn();
	try {
		await pglite().exec(text);
	} finally {
		release();
	}
}

/**
 * A Kysely handle on a fresh schema of the process's PGlite. `migrate` brings a new schema to
 * the newest migration; emptied schemas of destroyed test databases are reused when `migrated`.
 */
export async function pgliteTestDb<DB>(migrated: boolean, migrate: (db: Kysely<DB>) => Promise<unknown>): Promise<Kysely<DB>> {
	const reuse = migrated ? migratedAndFree.pop() : undefined;
	const schema = reuse ?? `test_${++serial}`;
	if (!reuse) await exclusive(`create schema "${schema}"`);
	let fresh = !reuse;
	const db: Kysely<DB> = new Kysely<DB>({
		dialect: schemaDialect(schema, async () => {
			if (!migrated) return;
			// Empty every table but the migrator's own, then offer the schema to the next test.
			const release = await takeTurn();
			try {
				const tables = await pglite().query<{ tablename: string }>(
					`select tablename from pg_tables where schemaname = $1 and tablename not like 'kysely_%'`,
					[schema]
				);
				if (tables.rows.length > 0) {
					await pglite().exec(`truncate ${tables.rows.map((t) => `"${schema}"."${t.tablename}"`).join(', ')} restart identity cascade`);
				}
				migratedAndFree.push(schema);
			} finally {
				release();
			}
		})
	});
	if (migrated && fresh) {
		await migrate(db);
		fresh = false;
	}
	return db;
}
