/**
 * An `Idempotency-Key` is claimed once per request, by the outermost write transaction: a verb
 * that opens its own transaction inside another's (accepting suggestions places each joint
 * through `joints.place`) claims nothing more, and a rolled-back write leaves the key free.
 * Idempotent writes: common practice for retried HTTP writes (the IETF httpapi draft
 * "The Idempotency-Key HTTP Header Field").
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { writeClaims, type WriteClaim } from '$lib/server/db/write-claim';
import { testAdmin } from '../fixtures/projects';

let userId: string;
beforeAll(() => {
	userId = testAdmin();
});

const claimFor = (key: string): WriteClaim => ({
	userId,
	key,
	requestHash: 'h',
	method: 'POST',
	path: '/api/test',
	claimed: false
});

const keys = (key: string) =>
	db.select().from(schema.idempotencyKeys).where(eq(schema.idempotencyKeys.key, key)).all();

describe('the claim of a request key', () => {
	it('is made once by the outer transaction, not again by one nested in it', () => {
		const claim = claimFor('nested-1');
		writeClaims.run(claim, () =>
			db.transaction(() => {
				db.transaction(() => undefined);
				db.transaction(() => undefined);
			})
		);
		expect(claim.claimed).toBe(true);
		expect(keys('nested-1')).toHaveLength(1);
	});

	it('is not kept when the write rolls back, so the same key can be sent again', () => {
		const claim = claimFor('rolled-back-1');
		expect(() =>
			writeClaims.run(claim, () =>
				db.transaction(() => {
					throw new Error('refused');
				})
			)
		).toThrow('refused');
		expect(claim.claimed).toBe(false);
		expect(keys('rolled-back-1')).toHaveLength(0);
		writeClaims.run(claim, () => db.transaction(() => undefined));
		expect(keys('rolled-back-1')).toHaveLength(1);
	});
});
