/**
 * What an empty database gets at the first start: the invented demo job when the demo is on
 * (its seed and sheet generator are loaded only then), else the first administrator from the
 * environment.
 */
import type { Db } from './db';
import { config } from './config';
import * as users from './users';

export interface FirstStart {
	seeded: boolean;
	users: number;
	projects: number;
	drawings: number;
	joints: number;
}

export async function firstStart(db: Db): Promise<FirstStart> {
	if (!config.demo) {
		const created = await users.setUpFirstAdmin(db);
		return { seeded: created, users: created ? 1 : 0, projects: 0, drawings: 0, joints: 0 };
	}
	const { seedIfEmpty } = await import('./demo/seed');
	return seedIfEmpty(db);
}
