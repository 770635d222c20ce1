import { expect, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, readDatabase, signedInClient } from '../support';

/**
 * A write sent again with its Idempotency-Key (a retry after a dropped answer, the device's
 * outbox sending twice) is answered with the first result and stores nothing twice.
 */

let inspector: APIRequestContext;

test.beforeAll(async () => {
	inspector = await signedInClient('inspector@tacksheet.test');
});
test.afterAll(async () => inspector.dispose());

/** Demo joints of the first project still waiting for their fit-up, with their versions. */
function jointsAwaitingFitUp(): { id: number; version: number }[] {
	return readDatabase(
		(db) =>
			db
				.prepare(
					"select id, version from joints where project_id = 1 and state = 'awaiting_fitup' and voided_at is null order by id limit 20"
				)
				.all() as { id: number; version: number }[]
	);
}

function recordsOn(jointId: number): number {
	return readDatabase(
		(db) =>
			(
				db.prepare('select count(*) as n from inspections where joint_id = ?').get(jointId) as {
					n: number;
				}
			).n
	);
}

function fitUp(version: number, reportNo = 'FU-IDEM-1') {
	return { stage: 'fitup', decision: 'accept', readings: {}, reportNo, version };
}

function post(jointId: number, key: string, data: unknown) {
	return inspector.post(`/api/joints/${jointId}/inspections`, {
		data,
		headers: { origin: BASE_URL, 'idempotency-key': key }
	});
}

test('the same key twice: one record, and the second answer is the first', async () => {
	const [joint] = jointsAwaitingFitUp();
	const before = recordsOn(joint.id);
	const key = crypto.randomUUID();
	const first = await post(joint.id, key, fitUp(joint.version));
	expect(first.status(), await first.text()).toBe(201);
	const again = await post(joint.id, key, fitUp(joint.version));
	expect(again.status()).toBe(201);
	expect(again.headers()['idempotency-replayed']).toBe('true');
	expect(await again.json()).toEqual(await first.json());
	expect(recordsOn(joint.id)).toBe(before + 1);
});

test('the same key sent five times at once: one record, five equal answers', async () => {
	const joint = jointsAwaitingFitUp()[1];
	const before = recordsOn(joint.id);
	const key = crypto.randomUUID();
	const answers = await Promise.all(
		Array.from({ length: 5 }, () => post(joint.id, key, fitUp(joint.version)))
	);
	const bodies = await Promise.all(answers.map((a) => a.json()));
	expect(answers.map((a) => a.status())).toEqual([201, 201, 201, 201, 201]);
	for (const body of bodies) expect(body).toEqual(bodies[0]);
	expect(answers.filter((a) => a.headers()['idempotency-replayed'] === 'true')).toHaveLength(4);
	expect(recordsOn(joint.id)).toBe(before + 1);
});

test('the same key with another body is refused with 422 and stores nothing', async () => {
	const joint = jointsAwaitingFitUp()[2];
	const key = crypto.randomUUID();
	expect((await post(joint.id, key, fitUp(joint.version, 'FU-IDEM-A'))).status()).toBe(201);
	const count = recordsOn(joint.id);
	const other = await post(joint.id, key, fitUp(joint.version + 1, 'FU-IDEM-B'));
	expect(other.status()).toBe(422);
	expect((await other.json()).error).toMatch(/already used for a different request/);
	expect(recordsOn(joint.id)).toBe(count);
});

test('keys are per user: another inspector’s same key is a write of its own', async () => {
	const joint = jointsAwaitingFitUp()[3];
	const key = crypto.randomUUID();
	const mine = await post(joint.id, key, fitUp(joint.version));
	expect(mine.status()).toBe(201);
	const other = await signedInClient('inspector2@tacksheet.test');
	// Sent against the version the first inspector saw: the joint moved on, so 409, not a replay.
	const theirs = await other.post(`/api/joints/${joint.id}/inspections`, {
		data: fitUp(joint.version),
		headers: { origin: BASE_URL, 'idempotency-key': key }
	});
	expect(theirs.status()).toBe(409);
	expect(theirs.headers()['idempotency-replayed']).toBeUndefined();
	await other.dispose();
});

test('a refusal is kept with its key too, and a malformed key is refused', async () => {
	const joint = jointsAwaitingFitUp()[4];
	const key = crypto.randomUUID();
	const stale = await post(joint.id, key, fitUp(joint.version + 5));
	expect(stale.status()).toBe(409);
	const again = await post(joint.id, key, fitUp(joint.version + 5));
	expect(again.status()).toBe(409);
	expect(again.headers()['idempotency-replayed']).toBe('true');
	const bad = await post(joint.id, 'has space', fitUp(joint.version));
	expect(bad.status()).toBe(400);
});
