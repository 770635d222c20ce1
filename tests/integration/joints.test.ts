import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as joints from '$lib/server/joints';
import * as pins from '$lib/server/pins';
import * as events from '$lib/server/events';
import { deriveJointState } from '$lib/joint-state';
import { CAUTION } from '$lib/caution';
import { makeDrawing, makeProject, type MadeDrawing } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';

let userId: string;
let revisionId: number;
let projectId: number;
let drawingId: number;
/** Another drawing of the project, on the same line when the test says so. */
let other: MadeDrawing;

beforeAll(async () => {
	const job = await makeProject();
	userId = job.users.inspector;
	({ projectId, revisionId, drawingId } = job.drawing);
	// A drawing already under way: shop welds 1 to 12.
	for (let n = 0; n < 12; n++) makeJoint(job.drawing);
	other = await makeDrawing(job);
});

function numbersOnDrawing() {
	return db
		.select({ n: schema.joints.number })
		.from(schema.joints)
		.where(eq(schema.joints.drawingId, drawingId))
		.all()
		.map((r) => r.n);
}

describe('placing pins', () => {
	it('creates a joint at the point with the next number, reading its sizes into mm', () => {
		const highest = Math.max(
			...numbersOnDrawing()
				.map((n) => Number.parseInt(n.replace(/\D+/g, ''), 10))
				.filter(Number.isFinite)
		);
		const seen: unknown[] = [];
		const unsubscribe = events.subscribe(projectId, (e) => seen.push(e));
		const { joint, pin } = joints.place(
			{
				revisionId,
				pageIndex: 0,
				x: 412.5,
				y: 301.25,
				joint: { kind: 'butt', size: '2', thickness: '0.218 in' }
			},
			userId
		);
		unsubscribe();
		expect(joint.number).toBe(String(highest + 1));
		expect([pin.x, pin.y, pin.pageIndex]).toEqual([412.5, 301.25, 0]);
		// ASME B36.10M: NPS 2 is 2.375 in OD = 60.3 mm; 0.218 in = 5.5372 mm (1 in = 25.4 mm exactly).
		expect(joint.diameterMm).toBe(60.3);
		expect(joint.thicknessMm).toBeCloseTo(5.5372, 6);
		expect(joint.state).toBe('awaiting_fitup');
		expect(seen).toMatchObject([{ type: 'pin', action: 'created', jointId: joint.id }]);
	});

	it('numbers field joints with the project prefix, inserts 5A after 5, refuses a used number', () => {
		const field = joints.place(
			{ revisionId, pageIndex: 0, x: 100, y: 100, joint: { location: 'field' } },
			userId
		).joint;
		expect(field.number).toMatch(/^FW-\d+$/);
		const inserted = joints.place(
			{ revisionId, pageIndex: 0, x: 120, y: 100, insertAfter: '5', joint: {} },
			userId
		).joint;
		expect(inserted.number).toBe('5A');
		expect(() =>
			joints.place({ revisionId, pageIndex: 0, x: 1, y: 1, number: '5a', joint: {} }, userId)
		).toThrow(expect.objectContaining({ status: 409 }));
	});

	it('refuses a pin on a sheet the drawing does not have, and an unreadable size', () => {
		expect(() => joints.place({ revisionId, pageIndex: 3, x: 1, y: 1, joint: {} }, userId)).toThrow(
			expect.objectContaining({ status: 400, field: 'pageIndex' })
		);
		expect(() =>
			joints.place({ revisionId, pageIndex: 0, x: 1, y: 1, joint: { thickness: 'thick' } }, userId)
		).toThrow(expect.objectContaining({ status: 400, field: 'joint.thickness' }));
	});
});

describe('moving, editing and voiding', () => {
	it('moves a pin with the version the client saw, and refuses a stale one with 409', () => {
		const { joint, pin } = joints.place(
			{ revisionId, pageIndex: 0, x: 200, y: 200, joint: {} },
			userId
		);
		const moved = pins.move(pin.id, { x: 210, y: 190, version: joint.version }, userId);
		expect([moved.pin.x, moved.pin.y]).toEqual([210, 190]);
		expect(moved.version).toBe(joint.version + 1);
		expect(() => pins.move(pin.id, { x: 0, y: 0, version: joint.version }, userId)).toThrow(
			expect.objectContaining({ status: 409, field: 'version' })
		);
		const history = joints.detail(joint.id)!.changes.map((c) => c.action);
		expect(history).toEqual(['create', 'pin_move']);
	});

	it('voids a joint with a reason; it stays, greyed, and its number is never reused', () => {
		const { joint } = joints.place({ revisionId, pageIndex: 0, x: 300, y: 300, joint: {} }, userId);
		const voided = joints.voidJoint(
			joint.id,
			'Deleted by field change FCR-12',
			joint.version,
			userId
		);
		expect(voided.state).toBe('void');
		expect(deriveJointState(joints.stateInput(joint.id)!).state).toBe('void');
		const next = joints.place(
			{ revisionId, pageIndex: 0, x: 310, y: 300, joint: {} },
			userId
		).joint;
		expect(Number(next.number)).toBe(Number(joint.number) + 1);
		expect(() =>
			joints.update(joint.id, { material: 'x', version: voided.version }, userId)
		).toThrow(expect.objectContaining({ status: 409 }));
	});

	it('edits the card fields and keeps what was typed beside the millimetres', () => {
		const { joint } = joints.place(
			{ revisionId, pageIndex: 0, x: 400, y: 400, joint: { kind: 'fillet' } },
			userId
		);
		const updated = joints.update(
			joint.id,
			{ requiredSize: '5/16', material: 'ASTM A106 Gr B', version: joint.version },
			userId
		);
		expect(updated.requiredSizeText).toBe('5/16');
		// 5/16 in = 7.9375 mm
		expect(updated.requiredSizeMm).toBeCloseTo(7.9375, 6);
		const detail = joints.detail(joint.id)!;
		expect(detail.next).toBe('Fit-up inspection');
		// The joint's answer carries its verdicts with the caution.
		expect(detail.notice).toBe(CAUTION);
		expect(detail.changes.at(-1)).toMatchObject({
			action: 'update',
			after: { material: 'ASTM A106 Gr B' }
		});
	});
});

describe('pins of a revision', () => {
	it('lists every pin with its joint state, numbers in reading order', () => {
		const items = pins.ofRevision(revisionId);
		expect(items.length).toBeGreaterThan(10);
		const keys = items.map((i) => i.number);
		expect(keys.indexOf('5')).toBeLessThan(keys.indexOf('5A'));
		expect(keys.indexOf('5A')).toBeLessThan(keys.indexOf('6'));
		for (const item of items)
			expect(item.state).toBe(
				db.select().from(schema.joints).where(eq(schema.joints.id, item.jointId)).get()!.state
			);
	});
});

describe('numbering by line', () => {
	it('runs the sequence on along the line across its drawings when the project says so', async () => {
		const projects = await import('$lib/server/projects');
		const project = projects.get(projectId)!;
		projects.updateSettings(
			projectId,
			{
				name: project.name,
				client: project.client,
				contractor: project.contractor,
				site: project.site,
				defaultCriteriaSet: project.defaultCriteriaSet,
				shopPrefix: '',
				fieldPrefix: 'FW-',
				sequence: 'line'
			},
			userId
		);
		const line = 'TEST-LINE-77';
		const first = joints.place(
			{ revisionId, pageIndex: 0, x: 50, y: 50, joint: { line } },
			userId
		).joint;
		expect(Number(first.number)).toBeGreaterThan(1);
		const second = joints.place(
			{ revisionId: other.revisionId, pageIndex: 0, x: 60, y: 60, joint: { line } },
			userId
		).joint;
		expect(Number(second.number)).toBe(Number(first.number) + 1);
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.action, 'settings_change'))
			.all()
			.at(-1);
		expect(audit?.after).toMatchObject({ weldNumberRule: { sequence: 'line' } });
	});
});
