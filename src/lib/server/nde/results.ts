/**
 * What an NDE result does to the lots, inside the transaction that records it
 * (`inspections.record` calls `afterResult` once the row is written): the indications of an
 * RT or UT report are kept with it; the request that asked for it is closed; a reject in the
 * sample calls its tracers (ASME B31.3-2018 341.3.4), which the answer names; and the welds
 * the sample stands for are accepted or kept waiting.
 */
import { and, asc, eq, inArray, isNull, ne } from 'drizzle-orm';
import { schema } from '../db';
import * as audit from '../audit';
import * as events from '../events';
import { refreshState } from '../joints';
import { DomainError } from '../errors';
import { effectiveInspections } from '$lib/joint-state';
import { parseLength, type UnitSystem } from '$lib/units';
import { mixSeed } from '$lib/random';
import { callsForReject, FULL_LEVEL } from '$lib/nde/sampling';
import { evaluateIndications, jointInputOf, type IndicationInput } from '$lib/acceptance';
import type { Verdict } from '$lib/domain';
import * as criteriaSets from '../criteria-sets';
import type { Inspection, Joint } from '../db/schema';
import { jointsInfo } from './joints-info';
import { lotData, stamps, type Tx } from './rows';
import { refreshLot } from './standing';

const s = schema.ndeSelections;
const c = schema.ndeTracerCalls;

export interface ResultExtras {
	indications?: IndicationInput[];
	/** Stamps of the welders whose work the defect is in; every welder of the weld by default. */
	welders?: string[];
}

export interface CalledTracer {
	jointId: number;
	drawingId: number;
	drawing: string;
	label: string;
	welder: string;
	level: number;
	/** `tracer` for two more of the welder's work, `full` for all of it. */
	kind: 'tracer' | 'full';
	clause: string;
}

/** What an NDE result answered about the lots; empty for any other record. */
export interface ResultAnswer {
	lot: { id: number; label: string } | null;
	tracers: CalledTracer[];
	/** Tracers asked that the lot could not give, by welder. */
	short: { welder: string; count: number }[];
	/** Why the reject called none, when it called none. */
	none: string | null;
}

const empty = (): ResultAnswer => ({ lot: null, tracers: [], short: [], none: null });

/**
 * The report's indications as the acceptance engine reads and judges them by the joint's
 * criteria set (src/lib/acceptance/indications.ts): each kept with its dimensions as typed and
 * in mm, the engine's outcome for it, and whether a reject finding falls on it (on it alone, or
 * on its kind or all indications together). A dimension that cannot be read refuses the
 * record; a joint the engine cannot judge (no set, no thickness) keeps the indications read
 * one by one, unjudged.
 */
function storeIndications(
	tx: Tx,
	inspection: Inspection,
	joint: Joint,
	list: IndicationInput[],
	units: UnitSystem
) {
	const set = criteriaSets.resolve(joint.projectId, joint.criteriaSetId, undefined, tx);
	const judged = set
		? evaluateIndications(set, jointInputOf(joint), inspection.method!, list, { units })
		: null;
	if (judged && !judged.ok) {
		const wrong = judged.errors.find((e) => e.field.startsWith('indications'));
		if (wrong) throw new DomainError(`${wrong.message}.`, 400, wrong.field);
	}
	const outcomes = list.map(() => ({ outcome: null as Verdict | null, rejected: false }));
	if (judged?.ok) {
		for (const finding of judged.findings) {
			const on =
				finding.indication !== null
					? [finding.indication]
					: list.flatMap((item, n) =>
							finding.type === null || item.type === finding.type ? [n] : []
						);
			for (const n of on) {
				const now = outcomes[n];
				if (!now) continue;
				now.outcome = worse(now.outcome, finding.outcome);
				if (finding.outcome === 'outside') now.rejected = true;
			}
		}
	}
	const mm = (value: string | number | undefined, n: number, dimension: string) => {
		if (value === undefined || value === '') return null;
		if (judged?.ok) return judged.indications[n]?.[`${dimension}Mm` as 'lengthMm'] ?? null;
		const read = parseLength(value, { units });
		if (!read.ok)
			throw new DomainError(
				`Indication ${n + 1}: cannot read the ${dimension} "${value}" (e.g. 3/8, 10 mm).`,
				400,
				`indications.${n}.${dimension}`
			);
		return read.value;
	};
	const typed = (value: string | number | undefined) => (value === undefined ? '' : String(value));
	list.forEach((indication, n) => {
		tx.insert(schema.ndeIndications)
			.values({
				inspectionId: inspection.id,
				type: indication.type,
				lengthText: typed(indication.length),
				lengthMm: mm(indication.length, n, 'length'),
				widthText: typed(indication.width),
				widthMm: mm(indication.width, n, 'width'),
				depthText: typed(indication.depth),
				depthMm: mm(indication.depth, n, 'depth'),
				positionText: typed(indication.position),
				positionMm: mm(indication.position, n, 'position'),
				darker: indication.darker ?? null,
				outcome: outcomes[n].outcome,
				rejected: outcomes[n].rejected
			})
			.run();
	});
}

const RANK: Record<Verdict, number> = { within: 0, judge: 1, outside: 2 };
function worse(a: Verdict | null, b: Verdict): Verdict {
	return a === null || RANK[b] > RANK[a] ? b : a;
}

/** The request items this result answers are closed, and each request once all of it is. */
function closeRequests(tx: Tx, selectionId: number, inspection: Inspection, at: number) {
	const items = schema.ndeRequestItems;
	const open = tx
		.select({ requestId: items.requestId })
		.from(items)
		.where(
			and(
				eq(items.selectionId, selectionId),
				eq(items.repairCycle, inspection.repairCycle),
				isNull(items.inspectionId)
			)
		)
		.all();
	if (open.length === 0) return;
	tx.update(items)
		.set({ inspectionId: inspection.id })
		.where(
			and(
				eq(items.selectionId, selectionId),
				eq(items.repairCycle, inspection.repairCycle),
				isNull(items.inspectionId)
			)
		)
		.run();
	for (const { requestId } of open) {
		const left = tx
			.select({ id: items.selectionId })
			.from(items)
			.where(and(eq(items.requestId, requestId), isNull(items.inspectionId)))
			.get();
		if (!left)
			tx.update(schema.ndeRequests)
				.set({ closedAt: at })
				.where(eq(schema.ndeRequests.id, requestId))
				.run();
	}
}

/** The welders whose work a reject is in: those named (checked against the weld), or all of it. */
function responsible(tx: Tx, joint: Joint, cycle: number, named: string[] | undefined): number[] {
	const rows = tx
		.select({ welderId: schema.weldWelders.welderId, stamp: schema.welders.stamp })
		.from(schema.welds)
		.innerJoin(schema.weldWelders, eq(schema.weldWelders.weldId, schema.welds.id))
		.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
		.where(and(eq(schema.welds.jointId, joint.id), eq(schema.welds.repairCycle, cycle)))
		.all();
	if (!named?.length) return [...new Set(rows.map((r) => r.welderId))];
	return named.map((stamp) => {
		const row = rows.find((r) => r.stamp.toUpperCase() === stamp.trim().toUpperCase());
		if (!row)
			throw new DomainError(
				`Welder ${stamp} did not weld ${joint.number}; its welders are ${[...new Set(rows.map((r) => r.stamp))].join(', ') || 'not recorded'}.`,
				400,
				'welders'
			);
		return row.welderId;
	});
}

/**
 * Call inside the transaction that wrote the inspection row, after it is written. Returns the
 * tracers a reject called, for the record's answer.
 */
export function afterResult(
	tx: Tx,
	args: {
		inspection: Inspection;
		joint: Joint;
		extras?: ResultExtras;
		units: UnitSystem;
		userId: string;
	}
): ResultAnswer {
	const { inspection, joint } = args;
	if (inspection.stage !== 'nde' || !inspection.method) return empty();
	const at = inspection.inspectedAt;
	if (args.extras?.indications?.length)
		storeIndications(tx, inspection, joint, args.extras.indications, args.units);

	const selection = tx
		.select()
		.from(s)
		.where(and(eq(s.jointId, joint.id), eq(s.method, inspection.method), isNull(s.cancelledAt)))
		.orderBy(asc(s.id))
		.all()
		.find((row) => row.lotId != null);
	if (!selection) return empty();
	closeRequests(tx, selection.id, inspection, at);
	const lotId = selection.lotId!;
	const data = lotData(tx, lotId)!;
	const answer: ResultAnswer = { ...empty(), lot: { id: lotId, label: data.lot.label } };

	// The record's rows by this method in force, in order: is this the weld's first reject?
	const rows = effectiveInspections(
		tx
			.select({
				id: schema.inspections.id,
				stage: schema.inspections.stage,
				method: schema.inspections.method,
				repairCycle: schema.inspections.repairCycle,
				decision: schema.inspections.decision,
				supersedesId: schema.inspections.supersedesId
			})
			.from(schema.inspections)
			.where(
				and(
					eq(schema.inspections.jointId, joint.id),
					eq(schema.inspections.stage, 'nde'),
					eq(schema.inspections.method, inspection.method)
				)
			)
			.orderBy(asc(schema.inspections.inspectedAt), asc(schema.inspections.id))
			.all()
	);
	const corrected = inspection.supersedesId;
	if (corrected != null && inspection.decision === 'accept')
		withdraw(tx, selection.id, at, args.userId);

	if (inspection.decision === 'reject') {
		const earlier = rows.slice(
			0,
			rows.findIndex((r) => r.id === inspection.id)
		);
		onReject(tx, {
			selectionId: selection.id,
			joint,
			inspection,
			repeated: earlier.some((r) => r.decision === 'reject'),
			welders: args.extras?.welders,
			userId: args.userId,
			answer
		});
	}
	refreshLot(tx, lotId, at);
	return answer;
}

/**
 * A reject corrected to an accept: the tracers it called and that have no result yet are
 * withdrawn with the reason; those already examined stay, with their results.
 */
function withdraw(tx: Tx, selectionId: number, at: number, userId: string) {
	tx.update(c)
		.set({ withdrawnAt: at })
		.where(and(eq(c.selectionId, selectionId), isNull(c.withdrawnAt)))
		.run();
	const called = tx
		.select({ id: s.id, jointId: s.jointId, method: s.method })
		.from(s)
		.where(and(eq(s.tracerOfId, selectionId), isNull(s.cancelledAt), ne(s.reason, 'swap')))
		.all();
	if (called.length === 0) return;
	const examined = new Set(
		tx
			.select({ jointId: schema.inspections.jointId })
			.from(schema.inspections)
			.where(
				and(
					inArray(
						schema.inspections.jointId,
						called.map((x) => x.jointId)
					),
					eq(schema.inspections.stage, 'nde'),
					eq(schema.inspections.method, called[0].method)
				)
			)
			.all()
			.map((r) => r.jointId)
	);
	for (const row of called) {
		if (examined.has(row.jointId)) continue;
		tx.update(s)
			.set({
				cancelledAt: at,
				cancelledBy: userId,
				note: 'Withdrawn: the reject that called it was corrected to an accept'
			})
			.where(eq(s.id, row.id))
			.run();
		refreshState(row.jointId, tx, at);
	}
}

/**
 * A reject of a selected weld: the tracers (or 100 %) it calls by ASME B31.3-2018 341.3.4,
 * written with their call, named in `answer`. Nothing is called twice for one selection.
 */
export function onReject(
	tx: Tx,
	args: {
		selectionId: number;
		joint: Joint;
		inspection: Inspection;
		repeated: boolean;
		welders?: string[];
		userId: string;
		answer: ResultAnswer;
	}
) {
	const { joint, inspection, repeated, answer } = args;
	const at = inspection.inspectedAt;
	const selection = tx.select().from(s).where(eq(s.id, args.selectionId)).get()!;
	const lotId = selection.lotId!;
	const data = lotData(tx, lotId)!;
	const called = tx
		.select({ id: c.id })
		.from(c)
		.where(and(eq(c.selectionId, selection.id), isNull(c.withdrawnAt)))
		.get();
	const failing = data.selections.find((x) => x.id === selection.id)!;
	const welders = responsible(tx, joint, inspection.repairCycle, args.welders);
	const seed = mixSeed(failing.seed ?? lotId, `reject:${inspection.id}`);
	const result = callsForReject(
		{ selection: { ...failing, result: 'reject' }, welders, at, repeated, seed },
		data.members,
		data.selections
	);
	answer.none = result.none ?? null;
	// A reject corrected into a reject again keeps the tracers it called the first time.
	if (!called && result.calls.length > 0) {
		const named = stamps(tx, welders);
		const info = jointsInfo(
			tx,
			result.calls.flatMap((call) => call.jointIds)
		);
		for (const call of result.calls) {
			tx.insert(c)
				.values({
					lotId,
					selectionId: selection.id,
					inspectionId: inspection.id,
					welderId: call.welderId,
					level: call.level,
					wanted: call.wanted,
					short: call.short,
					calledAt: at
				})
				.run();
			if (call.short > 0)
				answer.short.push({ welder: named.get(call.welderId) ?? '', count: call.short });
			for (const jointId of call.jointIds) {
				const full = call.level >= FULL_LEVEL;
				tx.insert(s)
					.values({
						projectId: joint.projectId,
						jointId,
						method: inspection.method!,
						lot: data.lot.label,
						lotId,
						roundId: selection.roundId,
						reason: full ? 'full' : 'tracer',
						level: call.level,
						welderId: call.welderId,
						tracerOfId: selection.id,
						tracerOfJointId: joint.id,
						selectedBy: args.userId,
						selectedAt: at
					})
					.run();
				const joint2 = info.get(jointId);
				if (joint2)
					answer.tracers.push({
						jointId,
						drawingId: joint2.drawingId,
						drawing: joint2.drawing,
						label: joint2.label,
						welder: named.get(call.welderId) ?? '',
						level: call.level,
						kind: full ? 'full' : 'tracer',
						clause: call.clause
					});
			}
		}
		audit.record(
			{
				action: 'nde_tracers',
				entity: 'nde_lot',
				entityId: lotId,
				projectId: joint.projectId,
				userId: args.userId,
				at,
				after: {
					reject: { jointId: joint.id, inspectionId: inspection.id, selectionId: selection.id },
					seed,
					calls: result.calls,
					none: result.none ?? null
				}
			},
			tx
		);
		for (const tracer of answer.tracers) {
			refreshState(tracer.jointId, tx, at);
			events.publish(joint.projectId, {
				type: 'joint',
				action: 'updated',
				jointId: tracer.jointId,
				drawingId: tracer.drawingId,
				by: args.userId
			});
		}
	}
}
