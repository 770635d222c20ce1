/**
 * One true record: the joint's state, the weld log, its CSV and the turnover records say the
 * same of which inspection stands after any correction; every write that changes a joint
 * takes its version; the news of a change goes out after it is committed.
 */
import { PassThrough } from 'node:stream';
import { beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as events from '$lib/server/events';
import * as users from '$lib/server/users';
import * as weldLog from '$lib/server/weld-log';
import { inspectionsCsv } from '$lib/server/export/records';
import type { ScopeDrawing } from '$lib/server/export/scope';
import { filled, weldLogQuery } from '$lib/schemas/weld-log';
import { exportRequestSchema } from '$lib/schemas/export';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { voidJointSchema } from '$lib/schemas/joint';
import { newDrawingSchema } from '$lib/schemas/drawing';
import { qualificationSchema, welderSchema } from '$lib/schemas/outstanding';
import * as pins from '$lib/server/pins';
import * as welders from '$lib/server/welders';
import { POST as postInspection } from '../../src/routes/api/joints/[jointId=id]/inspections/+server';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { readCsv } from '../fixtures/csv';

type Handler = (event: never) => Response | Promise<Response>;

let job: MadeProject;
let inspectorId: string;
let projectId: number;
let drawingId: number;
let revisionId: number;

beforeAll(async () => {
	job = await makeProject();
	inspectorId = job.users.inspector;
	({ projectId, drawingId, revisionId } = job.drawing);
}, 120_000);

let placed = 0;
function newJoint(number: string) {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 60 + placed * 4,
			y: 420,
			number,
			joint: { kind: 'butt', size: '6', thickness: '0.280 in', criteriaSetId: 'asme-b31.3-normal' }
		},
		inspectorId
	).joint;
}

function fitup(jointId: number, decision: 'accept' | 'reject', more: object = {}) {
	return inspections.record(
		jointId,
		recordInspectionSchema.parse({
			stage: 'fitup',
			decision,
			version: joints.row(jointId)!.version,
			...more
		}),
		inspectorId
	);
}

describe('which inspection stands, everywhere', () => {
	// Common practice: a correction replaces the record it names and nothing else; a later
	// re-fit that was accepted stays the fit-up the joint is welded on.
	it('fit-up rejected, re-fit accepted, the first corrected (still rejected): ready to weld, fit-up accept', async () => {
		const joint = newJoint('STD1');
		const first = fitup(joint.id, 'reject');
		fitup(joint.id, 'accept');
		const correction = fitup(joint.id, 'reject', {
			supersedes: first.inspection.id,
			reason: 'Re-gauged: root opening was misread, still too wide'
		});

		expect(joints.row(joint.id)!.state).toBe('ready_to_weld');

		const page = weldLog.list(
			projectId,
			weldLogQuery.parse(filled({ drawing: String(drawingId) }))
		);
		const row = page.items.find((r) => r.id === joint.id)!;
		expect(row.state).toBe('ready_to_weld');
		expect(row.fitupResult).toBe('accept');

		const sink = new PassThrough();
		const chunks: Buffer[] = [];
		sink.on('data', (chunk: Buffer) => chunks.push(chunk));
		await weldLog.writeCsv(
			weldLog.iterate(projectId, weldLogQuery.parse(filled({ drawing: String(drawingId) }))),
			sink
		);
		const log = readCsv(
			Buffer.concat(chunks)
				.toString('utf8')
				.replace(/^\uFEFF/, '')
		);
		const header = log[0];
		const line = log.find((r) => r[header.indexOf('Weld no.')] === 'STD1')!;
		expect(line[header.indexOf('Fit-up')]).toMatch(/^accept/i);
		expect(line[header.indexOf('State')]).toMatch(/ready to weld/i);

		const scope = [{ id: drawingId, number: job.drawing.number }] as ScopeDrawing[];
		const records = readCsv(
			inspectionsCsv(exportRequestSchema.parse({ scope: { drawings: [drawingId] } }), scope)
				.toString('utf8')
				.replace(/^\uFEFF/, '')
		);
		const columns = records[0];
		const mine = records.filter((r) => r[columns.indexOf('Weld no.')] === 'STD1');
		const stands = (id: number) =>
			mine.find((r) => r[columns.indexOf('Record id')] === String(id))![columns.indexOf('Stands')];
		expect(stands(first.inspection.id)).toBe(`no: corrected by ${correction.inspection.id}`);
		expect(stands(correction.inspection.id)).toBe('yes');
		expect(mine).toHaveLength(3);
	});
});

describe('every write that changes a joint takes its version', () => {
	async function post(jointId: number, body: unknown) {
		const response = await (postInspection as unknown as Handler)({
			params: { jointId: String(jointId) },
			request: new Request(`http://localhost/api/joints/${jointId}/inspections`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(body)
			}),
			locals: { user: users.principal(inspectorId) }
		} as never);
		return { status: response.status, body: await response.json() };
	}

	it('ten identical fit-up accepts sent together: one lands, nine answer 409', async () => {
		const joint = newJoint('STD2');
		const body = { stage: 'fitup', decision: 'accept', version: joint.version };
		const answers = await Promise.all(Array.from({ length: 10 }, () => post(joint.id, body)));
		expect(answers.filter((a) => a.status === 201)).toHaveLength(1);
		const stale = answers.filter((a) => a.status === 409);
		expect(stale).toHaveLength(9);
		for (const answer of stale) {
			expect(answer.body.field).toBe('version');
			expect(answer.body.error).toMatch(/changed joint STD2 since you opened it/);
			expect(answer.body.error).not.toMatch(/\d+, yours/);
		}
		expect(inspections.list(joint.id)).toHaveLength(1);
	});

	it('refuses a write without the version with 400 naming it, storing nothing', async () => {
		const joint = newJoint('STD3');
		const answer = await post(joint.id, { stage: 'fitup', decision: 'accept' });
		expect(answer.status).toBe(400);
		expect(answer.body.field).toBe('version');
		expect(inspections.list(joint.id)).toHaveLength(0);
	});
});

describe('news of a change', () => {
	it('goes out once the write is committed, never from inside its transaction', () => {
		const joint = newJoint('STD4');
		const seen: boolean[] = [];
		const stop = events.subscribe(projectId, () => seen.push(db.$client.inTransaction));
		try {
			fitup(joint.id, 'accept');
			joints.update(
				joint.id,
				{ spool: 'SP-9', version: joints.row(joint.id)!.version },
				inspectorId
			);
		} finally {
			stop();
		}
		expect(seen).toEqual([false, false]);
	});
});

describe('input the record can hold', () => {
	it('refuses a pin off the sheet with 400 naming the axis, storing nothing', () => {
		const before = pins.ofRevision(revisionId).length;
		expect(() =>
			joints.place({ revisionId, pageIndex: 0, x: -1e308, y: 100, joint: {} }, inspectorId)
		).toThrow(expect.objectContaining({ status: 400, field: 'x' }));
		expect(() =>
			joints.place({ revisionId, pageIndex: 0, x: 100, y: 1e308, joint: {} }, inspectorId)
		).toThrow(expect.objectContaining({ status: 400, field: 'y' }));
		expect(pins.ofRevision(revisionId)).toHaveLength(before);
	});

	it('refuses a date that is not on the calendar, naming the field', () => {
		const parsed = qualificationSchema.safeParse({ process: 'GTAW', qualifiedOn: '2026-13-45' });
		expect(parsed.success).toBe(false);
		expect(parsed.error!.issues[0].path).toEqual(['qualifiedOn']);
		expect(
			recordWeldSchema.safeParse({ weldedOn: '2026-02-30', welders: { root: 'B1' }, version: 1 })
				.success
		).toBe(false);
	});

	it('refuses control characters, lone surrogates and line breaks in one-line fields', () => {
		const reason = 'Re-gauged\tby the second inspector\nroot opening misread';
		expect(voidJointSchema.safeParse({ reason, version: 1 }).success).toBe(true);
		expect(voidJointSchema.safeParse({ reason: 'bad\u0000reason', version: 1 }).success).toBe(
			false
		);
		expect(voidJointSchema.safeParse({ reason: 'broken \uD800 text', version: 1 }).success).toBe(
			false
		);
		const drawing = { number: 'LBM-20\r\nISO-9', kind: 'isometric' };
		const refused = newDrawingSchema.safeParse(drawing);
		expect(refused.success).toBe(false);
		expect(refused.error!.issues[0].path).toEqual(['number']);
		expect(welderSchema.safeParse({ stamp: 'B\n1', name: 'Dana Kovač' }).success).toBe(false);
	});
});

describe('welder stamps', () => {
	// Unicode Standard Annex #15 (NFKC) and the Unicode case mapping: é and É are one letter
	// in two cases, and a full-width Ｂ is a B.
	it('are one stamp in any case and any width: the second is a 409, not a fault', () => {
		const userId = job.users.foreman;
		welders.create(projectId, welderSchema.parse({ stamp: 'é1', name: 'Dana Kovač' }), userId);
		for (const stamp of ['É1', 'é1 ']) {
			expect(() =>
				welders.create(projectId, welderSchema.parse({ stamp, name: 'Ilse Varga' }), userId)
			).toThrow(expect.objectContaining({ status: 409, field: 'stamp' }));
		}
		welders.create(projectId, welderSchema.parse({ stamp: 'Ｂ７７', name: 'Noor Haddad' }), userId);
		expect(() =>
			welders.create(projectId, welderSchema.parse({ stamp: 'b77', name: 'Ilse Varga' }), userId)
		).toThrow(expect.objectContaining({ status: 409 }));
	});
});
