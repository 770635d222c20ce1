/**
 * Reading a lot's rows into the shapes the pure sampling rules take (src/lib/nde/sampling.ts):
 * its welds with their welders, its selections with their first results, its tracer calls.
 */
import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { schema, type Db } from '../db';
import { effectiveInspections, type JointState, type NdeMethod } from '$lib/joint-state';
import type { LotMember, LotSelection, TracerCall } from '$lib/nde/sampling';

export type Reader = Pick<Db, 'select'>;
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

const l = schema.ndeLots;
const m = schema.ndeLotJoints;
const s = schema.ndeSelections;
const j = schema.joints;

/** Welded and visually accepted at the current cycle, and not failing: may be examined now. */
export const CANDIDATE_STATES: readonly JointState[] = [
	'awaiting_nde',
	'awaiting_lot',
	'accepted_by_lot',
	'accepted'
];

export function lotRow(reader: Reader, lotId: number) {
	return reader.select().from(l).where(eq(l.id, lotId)).get();
}

/** Welders of each joint's original weld, by joint. */
export function weldersOf(reader: Reader, jointIds: readonly number[]): Map<number, number[]> {
	const out = new Map<number, number[]>();
	for (let start = 0; start < jointIds.length; start += 500) {
		const chunk = jointIds.slice(start, start + 500);
		const rows = reader
			.select({ jointId: schema.welds.jointId, welderId: schema.weldWelders.welderId })
			.from(schema.welds)
			.innerJoin(schema.weldWelders, eq(schema.weldWelders.weldId, schema.welds.id))
			.where(and(inArray(schema.welds.jointId, chunk), eq(schema.welds.repairCycle, 0)))
			.all();
		for (const row of rows) {
			const list = out.get(row.jointId) ?? [];
			if (!list.includes(row.welderId)) list.push(row.welderId);
			out.set(row.jointId, list);
		}
	}
	for (const list of out.values()) list.sort((a, b) => a - b);
	return out;
}

/** The lots' welds, void ones flagged, with their welders: two reads however many lots. */
function membersOf(reader: Reader, lotIds: readonly number[]) {
	const rows = reader
		.select({
			lotId: m.lotId,
			jointId: m.jointId,
			weldedAt: m.weldedAt,
			kind: j.kind,
			state: j.state,
			voidedAt: j.voidedAt
		})
		.from(m)
		.innerJoin(j, eq(j.id, m.jointId))
		.where(inArray(m.lotId, [...lotIds]))
		.orderBy(asc(m.lotId), asc(m.jointId))
		.all();
	// The original weld's welders, read through the lot so the index walks lot → weld → pass.
	const passes = reader
		.select({ jointId: schema.welds.jointId, welderId: schema.weldWelders.welderId })
		.from(m)
		.innerJoin(
			schema.welds,
			and(eq(schema.welds.jointId, m.jointId), eq(schema.welds.repairCycle, 0))
		)
		.innerJoin(schema.weldWelders, eq(schema.weldWelders.weldId, schema.welds.id))
		.where(inArray(m.lotId, [...lotIds]))
		.all();
	const welders = new Map<number, number[]>();
	for (const row of passes) {
		const list = welders.get(row.jointId);
		if (!list) welders.set(row.jointId, [row.welderId]);
		else if (!list.includes(row.welderId)) list.push(row.welderId);
	}
	for (const list of welders.values()) list.sort((a, b) => a - b);
	const out = new Map<number, (LotMember & { state: JointState })[]>(lotIds.map((id) => [id, []]));
	for (const r of rows)
		out.get(r.lotId)!.push({
			jointId: r.jointId,
			welders: welders.get(r.jointId) ?? [],
			kind: r.kind,
			weldedAt: r.weldedAt,
			candidate: r.voidedAt == null && CANDIDATE_STATES.includes(r.state),
			voided: r.voidedAt != null,
			state: r.state
		});
	return out;
}

/** One lot's welds, void ones flagged, with their welders. */
export function members(reader: Reader, lotId: number) {
	return membersOf(reader, [lotId]).get(lotId)!;
}

/** The first result in force of a method on each joint (a correction stands for the row it corrects). */
export function firstResults(
	reader: Reader,
	jointIds: readonly number[],
	method: NdeMethod
): Map<number, { decision: 'accept' | 'reject'; inspectionId: number }> {
	const out = new Map<number, { decision: 'accept' | 'reject'; inspectionId: number }>();
	const i = schema.inspections;
	for (let start = 0; start < jointIds.length; start += 500) {
		const rows = reader
			.select({
				id: i.id,
				jointId: i.jointId,
				stage: i.stage,
				method: i.method,
				repairCycle: i.repairCycle,
				decision: i.decision,
				supersedesId: i.supersedesId
			})
			.from(i)
			.where(
				and(
					inArray(i.jointId, jointIds.slice(start, start + 500)),
					eq(i.stage, 'nde'),
					eq(i.method, method)
				)
			)
			.orderBy(asc(i.inspectedAt), asc(i.id))
			.all();
		const byJoint = new Map<number, typeof rows>();
		for (const row of rows) byJoint.set(row.jointId, [...(byJoint.get(row.jointId) ?? []), row]);
		for (const [jointId, list] of byJoint) {
			const first = effectiveInspections(list)[0];
			if (first) out.set(jointId, { decision: first.decision, inspectionId: first.id });
		}
	}
	return out;
}

/** The lots' selections in force (not cancelled), each with its first result by the lot's method. */
function selectionsOf(reader: Reader, lots: readonly { id: number; method: NdeMethod }[]) {
	const rows = reader
		.select({
			row: s,
			roundAt: schema.ndeRounds.committedAt,
			seed: schema.ndeRounds.seed
		})
		.from(s)
		.leftJoin(schema.ndeRounds, eq(schema.ndeRounds.id, s.roundId))
		.where(
			and(
				inArray(
					s.lotId,
					lots.map((lot) => lot.id)
				),
				isNull(s.cancelledAt)
			)
		)
		.orderBy(asc(s.id))
		.all();
	const results = new Map<string, 'accept' | 'reject'>();
	for (const method of new Set(lots.map((lot) => lot.method))) {
		const ids = [...new Set(rows.filter((r) => r.row.method === method).map((r) => r.row.jointId))];
		for (const [jointId, first] of firstResults(reader, ids, method))
			results.set(`${jointId}/${method}`, first.decision);
	}
	const out = new Map<number, ReturnType<typeof withResult>[]>(lots.map((lot) => [lot.id, []]));
	function withResult({ row, roundAt, seed }: (typeof rows)[number]) {
		return {
			...toSelection(row, roundAt, results.get(`${row.jointId}/${row.method}`) ?? null),
			row,
			seed
		};
	}
	for (const r of rows) out.get(r.row.lotId!)?.push(withResult(r));
	return out;
}

/** One lot's selections in force, each with its first result. */
export function selections(reader: Reader, lotId: number, method: NdeMethod) {
	return selectionsOf(reader, [{ id: lotId, method }]).get(lotId)!;
}

export function toSelection(
	row: typeof s.$inferSelect,
	roundAt: number | null,
	result: 'accept' | 'reject' | null
): LotSelection {
	return {
		id: row.id,
		jointId: row.jointId,
		reason: row.reason,
		level: row.level,
		roundId: row.roundId,
		roundAt: roundAt ?? row.selectedAt,
		welderId: row.welderId,
		tracerOfId: row.tracerOfId,
		carried: row.carried,
		result
	};
}

function callsOf(reader: Reader, lotIds: readonly number[]) {
	const c = schema.ndeTracerCalls;
	const rows = reader
		.select({
			lotId: c.lotId,
			selectionId: c.selectionId,
			welderId: c.welderId,
			level: c.level,
			wanted: c.wanted,
			short: c.short,
			roundId: s.roundId
		})
		.from(c)
		.innerJoin(s, eq(s.id, c.selectionId))
		.where(and(inArray(c.lotId, [...lotIds]), isNull(c.withdrawnAt)))
		.orderBy(asc(c.id))
		.all();
	const out = new Map<number, TracerCall[]>(lotIds.map((id) => [id, []]));
	for (const { lotId, ...call } of rows) out.get(lotId)!.push(call);
	return out;
}

/** One lot's tracer calls still standing. */
export function calls(reader: Reader, lotId: number): TracerCall[] {
	return callsOf(reader, [lotId]).get(lotId)!;
}

/** Everything the sampling rules need of each lot, in five reads however many lots. */
export function lotsData(reader: Reader, lotIds: readonly number[]) {
	const lots = lotIds.length
		? reader
				.select()
				.from(l)
				.where(inArray(l.id, [...lotIds]))
				.all()
		: [];
	const ids = lots.map((lot) => lot.id);
	const membersBy = ids.length ? membersOf(reader, ids) : new Map();
	const selectionsBy = ids.length ? selectionsOf(reader, lots) : new Map();
	const callsBy = ids.length ? callsOf(reader, ids) : new Map();
	return new Map(
		lots.map((lot) => [
			lot.id,
			{
				lot,
				members: membersBy.get(lot.id)! as (LotMember & { state: JointState })[],
				selections: selectionsBy.get(lot.id)! as ReturnType<typeof selections>,
				calls: callsBy.get(lot.id)! as TracerCall[]
			}
		])
	);
}

/** Everything the sampling rules need of one lot. */
export function lotData(reader: Reader, lotId: number) {
	return lotsData(reader, [lotId]).get(lotId);
}

export type LotData = NonNullable<ReturnType<typeof lotData>>;

/** Stamps of welders by id. */
export function stamps(reader: Reader, welderIds: readonly number[]): Map<number, string> {
	if (welderIds.length === 0) return new Map();
	return new Map(
		reader
			.select({ id: schema.welders.id, stamp: schema.welders.stamp })
			.from(schema.welders)
			.where(inArray(schema.welders.id, [...welderIds]))
			.all()
			.map((w) => [w.id, w.stamp])
	);
}

/** `sql` for "this joint is not void". */
export const live = sql`${j.voidedAt} is null`;
