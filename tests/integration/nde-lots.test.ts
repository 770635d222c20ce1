/**
 * NDE lots end to end, against a real SQLite file with the demo job: lots formed by the
 * project's rule as welds are recorded, a seeded random selection that meets the percent and
 * represents every welder (ASME B31.3-2018 341.4.1(b)(1)), and progressive examination
 * (ASME B31.3-2018 341.3.4, reference/standards.md §2d) driven by NDE results recorded through
 * POST /api/joints/{id}/inspections, whose answer names the tracers a reject called.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as nde from '$lib/server/nde';
import * as users from '$lib/server/users';
import * as welds from '$lib/server/welds';
import { deriveJointState } from '$lib/joint-state';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { POST as postInspection } from '../../src/routes/api/joints/[jointId=id]/inspections/+server';
import { GET as getLots } from '../../src/routes/api/projects/[projectId=id]/nde/lots/+server';
import {
	GET as getProposal,
	POST as postSelection
} from '../../src/routes/api/projects/[projectId=id]/nde/lots/[lotId=id]/selection/+server';
import { demoDrawing, demoUserId } from '../fixtures/demo';
import { CLEAN, FITUP } from '../fixtures/readings';
import { qualifiedWelder } from '../fixtures/welders';

type Handler = (event: never) => Response | Promise<Response>;

let projectId: number;
let revisionId: number;
let inspectorId: string;
let foremanId: string;
let adminId: string;

beforeAll(async () => {
	await seedIfEmpty();
	inspectorId = demoUserId('inspector@tacksheet.test');
	foremanId = demoUserId('foreman@tacksheet.test');
	adminId = demoUserId('admin@tacksheet.test');
	({ projectId, revisionId } = demoDrawing('LBM-20-ISO-1104'));
}, 120_000);

// Factories ----------------------------------------------------------------------------------

let placed = 0;
let lines = 0;

const inspect = (jointId: number, body: unknown) =>
	inspections.record(
		jointId,
		recordInspectionSchema.parse({ version: joints.row(jointId)!.version, ...(body as object) }),
		inspectorId
	);

/** A butt joint (6 in SCH 40, ASME B31.3 normal: 5 % RT) on a line of its own. */
function newJoint(line: string, fields: Record<string, unknown> = {}) {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 30 + (placed % 400),
			y: 40 + Math.floor(placed / 400) * 6,
			joint: {
				kind: 'butt',
				size: '6',
				thickness: '0.280 in',
				criteriaSetId: 'asme-b31.3-normal',
				wps: 'WPS-CS-01 GTAW/SMAW',
				line,
				...fields
			}
		},
		inspectorId
	).joint;
}

/** Fit-up accepted, welded root to cap by `stamp`, visual accepted. */
function weldAndAccept(jointId: number, stamp: string, weldedOn = '2025-06-02') {
	inspect(jointId, { stage: 'fitup', readings: FITUP, decision: 'accept' });
	welds.record(
		jointId,
		recordWeldSchema.parse({
			version: joints.row(jointId)!.version,
			weldedOn,
			welders: { root: stamp, fill: stamp, cap: stamp }
		}),
		users.principal(foremanId)!
	);
	return inspect(jointId, { stage: 'visual', readings: CLEAN, decision: 'accept' });
}

/** A line of welds, `perWelder` by each of `welders` new welders: its lot and its welds. */
function lineOfWelds(welders: number, perWelder: number) {
	const line = `NDE-TEST-${++lines}`;
	const stamps = Array.from({ length: welders }, () => qualifiedWelder(projectId, 'ND'));
	const made: { id: number; stamp: string }[] = [];
	for (let n = 0; n < perWelder; n++) {
		for (const stamp of stamps) {
			const joint = newJoint(line);
			weldAndAccept(joint.id, stamp);
			made.push({ id: joint.id, stamp });
		}
	}
	return { line, stamps, welds: made, lotId: lotOf(made[0].id)! };
}

function lotOf(jointId: number): number | undefined {
	return db
		.select({ lotId: schema.ndeLotJoints.lotId })
		.from(schema.ndeLotJoints)
		.where(eq(schema.ndeLotJoints.jointId, jointId))
		.get()?.lotId;
}

function selected(lotId: number) {
	return db
		.select()
		.from(schema.ndeSelections)
		.where(and(eq(schema.ndeSelections.lotId, lotId), isNull(schema.ndeSelections.cancelledAt)))
		.all();
}

/** The cached state column says what the records say. */
function state(jointId: number) {
	const cached = joints.row(jointId)!;
	expect(deriveJointState(joints.stateInput(jointId)!).state, `joint ${jointId}`).toBe(
		cached.state
	);
	return cached.state;
}

async function api(handler: unknown, event: Record<string, unknown>) {
	const response = await (handler as Handler)(event as never);
	return { status: response.status, body: await response.json() };
}

function jsonRequest(path: string, method: string, body?: unknown) {
	return new Request(`http://localhost${path}`, {
		method,
		headers: { 'content-type': 'application/json' },
		body: body === undefined ? undefined : JSON.stringify(body)
	});
}

/** An RT result recorded through the API, as the joint card records it. */
function rt(jointId: number, decision: 'accept' | 'reject', extra: Record<string, unknown> = {}) {
	return api(postInspection, {
		params: { jointId: String(jointId) },
		request: jsonRequest(`/api/joints/${jointId}/inspections`, 'POST', {
			stage: 'nde',
			method: 'RT',
			version: joints.row(jointId)!.version,
			decision,
			reportNo: `RT-T-${jointId}`,
			technician: 'T. Example (Level II)',
			...extra
		}),
		locals: { user: users.principal(inspectorId) }
	});
}

function commit(lotId: number, seed: number, userId = inspectorId, swaps: unknown[] = []) {
	return api(postSelection, {
		params: { projectId: String(projectId), lotId: String(lotId) },
		request: jsonRequest(`/api/projects/${projectId}/nde/lots/${lotId}/selection`, 'POST', {
			seed,
			swaps
		}),
		locals: { user: users.principal(userId), projectId }
	});
}

/** The welds of `stamp` in the lot that are selected now. */
const selectedOf = (lotId: number, ids: number[]) =>
	selected(lotId).filter((s) => ids.includes(s.jointId));

// The demo job --------------------------------------------------------------------------------

describe('the demo job', () => {
	it('has lots in every stage: open, sampled, under progressive examination after a reject, closed', () => {
		const lots = db.select().from(schema.ndeLots).all();
		const stages = new Set(lots.map((l) => l.stage));
		for (const stage of ['open', 'sampled', 'progressive', 'closed'])
			expect(stages, stage).toContain(stage);
		const calls = db.select().from(schema.ndeTracerCalls).all();
		expect(calls.length).toBeGreaterThan(0);
		// Welds accepted by their lot's sample, and welds still waiting on it.
		const states = new Set(
			db
				.select({ state: schema.joints.state })
				.from(schema.joints)
				.all()
				.map((r) => r.state)
		);
		expect(states).toContain('accepted_by_lot');
		expect(states).toContain('awaiting_lot');
		for (const project of db.select().from(schema.projects).all())
			expect(nde.projectRule(db, project.id).contractorEmail).toMatch(/\.test$/);
	});
});

// Lots ---------------------------------------------------------------------------------------

describe('lots formed by the project rule', () => {
	it('puts a butt weld of a B31.3 normal line in its line’s RT 5 % lot when welded (ASME B31.3-2018 341.4.1(b)(1))', () => {
		const line = `NDE-FORM-${++lines}`;
		const stamp = qualifiedWelder(projectId, 'NF');
		const butt = newJoint(line);
		expect(lotOf(butt.id)).toBeUndefined();
		weldAndAccept(butt.id, stamp);
		const lot = db
			.select()
			.from(schema.ndeLots)
			.where(eq(schema.ndeLots.id, lotOf(butt.id)!))
			.get()!;
		expect(lot).toMatchObject({
			method: 'RT',
			percent: 5,
			kinds: 'butt',
			groupBy: 'line',
			groupKey: line,
			label: `Line ${line} · RT 5 %`,
			status: 'open'
		});
		// Not selected, visually accepted: it waits on its lot's sample.
		expect(state(butt.id)).toBe('awaiting_lot');

		// A fillet weld is outside the volumetric sample; a joint its drawing already
		// examines in full by RT is no sample of RT; Category D asks visual only (341.4.2).
		const fillet = newJoint(line, { kind: 'fillet', requiredSize: '1/4' });
		const required = newJoint(line, { ndeRequired: 'RT' });
		const categoryD = newJoint(line, { criteriaSetId: 'asme-b31.3-category-d' });
		for (const joint of [fillet, required, categoryD]) {
			inspect(joint.id, { stage: 'fitup', readings: {}, decision: 'accept' });
			welds.record(
				joint.id,
				recordWeldSchema.parse({
					version: joints.row(joint.id)!.version,
					weldedOn: '2025-06-02',
					welders: { root: stamp }
				}),
				users.principal(foremanId)!
			);
			expect(lotOf(joint.id), `joint ${joint.number}`).toBeUndefined();
		}
	});

	it('starts the next lot of the grouping once a lot is closed; a reopen is refused then', () => {
		const { line, stamps, lotId } = lineOfWelds(1, 2);
		nde.close(projectId, lotId, 'Line complete', adminId);
		expect(() => nde.close(projectId, lotId, '', adminId)).toThrow(/already closed/);
		const later = newJoint(line);
		weldAndAccept(later.id, stamps[0]);
		const next = lotOf(later.id)!;
		expect(next).not.toBe(lotId);
		expect(db.select().from(schema.ndeLots).where(eq(schema.ndeLots.id, next)).get()).toMatchObject(
			{ seq: 2, label: `Line ${line} · RT 5 % (2)` }
		);
		expect(() => nde.reopen(projectId, lotId, adminId)).toThrow(/later welds/);
	});

	it("follows the project's own extent over the code's, for new welds", () => {
		const before = nde.projectRule(db, projectId);
		try {
			nde.saveRule(
				projectId,
				{
					...before,
					extents: { 'asme-b31.3-normal': [{ method: 'UT', percent: 10, kinds: ['butt'] }] }
				},
				adminId
			);
			const line = `NDE-OWN-${++lines}`;
			const joint = newJoint(line);
			weldAndAccept(joint.id, qualifiedWelder(projectId, 'NO'));
			expect(
				db
					.select()
					.from(schema.ndeLots)
					.where(eq(schema.ndeLots.id, lotOf(joint.id)!))
					.get()
			).toMatchObject({ method: 'UT', percent: 10 });
		} finally {
			nde.saveRule(projectId, before, adminId);
		}
	});
});

// Selection ----------------------------------------------------------------------------------

describe('random selection (ASME B31.3-2018 341.4.1(b)(1))', () => {
	it('meets the percent, rounded up, and represents every welder with welds in the lot', async () => {
		// 5 welders × 9 welds = 45 welds: 5 % is 2.25, so 3; but five welders need five.
		const { lotId, stamps, welds: made } = lineOfWelds(5, 9);
		const answer = await commit(lotId, 7001);
		expect(answer.status).toBe(201);
		expect(answer.body.seed).toBe(7001);
		expect(answer.body.selected).toHaveLength(5);
		const stampsSelected = new Set(
			answer.body.selected.map((id: number) => made.find((w) => w.id === id)!.stamp)
		);
		expect(stampsSelected).toEqual(new Set(stamps));
		for (const id of answer.body.selected) expect(state(id)).toBe('awaiting_nde');
		const lot = nde
			.list(projectId, { q: '', page: 1, pageSize: 200 })
			.items.find((l) => l.id === lotId)!;
		expect(lot).toMatchObject({
			joints: 45,
			required: 3,
			selected: 5,
			examined: 0,
			stage: 'sampled'
		});
		expect(lot.welders.every((w) => w.represented && w.selected === 1 && w.joints === 9)).toBe(
			true
		);
		// Nothing more to select: the sample is met.
		const again = await commit(lotId, 7002);
		expect(again.status).toBe(409);
		expect(again.body.error).toMatch(/sample is met/);
	});

	it('gives the same selection for the same candidates and seed, and stores the seed, audited', async () => {
		const { lotId } = lineOfWelds(3, 20);
		const propose = (seed: number) =>
			api(getProposal, {
				params: { projectId: String(projectId), lotId: String(lotId) },
				url: new URL(
					`http://localhost/api/projects/${projectId}/nde/lots/${lotId}/selection?seed=${seed}`
				),
				locals: { user: users.principal(inspectorId), projectId }
			});
		const a = await propose(4242);
		const b = await propose(4242);
		expect(a.status).toBe(200);
		expect(a.body.picks.map((p: { id: number }) => p.id)).toEqual(
			b.body.picks.map((p: { id: number }) => p.id)
		);
		expect(a.body).toMatchObject({ seed: 4242, joints: 60, required: 3, candidates: 60 });
		const committed = await commit(lotId, 4242);
		expect(committed.body.selected).toEqual(a.body.picks.map((p: { id: number }) => p.id));
		const round = db
			.select()
			.from(schema.ndeRounds)
			.where(eq(schema.ndeRounds.lotId, lotId))
			.get()!;
		expect(round).toMatchObject({ seed: 4242, joints: 60, required: 3, candidates: 60 });
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(
				and(
					eq(schema.auditEvents.action, 'nde_select'),
					eq(schema.auditEvents.entityId, String(lotId))
				)
			)
			.get()!;
		expect(audit.after).toMatchObject({ seed: 4242, selected: committed.body.selected });
		const bad = await api(getProposal, {
			params: { projectId: String(projectId), lotId: String(lotId) },
			url: new URL(
				`http://localhost/api/projects/${projectId}/nde/lots/${lotId}/selection?seed=-3`
			),
			locals: { user: users.principal(inspectorId), projectId }
		});
		expect(bad).toMatchObject({ status: 400, body: { field: 'seed' } });
	});

	it('swaps a selected weld for another of the same welder with a reason, never an examined one', async () => {
		const { lotId, welds: made } = lineOfWelds(2, 6);
		const { body } = await commit(lotId, 99);
		const out = body.selected[0] as number;
		const stamp = made.find((w) => w.id === out)!.stamp;
		const sameWelder = made.find((w) => w.stamp === stamp && !body.selected.includes(w.id))!.id;
		const otherWelder = made.find((w) => w.stamp !== stamp && !body.selected.includes(w.id))!.id;
		expect(() =>
			nde.swap(projectId, lotId, { out, in: sameWelder, reason: 'no' }, inspectorId)
		).toThrow(/Say why/);
		expect(() =>
			nde.swap(projectId, lotId, { out, in: otherWelder, reason: 'Scaffold struck' }, inspectorId)
		).toThrow(/every welder stays represented/);
		nde.swap(
			projectId,
			lotId,
			{ out, in: sameWelder, reason: 'Scaffold struck at EL+9' },
			inspectorId
		);
		expect(state(out)).toBe('awaiting_lot');
		expect(state(sameWelder)).toBe('awaiting_nde');
		const cancelled = db
			.select()
			.from(schema.ndeSelections)
			.where(and(eq(schema.ndeSelections.lotId, lotId), eq(schema.ndeSelections.jointId, out)))
			.get()!;
		expect(cancelled.cancelledAt).not.toBeNull();
		expect(cancelled.note).toContain('Scaffold struck at EL+9');
		await rt(sameWelder, 'accept');
		const back = made.find((w) => w.stamp === stamp && w.id !== sameWelder && w.id !== out)!.id;
		expect(() =>
			nde.swap(projectId, lotId, { out: sameWelder, in: back, reason: 'Film lost' }, inspectorId)
		).toThrow(/never swapped away/);
	});
});

// Progressive examination ------------------------------------------------------------------

describe('progressive examination (ASME B31.3-2018 341.3.4)', () => {
	/** A sampled lot of two welders, ten welds each; the sample weld of the first welder. */
	async function sampledLot(seed: number) {
		const lot = lineOfWelds(2, 10);
		const { body } = await commit(lot.lotId, seed);
		const ids = lot.welds.filter((w) => w.stamp === lot.stamps[0]).map((w) => w.id);
		const sample = (body.selected as number[]).find((id) => ids.includes(id))!;
		return { ...lot, ids, sample, selectedIds: body.selected as number[] };
	}

	it('341.3.4(a): one reject calls two tracers of the same welder, named in the answer', async () => {
		const lot = await sampledLot(11);
		const answer = await rt(lot.sample, 'reject');
		expect(answer.status).toBe(201);
		expect(answer.body.joint.state).toBe('repair');
		const tracers = answer.body.nde.tracers as {
			jointId: number;
			welder: string;
			level: number;
			clause: string;
		}[];
		expect(tracers).toHaveLength(2);
		for (const t of tracers) {
			expect(lot.ids).toContain(t.jointId);
			expect(t).toMatchObject({
				welder: lot.stamps[0],
				level: 1,
				clause: 'ASME B31.3-2018 341.3.4(a)'
			});
			expect(state(t.jointId)).toBe('awaiting_nde');
		}
		expect(answer.body.nde.lot.id).toBe(lot.lotId);
		const summary = nde
			.list(projectId, { q: '', page: 1, pageSize: 200 })
			.items.find((l) => l.id === lot.lotId)!;
		expect(summary).toMatchObject({ stage: 'progressive', tracersOpen: 2, rejected: 1 });
		// The other welder's welds are not traced.
		expect(
			selectedOf(
				lot.lotId,
				lot.welds.filter((w) => w.stamp === lot.stamps[1]).map((w) => w.id)
			)
		).toHaveLength(1);
	});

	it('341.3.4(b): both tracers pass: the reject is repaired, and the welds the sample stands for are accepted', async () => {
		const lot = await sampledLot(12);
		const { body } = await rt(lot.sample, 'reject');
		const other = lot.selectedIds.find((id) => id !== lot.sample)!;
		await rt(other, 'accept');
		const unselected = lot.ids.filter(
			(id) =>
				!lot.selectedIds.includes(id) &&
				!body.nde.tracers.some((t: { jointId: number }) => t.jointId === id)
		);
		expect(state(unselected[0])).toBe('awaiting_lot');
		for (const t of body.nde.tracers) await rt(t.jointId, 'accept');
		for (const id of unselected) expect(state(id)).toBe('accepted_by_lot');
		// The reject itself is repaired and examined again by RT (341.3.3).
		expect(state(lot.sample)).toBe('repair');
	});

	it('341.3.4(c): a failed tracer calls two more for each failure', async () => {
		const lot = await sampledLot(13);
		const first = (await rt(lot.sample, 'reject')).body.nde.tracers as { jointId: number }[];
		const a = await rt(first[0].jointId, 'reject');
		const b = await rt(first[1].jointId, 'reject');
		for (const answer of [a, b]) {
			expect(answer.body.nde.tracers).toHaveLength(2);
			for (const t of answer.body.nde.tracers)
				expect(t).toMatchObject({
					level: 2,
					welder: lot.stamps[0],
					clause: 'ASME B31.3-2018 341.3.4(c)'
				});
		}
		const second = [...a.body.nde.tracers, ...b.body.nde.tracers].map(
			(t: { jointId: number }) => t.jointId
		);
		expect(new Set(second).size).toBe(4);
		for (const id of second) expect(lot.ids).toContain(id);
	});

	it("341.3.4(e): a failure at that level puts all of that welder's work in the lot under examination", async () => {
		const lot = await sampledLot(14);
		const first = (await rt(lot.sample, 'reject')).body.nde.tracers as { jointId: number }[];
		const second = (await rt(first[0].jointId, 'reject')).body.nde.tracers as { jointId: number }[];
		const full = await rt(second[0].jointId, 'reject');
		const called = full.body.nde.tracers as { jointId: number; kind: string; clause: string }[];
		// Ten welds: the sample, two tracers and two second-level tracers are selected already.
		expect(called).toHaveLength(5);
		for (const t of called)
			expect(t).toMatchObject({ kind: 'full', clause: 'ASME B31.3-2018 341.3.4(e)' });
		expect(selectedOf(lot.lotId, lot.ids)).toHaveLength(10);
		for (const id of lot.ids.filter(
			(id) =>
				![lot.sample, ...first.map((t) => t.jointId), ...second.map((t) => t.jointId)].includes(id)
		))
			expect(state(id)).toBe('awaiting_nde');
		const summary = nde
			.list(projectId, { q: '', page: 1, pageSize: 200 })
			.items.find((l) => l.id === lot.lotId)!;
		expect(summary.stage).toBe('full');
		expect(summary.welders.find((w) => w.stamp === lot.stamps[0])).toMatchObject({
			full: true,
			joints: 10,
			selected: 10
		});
		// A weld of that welder made later in the lot is examined too.
		const later = newJoint(lot.line);
		weldAndAccept(later.id, lot.stamps[0]);
		expect(state(later.id)).toBe('awaiting_nde');
	});

	it('341.3.4(f): a repaired weld that fails again calls no tracers; it is examined again by the same method (341.3.3)', async () => {
		const lot = await sampledLot(15);
		await rt(lot.sample, 'reject');
		const before = selected(lot.lotId).length;
		welds.record(
			lot.sample,
			recordWeldSchema.parse({
				version: joints.row(lot.sample)!.version,
				weldedOn: '2025-06-09',
				welders: { root: lot.stamps[0] }
			}),
			users.principal(foremanId)!
		);
		inspect(lot.sample, { stage: 'visual', readings: CLEAN, decision: 'accept' });
		// The repair waits for RT again: the same method, the same selection.
		expect(state(lot.sample)).toBe('awaiting_nde');
		const again = await rt(lot.sample, 'reject');
		expect(again.status).toBe(201);
		expect(again.body.nde.tracers).toEqual([]);
		expect(again.body.nde.none).toMatch(/341\.3\.4\(f\)/);
		expect(selected(lot.lotId)).toHaveLength(before);
	});

	it('says how many tracers the lot is short rather than inventing them, and picks them once welds are ready', async () => {
		// Welder A has two welds: the sample and one more; a reject asks two tracers.
		const line = `NDE-SHORT-${++lines}`;
		const a = qualifiedWelder(projectId, 'NS');
		const ids = [newJoint(line), newJoint(line)].map((j) => j.id);
		for (const id of ids) weldAndAccept(id, a);
		const lotId = lotOf(ids[0])!;
		const { body } = await commit(lotId, 3);
		const answer = await rt(body.selected[0], 'reject');
		expect(answer.body.nde.tracers).toHaveLength(1);
		expect(answer.body.nde.short).toEqual([{ welder: a, count: 1 }]);
		const item = nde.list(projectId, { q: line, page: 1, pageSize: 5 }).items[0];
		expect(item).toMatchObject({ stage: 'progressive', tracersShort: 1 });
		// A later weld is no tracer of work made before the reject: still short.
		const late = newJoint(line);
		weldAndAccept(late.id, a);
		expect(() => nde.pickShortTracers(projectId, lotId, inspectorId)).not.toThrow();
		expect(nde.list(projectId, { q: line, page: 1, pageSize: 5 }).items[0].tracersShort).toBe(1);
	});

	it('does not accept a weld made after the examination by it', async () => {
		const lot = await sampledLot(16);
		for (const id of lot.selectedIds) await rt(id, 'accept');
		const done = lot.ids.find((id) => !lot.selectedIds.includes(id))!;
		expect(state(done)).toBe('accepted_by_lot');
		const later = newJoint(lot.line);
		weldAndAccept(later.id, lot.stamps[0], '2025-06-20');
		expect(state(later.id)).toBe('awaiting_lot');
		// The next selection draws from the welds made since the last sample of that welder.
		const next = await commit(lot.lotId, 17);
		expect(next.body.selected).toEqual([later.id]);
	});
});

// The API's lot list -------------------------------------------------------------------------

describe('GET /api/projects/{id}/nde/lots', () => {
	it('answers each lot with its figures and every welder’s coverage', async () => {
		const lot = lineOfWelds(2, 3);
		const { status, body } = await api(getLots, {
			url: new URL(`http://localhost/api/projects/${projectId}/nde/lots?q=${lot.line}`),
			locals: { user: users.principal(demoUserId('viewer@tacksheet.test')), projectId }
		});
		expect(status).toBe(200);
		expect(body.caution).toMatch(
			/per project settings; verify against the code and contract in force/
		);
		expect(body.items).toHaveLength(1);
		const item = body.items[0];
		for (const key of [
			'id',
			'label',
			'method',
			'percent',
			'status',
			'joints',
			'required',
			'selected',
			'examined',
			'rejected',
			'welders',
			'tracersOpen'
		])
			expect(item, key).toHaveProperty(key);
		expect(item).toMatchObject({
			method: 'RT',
			percent: 5,
			status: 'open',
			joints: 6,
			required: 1,
			selected: 0
		});
		expect(item.welders).toEqual(
			lot.stamps.map((stamp) =>
				expect.objectContaining({ stamp, joints: 3, selected: 0, examined: 0 })
			)
		);
		const bad = await api(getLots, {
			url: new URL(`http://localhost/api/projects/${projectId}/nde/lots?stage=done`),
			locals: { user: users.principal(inspectorId), projectId }
		});
		expect(bad.status).toBe(400);
	});
});
