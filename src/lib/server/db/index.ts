/**
 * The one database connection of the process. SQLite in WAL mode with NORMAL synchronous
 * (safe with WAL, much faster), a busy timeout, and migrations applied at open.
 */
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate as runMigrations } from 'drizzle-orm/better-sqlite3/migrator';
import * as schema from './schema';
import { config } from '../config';
import { withClaim } from './write-claim';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

export function open(url: string): Db {
	if (url !== ':memory:') fs.mkdirSync(path.dirname(path.resolve(url)), { recursive: true });
	const client = new Database(url, { timeout: 5000 });
	client.pragma('journal_mode = WAL');
	client.pragma('synchronous = NORMAL');
	client.pragma('foreign_keys = ON');
	return drizzle(client, { schema });
}

/**
 * drizzle-kit rebuilds tables (create, copy, drop, rename) for many changes, and a DROP with
 * foreign keys on cascades into child rows. All pending migrations run in one transaction,
 * where SQLite ignores the foreign_keys pragma, so it is switched off around the run and the
 * keys are checked before switching back on.
 */
export function migrate(db: Db, migrationsFolder = config.migrationsDir): void {
	const client = db.$client;
	client.pragma('foreign_keys = OFF');
	try {
		runMigrations(db, { migrationsFolder });
		const broken = client.pragma('foreign_key_check') as unknown[];
		if (broken.length > 0) {
			throw new Error(`Migration left ${broken.length} rows with broken foreign keys`);
		}
	} finally {
		client.pragma('foreign_keys = ON');
	}
}

const globalForDb = globalThis as unknown as { tacksheetDb?: Db };

/** Opened on first use, once per process (also across dev reloads). */
export function getDb(): Db {
	if (!globalForDb.tacksheetDb) {
		const db = open(config.databaseUrl);
		migrate(db);
		globalForDb.tacksheetDb = db;
	}
	return globalForDb.tacksheetDb;
}

/**
 * A transaction that also claims the request's `Idempotency-Key` (see `write-claim.ts`), so
 * the key commits with the write it belongs to.
 */
function claimingTransaction(real: Db): Db['transaction'] {
	return ((work, options) =>
		withClaim(real.$client, (claim) =>
			real.transaction((tx) => {
				claim();
				return work(tx);
			}, options)
		)) as Db['transaction'];
}

export const db: Db = new Proxy({} as Db, {
	get(_target, property) {
		const real = getDb();
		if (property === 'transaction') return claimingTransaction(real);
		const value = Reflect.get(real, property, real);
		return typeof value === 'function' ? value.bind(real) : value;
	}
});

export { schema };
