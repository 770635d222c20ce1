/**
 * What NDE lots leave in the records, against a real SQLite file with the demo job: the
 * request to the NDE contractor and its closing by the results, the weld log's NDE columns
 * and filters, `nde-register.csv`, repair rate on the joint and length bases, a cut-out's
 * replacement examined again (ASME B31.3-2018 341.3.3, 341.3.4(f)), a reject corrected to an
 * accept withdrawing its tracers, and the RT indications kept with the result.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as joints from '$lib/server/joints';
import * as inspections from '$lib/server/inspections';
import * as mail from '$lib/server/mail';
import * as nde from '$lib/server/nde';
import * as weldLog from '$lib/server/weld-log';
import * as users from '$lib/server/users';
import * as welds from '$lib/server/welds';
import { deriveJointState } from '$lib/joint-state';
import { circumferenceMm } from '$lib/nde/repair-rate';
import { outsideDiameterMm } from '$lib/pipe-sizes';
import { recordInspectionSchema, recordWeldSchema } from '$lib/schemas/inspection';
import { weldLogQuery } from '$lib/schemas/weld-log';
import { demoDrawing, demoUserId } from '../fixtures/demo';
import { CLEAN, FITUP } from '../fixtures/readings';
import { qualifiedWelder } from '../fixtures/welders';

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
	({ projectId, revisionId } = demoDrawing('LBM-20-ISO-1105'));
}, 120_000);

let placed = 0;
let lines = 0;

const inspect = (jointId: number, body: unknown) =>
	inspections.record(
		jointId,
		recordInspectionSchema.parse({ version: joints.row(jointId)!.version, ...(body as object) }),
		inspectorId
	);

function weldAndAccept(jointId: number, stamp: string) {
	inspect(jointId, { stage: 'fitup', readings: FITUP, decision: 'accept' });
	welds.record(
		jointId,
		recordWeldSchema.parse({
			version: joints.row(jointId)!.version,
			weldedOn: '2025-06-02',
			welders: { root: stamp, fill: stamp, cap: stamp }
		}),
		users.principal(foremanId)!
	);
	inspect(jointId, { stage: 'visual', readings: CLEAN, decision: 'accept' });
}

/** A line of `n` 6 in butt welds by one new welder, its lot committed with a seed: the selected weld. */
function sampledLine(n: number, seed: number) {
	const line = `NDE-REC-${++lines}`;
	const stamp = qualifiedWelder(projectId, 'NR');
	const ids: number[] = [];
	for (let k = 0; k < n; k++) {
		placed++;
		const joint = joints.place(
			{
				revisionId,
				pageIndex: 0,
				x: 30 + (placed % 300),
				y: 700,
				joint: {
					kind: 'butt',
					size: '6',
					thickness: '0.280 in',
					criteriaSetId: 'asme-b31.3-normal',
					wps: 'WPS-CS-01 GTAW/SMAW',
					line
				}
			},
			inspectorId
		).joint;
		weldAndAccept(joint.id, stamp);
		ids.push(joint.id);
	}
	const lotId = db
		.select({ lotId: schema.ndeLotJoints.lotId })
		.from(schema.ndeLotJoints)
		.where(eq(schema.ndeLotJoints.jointId, ids[0]))
		.get()!.lotId;
	const { selected } = nde.commit(projectId, lotId, { seed }, inspectorId);
	return { line, stamp, ids, lotId, sample: selected[0] };
}

const rt = (jointId: number, decision: 'accept' | 'reject', extra: Record<string, unknown> = {}) =>
	inspect(jointId, { stage: 'nde', method: 'RT', decision, reportNo: `RT-R-${jointId}`, ...extra });

function cacheAgrees(jointId: number) {
	expect(joints.row(jointId)!.state).toBe(deriveJointState(joints.stateInput(jointId)!).state);
}

describe('the request to the NDE contractor', () => {
	it('sends the selected welds ready for NDE as one e-mail, and is closed by their results', async () => {
		const rule = nde.projectRule(db, projectId);
		nde.saveRule(projectId, { ...rule, contractorEmail: '' }, adminId);
		await expect(
			nde.sendRequest(projectId, { note: '' }, inspectorId, 'http://localhost')
		).rejects.toThrow(/no NDE contractor's address/);
		nde.saveRule(projectId, { ...rule, contractorEmail: 'bookings@rt-contractor.test' }, adminId);

		const a = sampledLine(4, 501);
		const b = sampledLine(4, 502);
		const sent = await nde.sendRequest(
			projectId,
			{ lotIds: [a.lotId, b.lotId], note: 'Night shift, permits from 20:00' },
			inspectorId,
			'http://localhost'
		);
		expect(sent.sentTo).toBe('bookings@rt-contractor.test');
		expect(sent.lines).toHaveLength(2);
		const message = mail.latestTo('bookings@rt-contractor.test')!;
		expect(message.subject).toMatch(/^NDE request LBM-20-\d+: 2 welds$/);
		for (const id of [a.sample, b.sample]) {
			const joint = joints.row(id)!;
			// Drawing, weld number, size, thickness, method and welder, one line each.
			expect(message.text).toContain(`LBM-20-ISO-1105 | ${joint.number} | 6 | 0.280 in | RT |`);
		}
		expect(message.text).toContain(a.stamp);
		expect(message.text).toContain('Night shift, permits from 20:00');
		expect(message.text).toMatch(/verify|qualified personnel/);
		// Asked once: nothing more to send for those lots.
		await expect(
			nde.sendRequest(
				projectId,
				{ lotIds: [a.lotId, b.lotId], note: '' },
				inspectorId,
				'http://localhost'
			)
		).rejects.toThrow(/Nothing to request/);

		rt(a.sample, 'accept');
		let request = db
			.select()
			.from(schema.ndeRequests)
			.where(eq(schema.ndeRequests.id, sent.request.id))
			.get()!;
		expect(request.closedAt).toBeNull();
		rt(b.sample, 'accept');
		request = db
			.select()
			.from(schema.ndeRequests)
			.where(eq(schema.ndeRequests.id, sent.request.id))
			.get()!;
		expect(request.closedAt).not.toBeNull();
		expect(nde.requests(projectId).find((r) => r.id === request.id)).toMatchObject({
			welds: 2,
			answered: 2
		});
	});
});

describe('indications and the joint and length repair rate', () => {
	it('keeps the RT indications with the result, read in the project units, and refuses one it cannot read', () => {
		const { sample } = sampledLine(3, 601);
		expect(() =>
			rt(sample, 'reject', { indications: [{ type: 'porosity', length: 'a bit' }] })
		).toThrow(expect.objectContaining({ status: 400, field: 'indications.0.length' }));
		// Nothing stored with the refused record.
		expect(inspections.list(sample).filter((r) => r.stage === 'nde')).toHaveLength(0);
		// Read and judged by the acceptance engine: a crack is not permitted on RT of a
		// normal-service girth weld (ASME B31.3-2018 Table 341.3.2); a slag line 1/4 in long and
		// 1/16 in wide in 0.280 in wall is within criterion G (at most 2Tw long, 1/8 in and Tw/2
		// wide, 4Tw in any 6 in).
		const { inspection } = rt(sample, 'reject', {
			indications: [
				{ type: 'crack', length: '1-1/4', position: '6' },
				{ type: 'elongatedSlag', length: '1/4', width: '1/16', position: '12' }
			]
		});
		const kept = db
			.select()
			.from(schema.ndeIndications)
			.where(eq(schema.ndeIndications.inspectionId, inspection.id))
			.all();
		// 1-1/4 in = 31.75 mm exactly (1 in = 25.4 mm, NIST SP 811 B.8).
		expect(kept).toEqual([
			expect.objectContaining({
				type: 'crack',
				lengthText: '1-1/4',
				lengthMm: 31.75,
				positionMm: expect.closeTo(152.4, 9),
				outcome: 'outside',
				rejected: true
			}),
			expect.objectContaining({
				type: 'elongatedSlag',
				lengthMm: 6.35,
				widthMm: 1.5875,
				outcome: 'within',
				rejected: false
			})
		]);
		// The joint card reads them back with the engine's words for each.
		expect(nde.forJoint(sample).indications).toEqual([
			expect.objectContaining({
				method: 'RT',
				items: [
					expect.objectContaining({ label: 'Crack', length: '1-1/4', outcome: 'outside' }),
					expect.objectContaining({ width: '1/16', outcome: 'within', rejected: false })
				]
			})
		]);
		expect(() =>
			inspect(sample, {
				stage: 'fitup',
				readings: {},
				decision: 'accept',
				indications: [{ type: 'crack' }]
			})
		).toThrow();
	});

	it('counts the rejected length from the indications, or the whole circumference', () => {
		const { lotId, sample, ids } = sampledLine(5, 602);
		rt(sample, 'reject', {
			indications: [{ type: 'crack', length: '1' }]
		});
		const rate = nde.lotRates(projectId).find((l) => l.id === lotId)!.rate;
		const c = circumferenceMm(outsideDiameterMm('6')!);
		expect(rate).toMatchObject({ examined: 1, rejected: 1, jointRate: 1 });
		expect(rate.examinedMm).toBeCloseTo(c, 6);
		expect(rate.rejectedMm).toBeCloseTo(25.4, 6);
		for (const tracer of ids.filter((id) => joints.row(id)!.state === 'awaiting_nde'))
			rt(tracer, 'accept');
		const after = nde.lotRates(projectId).find((l) => l.id === lotId)!.rate;
		expect(after).toMatchObject({ examined: 3, rejected: 1 });
		expect(after.jointRate).toBeCloseTo(1 / 3, 9);
		expect(after.lengthRate).toBeCloseTo(25.4 / (3 * c), 9);
		const byWelder = nde.repairRates(projectId).welders;
		expect(byWelder.length).toBeGreaterThan(0);
	});
});

describe('the weld log and the turnover register', () => {
	it('shows the lot, how each weld was selected and the reject a tracer traces, and filters by them', () => {
		const { lotId, sample } = sampledLine(5, 701);
		const answer = rt(sample, 'reject');
		const tracer = answer.nde.tracers[0].jointId;
		const page = weldLog.list(
			projectId,
			weldLogQuery.parse({ lot: String(lotId), pageSize: '50' })
		);
		expect(page.total).toBe(5);
		const bySample = page.items.find((r) => r.id === sample)!;
		expect(bySample.ndeLot).toMatch(/^Line NDE-REC-\d+ · RT 5 %$/);
		expect(bySample.ndeSelection).toBe('Random (RT)');
		const byTracer = page.items.find((r) => r.id === tracer)!;
		expect(byTracer.ndeSelection).toBe('Tracer (RT)');
		expect(byTracer.ndeTracerOf).toBe(`LBM-20-ISO-1105 ${joints.row(sample)!.number}`);
		const tracers = weldLog.list(
			projectId,
			weldLogQuery.parse({ lot: String(lotId), selection: 'tracer' })
		);
		expect(tracers.items.map((r) => r.id).sort()).toEqual(
			answer.nde.tracers.map((t) => t.jointId).sort()
		);
		const notSelected = weldLog.list(
			projectId,
			weldLogQuery.parse({ lot: String(lotId), selection: 'not-selected' })
		);
		expect(notSelected.total).toBe(2);
		const byReport = weldLog.list(projectId, weldLogQuery.parse({ report: `RT-R-${sample}` }));
		expect(byReport.items.map((r) => r.id)).toEqual([sample]);
		expect(() => weldLogQuery.parse({ selection: 'maybe' })).toThrow();
	});

	it('writes nde-register.csv: one row per weld of each lot, RFC 4180, in lot, drawing and weld order', () => {
		const { drawingId } = demoDrawing('LBM-20-ISO-1105');
		const csv = nde.registerCsv([drawingId]).toString('utf8');
		expect(
			csv.startsWith(
				'\uFEFFLot,Method,Extent %,Lot status,Drawing,Weld no.,Welders,Selected as,Tracer of,Report no.,Result,Examined (UTC),Joint state\r\n'
			)
		).toBe(true);
		const rows = csv.slice(1).trimEnd().split('\r\n').slice(1);
		const members = db
			.select({ n: schema.ndeLotJoints.jointId })
			.from(schema.ndeLotJoints)
			.innerJoin(schema.joints, eq(schema.joints.id, schema.ndeLotJoints.jointId))
			.where(eq(schema.joints.drawingId, drawingId))
			.all();
		expect(rows).toHaveLength(members.length);
		expect(rows.some((r) => r.includes(',Tracer,LBM-20-ISO-1105 '))).toBe(true);
		expect(rows.some((r) => r.includes(',Not selected,'))).toBe(true);
		// Same data, same bytes.
		expect(nde.registerCsv([drawingId]).equals(nde.registerCsv([drawingId]))).toBe(true);
	});
});

describe('cut-outs and corrections', () => {
	it("hands a cut-out's selection to its replacement, examined again by the same method and calling no tracers (341.3.3, 341.3.4(f))", () => {
		const { lotId, sample } = sampledLine(4, 801);
		rt(sample, 'reject');
		const before = db
			.select()
			.from(schema.ndeSelections)
			.where(and(eq(schema.ndeSelections.lotId, lotId), isNull(schema.ndeSelections.cancelledAt)))
			.all().length;
		const { joint: replacement } = joints.cutOut(
			sample,
			'Lack of fusion through the wall',
			joints.row(sample)!.version,
			inspectorId
		);
		const carried = db
			.select()
			.from(schema.ndeSelections)
			.where(
				and(
					eq(schema.ndeSelections.jointId, replacement.id),
					isNull(schema.ndeSelections.cancelledAt)
				)
			)
			.get()!;
		expect(carried).toMatchObject({ lotId, method: 'RT', carried: true, reason: 'random' });
		weldAndAccept(replacement.id, qualifiedWelder(projectId, 'NC'));
		expect(joints.row(replacement.id)!.state).toBe('awaiting_nde');
		const again = rt(replacement.id, 'reject');
		expect(again.nde.tracers).toEqual([]);
		expect(again.nde.none).toMatch(/341\.3\.4\(f\)/);
		expect(
			db
				.select()
				.from(schema.ndeSelections)
				.where(and(eq(schema.ndeSelections.lotId, lotId), isNull(schema.ndeSelections.cancelledAt)))
				.all().length
		).toBe(before + 1);
		cacheAgrees(replacement.id);
	});

	it('withdraws the tracers a reject called when it is corrected to an accept, keeping those examined', () => {
		const { sample } = sampledLine(5, 802);
		const reject = rt(sample, 'reject');
		const [first, second] = reject.nde.tracers.map((t) => t.jointId);
		rt(first, 'accept');
		inspect(sample, {
			stage: 'nde',
			method: 'RT',
			decision: 'accept',
			reportNo: `RT-R-${sample}`,
			reason: 'Film re-read by the Level III: the indication is a film artefact',
			supersedes: reject.inspection.id
		});
		const byJoint = (id: number) =>
			db
				.select()
				.from(schema.ndeSelections)
				.where(eq(schema.ndeSelections.jointId, id))
				.all()
				.find((s) => s.reason === 'tracer')!;
		expect(byJoint(first).cancelledAt).toBeNull();
		expect(byJoint(second).cancelledAt).not.toBeNull();
		expect(byJoint(second).note).toMatch(/corrected to an accept/);
		// No longer selected, and the sample (corrected) passed: accepted by it.
		expect(joints.row(second)!.state).toBe('accepted_by_lot');
		for (const id of [sample, first, second]) cacheAgrees(id);
	});
});
