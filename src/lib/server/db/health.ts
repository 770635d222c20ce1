import { readMigrationFiles } from 'drizzle-orm/migrator';
import { getDb } from './index';
import { config } from '../config';

/** The database answers, and every migration shipped with the app has been applied. */
export function health(): { ok: true } | { ok: false; error: string } {
	try {
		const client = getDb().$client;
		client.prepare('select 1').get();
		const applied = client.prepare('select count(*) as n from __drizzle_migrations').get() as {
			n: number;
		};
		const shipped = readMigrationFiles({ migrationsFolder: config.migrationsDir }).length;
		if (applied.n < shipped) {
			return {
				ok: false,
				error: `Database is behind: ${applied.n} of ${shipped} migrations applied`
			};
		}
		return { ok: true };
	} catch (error) {
		return { ok: false, error: error instanceof Error ? error.message : String(error) };
	}
}
