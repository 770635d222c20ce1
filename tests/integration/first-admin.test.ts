/** A production install's first start: the first administrator from the environment, once. */
import { count } from 'drizzle-orm';
import { afterEach, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { config } from '$lib/server/config';
import * as users from '$lib/server/users';

const saved = { email: config.adminEmail, password: config.adminPassword };
afterEach(() => Object.assign(config, { adminEmail: saved.email, adminPassword: saved.password }));

const userCount = () => db.select({ n: count() }).from(schema.users).get()!.n;

describe('the first administrator', () => {
	it('needs ADMIN_EMAIL and a password the password rule takes, and stores nothing otherwise', async () => {
		Object.assign(config, { adminEmail: '', adminPassword: '' });
		await expect(users.setUpFirstAdmin()).rejects.toThrow(/set ADMIN_EMAIL and ADMIN_PASSWORD/);
		// NIST SP 800-63B 5.1.1.2 asks for at least 8 characters; the product asks 12.
		Object.assign(config, { adminEmail: 'qc@fabshop.test', adminPassword: 'short-pass' });
		await expect(users.setUpFirstAdmin()).rejects.toThrow(/at least 12 characters/);
		expect(userCount()).toBe(0);
	});

	it('is created once, as an administrator who can sign in', async () => {
		Object.assign(config, {
			adminEmail: 'QC@Fabshop.test',
			adminPassword: 'correct horse battery staple'
		});
		expect(await users.setUpFirstAdmin()).toBe(true);
		expect(await users.setUpFirstAdmin()).toBe(false);
		expect(userCount()).toBe(1);
		const admin = users.byEmail('qc@fabshop.test')!;
		expect(admin.isAdmin).toBe(true);
	});
});
