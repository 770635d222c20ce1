import { describe, expect, it } from 'vitest';
import { GET } from '../../src/routes/api/health/+server';
import { getDb } from '$lib/server/db';

type Handler = (event: never) => Response | Promise<Response>;

describe('GET /api/health', () => {
	it('answers ok once the database is open and migrated', async () => {
		const response = await (GET as unknown as Handler)({} as never);
		expect(response.status).toBe(200);
		expect(await response.json()).toEqual({ status: 'ok' });
	});

	it('answers 503 when the database cannot answer', async () => {
		const client = getDb().$client;
		client.exec('alter table __drizzle_migrations rename to __drizzle_migrations_away');
		try {
			const response = await (GET as unknown as Handler)({} as never);
			expect(response.status).toBe(503);
			expect((await response.json()).status).toBe('unavailable');
		} finally {
			client.exec('alter table __drizzle_migrations_away rename to __drizzle_migrations');
		}
	});
});
