/**
 * The drawing's own weld numbers over the API: typed when placing, changed later (unique on the
 * drawing, old numbers retired, the change in the history) and a fresh pin taken back.
 * Weld numbers are never reused on a drawing: common practice in contractors' weld numbering
 * procedures (a number once on a record identifies that weld for good).
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as users from '$lib/server/users';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';
import * as inspectionRequests from '$lib/server/inspection-requests';
import {
	DELETE as deleteJoint,
	GET as getJoint,
	PATCH as patchJoint
} from '../../src/routes/api/joints/[jointId=id]/+server';
import { POST as postPin } from '../../src/routes/api/revisions/[revisionId=id]/pins/+server';

type Handler = (event: unknown) => Response | Promise<Response>;

let job: MadeProject;

beforeAll(async () => {
	job = await makeProject();
});

async function call(
	handler: unknown,
	params: Record<string, string>,
	userId: string,
	{ method = 'GET', body, search = '' }: { method?: string; body?: unknown; search?: string } = {}
) {
	const url = new URL(`http://localhost/api/x${search}`);
	const response = await (handler as Handler)({
		params,
		url,
		request: new Request(url, {
			method,
			...(body !== undefined
				? { headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) }
				: {})
		}),
		locals: { user: users.principal(userId), projectId: job.projectId }
	});
	const text = await response.text();
	return { status: response.status, body: text ? JSON.parse(text) : null };
}

const place = (number: string | undefined, x = 200) =>
	call(postPin, { revisionId: String(job.drawing.revisionId) }, job.users.inspector, {
		method: 'POST',
		body: { pageIndex: 0, x, y: 300, number, joint: {} }
	});

const renumber = (jointId: number, number: string, version: number) =>
	call(patchJoint, { jointId: String(jointId) }, job.users.inspector, {
		method: 'PATCH',
		body: { number, version }
	});

describe('typing the number while placing', () => {
	it('takes the typed number, and refuses one the drawing uses with 409', async () => {
		const made = await place('FW-101');
		expect(made.status).toBe(201);
		expect(made.body.joint.number).toBe('FW-101');
		const again = await place('fw-101', 220);
		expect(again.status).toBe(409);
		expect(again.body).toMatchObject({ field: 'number' });
		expect(again.body.error).toMatch(/FW-101 is already used/);
	});
});

describe('renumbering a joint', () => {
	it('changes the number, audits it, shows the old number in the history and retires it', async () => {
		const { joint } = makeJoint(job.drawing, {}, { number: 'SW-7' });
		const answer = await renumber(joint.id, 'SW-7A', joint.version);
		expect(answer.status).toBe(200);
		expect(answer.body.number).toBe('SW-7A');
		expect(answer.body.version).toBe(joint.version + 1);
		const change = answer.body.changes.find((c: { action: string }) => c.action === 'renumber');
		expect(change).toMatchObject({ before: { number: 'SW-7' }, after: { number: 'SW-7A' } });
		const retired = db
			.select()
			.from(schema.retiredWeldNumbers)
			.where(eq(schema.retiredWeldNumbers.drawingId, job.drawing.drawingId))
			.all();
		expect(retired.map((r) => r.number)).toContain('SW-7');

		// The old number is used up: neither typed on a new pin nor given to another joint.
		const typed = await place('sw-7', 240);
		expect(typed.status).toBe(409);
		expect(typed.body.error).toMatch(/used on this drawing before/);
		const other = makeJoint(job.drawing).joint;
		const taken = await renumber(other.id, 'SW-7', other.version);
		expect(taken.status).toBe(409);
		expect(taken.body.field).toBe('number');
	});

	it('refuses a number another joint holds (409, with a message), and a stale version', async () => {
		const a = makeJoint(job.drawing, {}, { number: 'R-1' }).joint;
		const b = makeJoint(job.drawing, {}, { number: 'R-2' }).joint;
		const clash = await renumber(b.id, 'r-1', b.version);
		expect(clash.status).toBe(409);
		expect(clash.body.error).toMatch(/R-1 is already used on this drawing/);
		const stale = await renumber(a.id, 'R-9', a.version + 5);
		expect(stale.status).toBe(409);
		expect(stale.body.field).toBe('version');
		expect(joints.row(a.id)!.number).toBe('R-1');
	});

	it('lets a joint take back the number it gave up itself (a slip undone)', async () => {
		const { joint } = makeJoint(job.drawing, {}, { number: 'K-40' });
		const first = await renumber(joint.id, 'K-41', joint.version);
		const back = await renumber(joint.id, 'K-40', first.body.version);
		expect(back.status).toBe(200);
		expect(back.body.number).toBe('K-40');
		// K-41 is retired now instead.
		expect((await place('K-41', 260)).status).toBe(409);
	});
});

describe('taking back a fresh pin', () => {
	it('deletes a joint placed just now with no record (204), and frees its number', async () => {
		const made = await place('TB-1', 280);
		const id = made.body.joint.id as number;
		expect(made.body.joint.undoUntil).toBeGreaterThan(Date.now());
		const gone = await call(deleteJoint, { jointId: String(id) }, job.users.inspector, {
			method: 'DELETE'
		});
		expect(gone.status).toBe(204);
		expect(joints.row(id)).toBeUndefined();
		expect(db.select().from(schema.pins).where(eq(schema.pins.jointId, id)).all()).toEqual([]);
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.entityId, String(id)))
			.all()
			.find((e) => e.action === 'take_back');
		expect(audit?.before).toMatchObject({ number: 'TB-1' });
		// The number was never on a record: it may be placed again.
		expect((await place('TB-1', 300)).status).toBe(201);
	});

	it('refuses with 409 once the joint has a record', async () => {
		const { joint } = makeJoint(job.drawing);
		inspectionRequests.create(
			job.projectId,
			{ stage: 'fitup', jointIds: [joint.id] },
			job.users.foreman
		);
		const refused = await call(deleteJoint, { jointId: String(joint.id) }, job.users.inspector, {
			method: 'DELETE'
		});
		expect(refused.status).toBe(409);
		expect(refused.body.error).toMatch(/already has records; void it instead/);
		expect(joints.row(joint.id)).toBeDefined();
		expect(
			(await call(getJoint, { jointId: String(joint.id) }, job.users.inspector)).body.undoUntil
		).toBeNull();
	});

	it('refuses with 409 after the undo window, and on a stale version', async () => {
		const { joint } = makeJoint(job.drawing);
		const stale = await call(deleteJoint, { jointId: String(joint.id) }, job.users.inspector, {
			method: 'DELETE',
			search: `?version=${joint.version + 1}`
		});
		expect(stale.status).toBe(409);
		vi.useFakeTimers({ now: Date.now() + 11 * 60_000, toFake: ['Date'] });
		try {
			const late = await call(deleteJoint, { jointId: String(joint.id) }, job.users.inspector, {
				method: 'DELETE'
			});
			expect(late.status).toBe(409);
			expect(late.body.error).toMatch(/more than 10 minutes ago/);
		} finally {
			vi.useRealTimers();
		}
		const missing = await call(deleteJoint, { jointId: '999999' }, job.users.inspector, {
			method: 'DELETE'
		});
		expect(missing.status).toBe(404);
	});
});
