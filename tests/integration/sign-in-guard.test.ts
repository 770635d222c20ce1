import { beforeEach, describe, expect, it } from 'vitest';
import { desc, eq } from 'drizzle-orm';
import * as guard from '$lib/server/sign-in-guard';
import { db, schema } from '$lib/server/db';

const alice = { email: 'Alice@site.test', client: '10.0.0.1' };
const t0 = Date.UTC(2026, 10, 2, 8, 0);

describe('sign-in guard', () => {
	beforeEach(() => guard.reset());

	it('lets the first failures through at once, then slows each attempt', () => {
		expect(guard.check(alice, t0)).toEqual({ allowed: true, delayMs: 0 });
		for (let i = 0; i < 3; i++) guard.failed(alice, t0 + i);
		expect(guard.check(alice, t0 + 10)).toEqual({ allowed: true, delayMs: 500 });
		guard.failed(alice, t0 + 11);
		expect(guard.check(alice, t0 + 12)).toEqual({ allowed: true, delayMs: 1000 });
	});

	it('refuses an address after eight failures, whatever the password, until the window has passed', () => {
		for (let i = 0; i < 8; i++) guard.failed(alice, t0 + i);
		const verdict = guard.check({ ...alice, client: '10.9.9.9' }, t0 + 60_000);
		expect(verdict.allowed).toBe(false);
		if (!verdict.allowed) expect(verdict.retryAfterS).toBe(14 * 60 + 1);
		// Case and spaces do not make a new address.
		expect(
			guard.check({ email: ' alice@SITE.test', client: '10.9.9.9' }, t0 + 60_000).allowed
		).toBe(false);
		expect(guard.check(alice, t0 + 7 + guard.limits.windowMs + 1).allowed).toBe(true);
	});

	it('refuses a client that tries many addresses', () => {
		for (let i = 0; i < guard.limits.lockAfter.client; i++)
			guard.failed({ email: `user${i}@site.test`, client: '10.0.0.7' }, t0 + i);
		expect(guard.check({ email: 'fresh@site.test', client: '10.0.0.7' }, t0 + 100).allowed).toBe(
			false
		);
		expect(guard.check({ email: 'fresh@site.test', client: '10.0.0.8' }, t0 + 100).allowed).toBe(
			true
		);
	});

	it('forgets an address after a success, and writes each failure to the audit trail', () => {
		for (let i = 0; i < 5; i++) guard.failed(alice, t0 + i);
		guard.succeeded(alice);
		expect(guard.check({ ...alice, client: 'elsewhere' }, t0 + 10)).toEqual({
			allowed: true,
			delayMs: 0
		});
		const last = db
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.action, 'sign_in_failed'))
			.orderBy(desc(schema.auditEvents.id))
			.get();
		expect(last).toMatchObject({ actorEmail: 'alice@site.test', ip: '10.0.0.1', userId: null });
	});
});
