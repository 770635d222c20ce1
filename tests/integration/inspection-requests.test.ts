/**
 * Inspection requests (hold points): POST /api/projects/{id}/inspection-requests and the
 * module, against a real SQLite file with a project made by the test factory (two inspectors)
 * and the local mail stand-in.
 */
import { eq, inArray } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as inspectionRequests from '$lib/server/inspection-requests';
import * as outstanding from '$lib/server/outstanding';
import * as mail from '$lib/server/mail';
import * as users from '$lib/server/users';
import * as welds from '$lib/server/welds';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { outstandingQuerySchema } from '$lib/schemas/outstanding';
import { POST } from '../../src/routes/api/projects/[projectId=id]/inspection-requests/+server';
import { qualifiedWelder } from '../fixtures/welders';
import { makeProject } from '../fixtures/projects';

type Handler = (event: never) => Response | Promise<Response>;

let projectId: number;
let revisionId: number;
let drawing: { id: number; number: string };
let inspectorId: string;
let foremanId: string;
let inspectorEmails: string[];
let stamp: string;

beforeAll(async () => {
	const job = await makeProject();
	({ inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId } = job.drawing);
	drawing = { id: job.drawing.drawingId, number: job.drawing.number };
	users.invite(
		{
			email: 'second-inspector@factory.test',
			name: 'Second inspector',
			projectId,
			role: 'inspector'
		},
		job.users.admin
	);
	inspectorEmails = users
		.members(projectId)
		.filter((m) => m.role === 'inspector')
		.map((m) => m.email);
	stamp = qualifiedWelder(projectId, 'RQ');
});

let placed = 0;
/** A joint awaiting fit-up, or welded and awaiting visual. */
function jointIn(state: 'awaiting_fitup' | 'awaiting_visual') {
	placed++;
	const { joint } = joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 80 + placed * 4,
			y: 300,
			joint: { kind: 'butt', size: '3', thickness: '0.216 in', criteriaSetId: 'asme-b31.3-normal' }
		},
		inspectorId
	);
	if (state === 'awaiting_visual') {
		inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				version: joints.row(joint.id)!.version,
				stage: 'fitup',
				readings: {},
				decision: 'accept'
			}),
			inspectorId
		);
		welds.record(
			joint.id,
			recordWeldSchema.parse({
				version: joints.row(joint.id)!.version,
				weldedOn: '2025-06-10',
				process: 'GTAW',
				welders: { root: stamp }
			}),
			users.principal(foremanId)!
		);
	}
	return joints.row(joint.id)!;
}

async function post(body: unknown) {
	const response = await (POST as unknown as Handler)({
		request: new Request(`http://localhost/api/projects/${projectId}/inspection-requests`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		}),
		url: new URL(`http://localhost/api/projects/${projectId}/inspection-requests`),
		locals: { user: users.principal(foremanId)!, projectId }
	} as never);
	return { status: response.status, body: await response.json() };
}

function mailCount(to: string) {
	return db.select().from(schema.mailMessages).where(eq(schema.mailMessages.to, to)).all().length;
}

describe('requesting an inspection', () => {
	it('refuses with 409 a joint in the wrong state for the stage, naming it', async () => {
		const notWelded = jointIn('awaiting_fitup');
		const welded = jointIn('awaiting_visual');
		const answer = await post({ stage: 'visual', jointIds: [welded.id, notWelded.id] });
		expect(answer.status).toBe(409);
		expect(answer.body.error).toContain(`weld ${notWelded.number} on ${drawing.number}`);
		expect(answer.body.error).toMatch(/awaiting fit-up/);
		// Nothing of the batch is stored.
		const stored = db
			.select()
			.from(schema.inspectionRequests)
			.where(inArray(schema.inspectionRequests.jointId, [welded.id, notWelded.id]))
			.all();
		expect(stored).toEqual([]);
		const fitupOfWelded = await post({ stage: 'fitup', jointIds: [welded.id] });
		expect(fitupOfWelded.status).toBe(409);
	});

	it('stores one request per joint in one batch and mails every project inspector once', async () => {
		expect(inspectorEmails.length).toBeGreaterThanOrEqual(2);
		const a = jointIn('awaiting_visual');
		const b = jointIn('awaiting_visual');
		const before = new Map(inspectorEmails.map((e) => [e, mailCount(e)]));
		const answer = await post({
			stage: 'visual',
			jointIds: [a.id, b.id],
			note: 'Scaffold at EL+12'
		});
		expect(answer.status).toBe(201);
		expect(answer.body.requests).toHaveLength(2);
		expect(new Set(answer.body.requests.map((r: { batch: string }) => r.batch))).toEqual(
			new Set([answer.body.batch])
		);
		expect(answer.body.notified.sort()).toEqual([...inspectorEmails].sort());
		for (const email of inspectorEmails) {
			expect(mailCount(email), email).toBe(before.get(email)! + 1);
			const message = mail.latestTo(email)!;
			expect(message.subject).toBe('Visual inspection requested: 2 welds');
			expect(message.text).toContain('TACKSHEET');
			expect(message.text).toContain('Scaffold at EL+12');
			for (const joint of [a, b]) {
				expect(message.text).toContain(`Weld ${joint.number}, drawing ${drawing.number}:`);
				expect(message.text).toContain(
					`/projects/${projectId}/drawings/${drawing.id}?page=1&weld=${encodeURIComponent(joint.number)}`
				);
			}
		}
		// A second request while one is open is refused.
		const again = await post({ stage: 'visual', jointIds: [a.id] });
		expect(again.status).toBe(409);
		expect(again.body.error).toMatch(/already requested/);
		// The inspector's queue marks the request.
		const board = outstanding.board(projectId, outstandingQuerySchema.parse({ limit: 200 }));
		const visual = board.owed.inspector.find((g) => g.state === 'awaiting_visual')!;
		const row = visual.items.find((i) => i.jointId === a.id)!;
		expect(row.requestedAt).toBe(answer.body.requests[0].requestedAt);
	});

	it('closes itself when the inspection is recorded, with the time it waited', async () => {
		const joint = jointIn('awaiting_visual');
		const { requests } = inspectionRequests.create(
			projectId,
			{ stage: 'visual', jointIds: [joint.id] },
			foremanId
		);
		const twoHours = 2 * 3_600_000;
		db.update(schema.inspectionRequests)
			.set({ requestedAt: requests[0].requestedAt - twoHours })
			.where(eq(schema.inspectionRequests.id, requests[0].id))
			.run();
		const { inspection } = inspections.record(
			joint.id,
			recordInspectionSchema.parse({
				version: joints.row(joint.id)!.version,
				stage: 'visual',
				readings: {},
				decision: 'accept'
			}),
			inspectorId
		);
		const closed = db
			.select()
			.from(schema.inspectionRequests)
			.where(eq(schema.inspectionRequests.id, requests[0].id))
			.get()!;
		expect(closed.closedByInspectionId).toBe(inspection.id);
		expect(closed.closedAt).toBe(inspection.inspectedAt);
		const listed = inspectionRequests.list(projectId).find((q) => q.id === closed.id)!;
		expect(listed.waitedMs).toBeGreaterThanOrEqual(twoHours);
		expect(listed.waitedMs).toBeLessThan(twoHours + 60_000);
		const board = outstanding.board(projectId, outstandingQuerySchema.parse({}));
		expect(board.recentlyClosed.find((q) => q.id === closed.id)?.waitedMs).toBe(listed.waitedMs);
	});
});
