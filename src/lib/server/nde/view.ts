/**
 * Lots as the lot page and the API show them: a page of lots with their figures (welds, sample
 * asked and reached, examined, rejected, each welder's coverage, open tracers), one lot in full,
 * and a joint's place in its lots for the joint card.
 */
import { and, asc, count, desc, eq, inArray, isNull, like, or, type SQL } from 'drizzle-orm';
import { db, schema } from '../db';
import { REASON_WORDS, STAGE_WORDS, summarizeLot, type LotSummary } from '$lib/nde/sampling';
import { GROUPING_LABELS } from '$lib/nde/extent';
import { indicationLabels } from '$lib/acceptance';
import type { LotsQuery } from '$lib/schemas/nde';
import { jointHref, jointsInfo, lotJointsInfo } from './joints-info';
import { lotData, lotsData, type LotData, type Reader } from './rows';
import { due } from './requests';
import { projectRule } from './forming';

const l = schema.ndeLots;

export const NDE_CAUTION =
	'NDE extent and tracers per project settings; verify against the code and contract in force. Examination and acceptance rest with qualified people under the code, edition and contract in force.';

function welderNames(reader: Reader, ids: readonly number[]) {
	if (ids.length === 0) return new Map<number, { stamp: string; name: string }>();
	return new Map(
		reader
			.select({ id: schema.welders.id, stamp: schema.welders.stamp, name: schema.welders.name })
			.from(schema.welders)
			.where(inArray(schema.welders.id, [...ids]))
			.all()
			.map((w) => [w.id, w])
	);
}

function summaryOf(data: LotData): LotSummary {
	return summarizeLot({
		members: data.members,
		selections: data.selections,
		calls: data.calls,
		percent: data.lot.percent,
		everyWelder: data.lot.everyWelder,
		closed: data.lot.status === 'closed'
	});
}

/** A lot as a list item of GET /api/projects/{id}/nde/lots. */
function item(data: LotData, names: Map<number, { stamp: string; name: string }>) {
	const { lot } = data;
	const summary = summaryOf(data);
	return {
		id: lot.id,
		label: lot.label,
		method: lot.method,
		percent: lot.percent,
		kinds: lot.kinds.split(','),
		groupBy: lot.groupBy,
		grouping: GROUPING_LABELS[lot.groupBy],
		status: lot.status,
		stage: summary.stage,
		stageLabel: STAGE_WORDS[summary.stage],
		everyWelder: lot.everyWelder,
		joints: summary.joints,
		required: summary.required,
		sampled: summary.sampled,
		selected: summary.selected,
		examined: summary.examined,
		rejected: summary.rejected,
		reached: Math.round(summary.reached * 10) / 10,
		sampleMet: summary.sampleMet,
		complete: summary.complete,
		acceptedBySample: summary.acceptedBySample,
		waitingOnSample: summary.waitingOnSample,
		tracersOpen: summary.tracersOpen,
		tracersShort: summary.tracersShort,
		welders: summary.welders.map((w) => ({
			stamp: names.get(w.welderId)?.stamp ?? String(w.welderId),
			name: names.get(w.welderId)?.name ?? '',
			joints: w.joints,
			selected: w.selected,
			examined: w.examined,
			rejected: w.rejected,
			represented: w.represented,
			full: w.full,
			short: w.short
		})),
		createdAt: lot.createdAt,
		closedAt: lot.closedAt,
		closeNote: lot.closeNote
	};
}

export type LotItem = ReturnType<typeof item>;

/** A page of the project's lots: open ones first, then by name. */
export function list(projectId: number, query: LotsQuery) {
	const pattern = `%${query.q.replace(/[%_\\]/g, (ch) => `\\${ch}`)}%`;
	const where: SQL | undefined = and(
		eq(l.projectId, projectId),
		query.status ? eq(l.status, query.status) : undefined,
		query.stage ? eq(l.stage, query.stage) : undefined,
		query.q ? or(like(l.label, pattern)) : undefined
	);
	const total = db.select({ n: count() }).from(l).where(where).get()?.n ?? 0;
	const rows = db
		.select({ id: l.id })
		.from(l)
		.where(where)
		.orderBy(desc(l.status), asc(l.label), asc(l.id))
		.limit(query.pageSize)
		.offset((query.page - 1) * query.pageSize)
		.all();
	const data = lotsData(
		db,
		rows.map((r) => r.id)
	);
	const lots = rows.map((r) => data.get(r.id)!);
	const names = welderNames(db, [
		...new Set(lots.flatMap((d) => d.members.flatMap((m) => m.welders)))
	]);
	return {
		items: lots.map((d) => item(d, names)),
		total,
		page: query.page,
		pageSize: query.pageSize
	};
}

/** Counts of the project's lots per stage, and the welds due for a request. */
export function overview(projectId: number) {
	const byStage: Record<string, number> = Object.fromEntries(
		db
			.select({ stage: l.stage, n: count() })
			.from(l)
			.where(eq(l.projectId, projectId))
			.groupBy(l.stage)
			.all()
			.map((r) => [r.stage, r.n])
	);
	const rule = projectRule(db, projectId);
	return {
		byStage,
		due: due(projectId).length,
		contractorEmail: rule.contractorEmail,
		groupBy: rule.groupBy,
		grouping: GROUPING_LABELS[rule.groupBy]
	};
}

/** One lot in full: its figures, its welds and how each stands, its rounds and tracer calls. */
export function detail(projectId: number, lotId: number) {
	const data = lotData(db, lotId);
	if (!data || data.lot.projectId !== projectId) return undefined;
	const ids = [
		...new Set([...data.members.map((m) => m.jointId), ...data.selections.map((s) => s.jointId)])
	];
	const info = lotJointsInfo(db, lotId);
	const missing = ids.filter((id) => !info.has(id));
	for (const [id, joint] of jointsInfo(db, missing)) info.set(id, joint);
	const names = welderNames(db, [
		...new Set([...data.members.flatMap((m) => m.welders), ...data.calls.map((c) => c.welderId)])
	]);
	const summary = item(data, names);
	const selectionOf = new Map(data.selections.map((s) => [s.jointId, s]));
	const byId = new Map(data.selections.map((s) => [s.id, s]));
	const rounds = db
		.select({
			round: schema.ndeRounds,
			by: schema.users.name,
			email: schema.users.email
		})
		.from(schema.ndeRounds)
		.leftJoin(schema.users, eq(schema.users.id, schema.ndeRounds.committedBy))
		.where(eq(schema.ndeRounds.lotId, lotId))
		.orderBy(asc(schema.ndeRounds.committedAt))
		.all()
		.map(({ round, by, email }) => ({ ...round, committedByName: by ?? email ?? null }));
	const reportOf = new Map(
		db
			.select({
				jointId: schema.inspections.jointId,
				reportNo: schema.inspections.reportNo,
				decision: schema.inspections.decision,
				repairCycle: schema.inspections.repairCycle,
				at: schema.inspections.inspectedAt
			})
			.from(schema.inspections)
			.where(
				and(
					inArray(
						schema.inspections.jointId,
						data.selections.map((s) => s.jointId)
					),
					eq(schema.inspections.stage, 'nde'),
					eq(schema.inspections.method, data.lot.method)
				)
			)
			.orderBy(asc(schema.inspections.inspectedAt))
			.all()
			.map((r) => [r.jointId, r])
	);
	const cancelled = db
		.select()
		.from(schema.ndeSelections)
		.where(and(eq(schema.ndeSelections.lotId, lotId)))
		.all()
		.filter((s) => s.cancelledAt != null);
	const cancelledInfo = jointsInfo(
		db,
		cancelled.map((s) => s.jointId)
	);
	const standingLabel = (jointId: number, state: string) =>
		state === 'accepted_by_lot'
			? 'Accepted by the lot sample'
			: state === 'awaiting_lot'
				? 'Awaiting the lot sample'
				: 'Not selected';
	return {
		lot: summary,
		welds: data.members
			.map((m) => {
				const joint = info.get(m.jointId)!;
				const s = selectionOf.get(m.jointId);
				const of = s?.tracerOfId != null ? byId.get(s.tracerOfId) : undefined;
				const ofJoint = of ? info.get(of.jointId) : undefined;
				const report = reportOf.get(m.jointId);
				return {
					...joint,
					href: jointHref(projectId, joint),
					candidate: m.candidate && !s,
					selection: s
						? {
								id: s.id,
								reason: s.reason,
								reasonLabel:
									s.reason === 'full'
										? `100 % of ${names.get(s.welderId ?? 0)?.stamp ?? 'welder'}'s work`
										: REASON_WORDS[s.reason],
								level: s.level,
								roundId: s.roundId,
								seed: s.seed,
								welder: s.welderId != null ? (names.get(s.welderId)?.stamp ?? null) : null,
								tracerOf: ofJoint
									? { id: ofJoint.id, drawing: ofJoint.drawing, label: ofJoint.label }
									: null,
								result: s.result,
								carried: s.carried,
								note: s.row.note,
								report: report?.reportNo ?? null
							}
						: null,
					standing: s ? null : standingLabel(m.jointId, joint.state)
				};
			})
			.sort(
				(a, b) =>
					a.drawing.localeCompare(b.drawing) ||
					a.number.localeCompare(b.number, 'en', { numeric: true })
			),
		rounds,
		calls: data.calls.map((c) => {
			const failing = byId.get(c.selectionId);
			const joint = failing ? info.get(failing.jointId) : undefined;
			return {
				...c,
				welder: names.get(c.welderId)?.stamp ?? String(c.welderId),
				reject: joint ? { id: joint.id, drawing: joint.drawing, label: joint.label } : null
			};
		}),
		swaps: cancelled.map((s) => ({
			id: s.id,
			joint: cancelledInfo.get(s.jointId)?.label ?? String(s.jointId),
			drawing: cancelledInfo.get(s.jointId)?.drawing ?? '',
			note: s.note,
			cancelledAt: s.cancelledAt
		}))
	};
}

export type LotDetail = NonNullable<ReturnType<typeof detail>>;

/**
 * The indications kept with the joint's RT and UT results in force (a corrected result gives
 * way to its correction), as the acceptance engine read and judged them.
 */
function indicationsOf(jointId: number) {
	const i = schema.inspections;
	const x = schema.ndeIndications;
	const results = db
		.select({
			id: i.id,
			method: i.method,
			reportNo: i.reportNo,
			repairCycle: i.repairCycle,
			decision: i.decision,
			supersedesId: i.supersedesId
		})
		.from(i)
		.where(and(eq(i.jointId, jointId), eq(i.stage, 'nde')))
		.orderBy(asc(i.inspectedAt), asc(i.id))
		.all();
	const replaced = new Set(results.map((r) => r.supersedesId).filter((id) => id != null));
	const standing = results.filter((r) => !replaced.has(r.id));
	if (standing.length === 0) return [];
	const items = db
		.select()
		.from(x)
		.where(
			inArray(
				x.inspectionId,
				standing.map((r) => r.id)
			)
		)
		.orderBy(asc(x.id))
		.all();
	return standing
		.map((r) => ({
			inspectionId: r.id,
			method: r.method,
			reportNo: r.reportNo,
			repairCycle: r.repairCycle,
			decision: r.decision,
			items: items
				.filter((item) => item.inspectionId === r.id)
				.map((item) => ({
					type: item.type,
					label: indicationLabels[item.type] ?? item.type,
					length: item.lengthText,
					width: item.widthText,
					depth: item.depthText,
					position: item.positionText,
					darker: item.darker,
					outcome: item.outcome,
					rejected: item.rejected
				}))
		}))
		.filter((r) => r.items.length > 0);
}

/** A joint's place in its NDE lots, for the joint card. */
export function forJoint(jointId: number) {
	const rows = db
		.select({ lotId: schema.ndeLotJoints.lotId })
		.from(schema.ndeLotJoints)
		.where(eq(schema.ndeLotJoints.jointId, jointId))
		.all();
	const lots = rows.map((r) => lotData(db, r.lotId)!).filter(Boolean);
	const other = db
		.select()
		.from(schema.ndeSelections)
		.where(and(eq(schema.ndeSelections.jointId, jointId), isNull(schema.ndeSelections.cancelledAt)))
		.all()
		.filter((s) => s.lotId == null);
	const tracerJointIds = lots.flatMap((d) =>
		d.selections.filter((s) => s.tracerOfId != null).map((s) => s.jointId)
	);
	const info = jointsInfo(db, [
		jointId,
		...tracerJointIds,
		...lots.flatMap((d) => d.selections.map((s) => s.jointId))
	]);
	const me = info.get(jointId);
	return {
		caution: NDE_CAUTION,
		lots: lots.map((d) => {
			const names = welderNames(db, [
				...new Set([...d.members.flatMap((m) => m.welders), ...d.calls.map((c) => c.welderId)])
			]);
			const mine = d.selections.find((s) => s.jointId === jointId);
			const byId = new Map(d.selections.map((s) => [s.id, s]));
			const of = mine?.tracerOfId != null ? byId.get(mine.tracerOfId) : undefined;
			const ofJoint = of ? info.get(of.jointId) : undefined;
			const called = mine
				? d.selections
						.filter((s) => s.tracerOfId === mine.id)
						.map((s) => {
							const joint = info.get(s.jointId);
							return {
								jointId: s.jointId,
								drawingId: joint?.drawingId ?? 0,
								drawing: joint?.drawing ?? '',
								label: joint?.label ?? String(s.jointId),
								kind: s.reason,
								welder: names.get(s.welderId ?? 0)?.stamp ?? '',
								result: s.result
							};
						})
				: [];
			const short = mine
				? d.calls
						.filter((c) => c.selectionId === mine.id && c.short > 0)
						.map((c) => ({
							welder: names.get(c.welderId)?.stamp ?? '',
							count: c.short
						}))
				: [];
			return {
				id: d.lot.id,
				label: d.lot.label,
				method: d.lot.method,
				percent: d.lot.percent,
				status: d.lot.status,
				stage: d.lot.stage,
				stageLabel: STAGE_WORDS[d.lot.stage],
				selection: mine
					? {
							reason: mine.reason,
							reasonLabel:
								mine.reason === 'full'
									? `100 % of ${names.get(mine.welderId ?? 0)?.stamp ?? 'a welder'}'s work`
									: REASON_WORDS[mine.reason],
							level: mine.level,
							seed: mine.seed,
							carried: mine.carried,
							result: mine.result,
							tracerOf: ofJoint
								? {
										id: ofJoint.id,
										drawingId: ofJoint.drawingId,
										drawing: ofJoint.drawing,
										label: ofJoint.label
									}
								: null
						}
					: null,
				standing: mine
					? null
					: me?.state === 'accepted_by_lot'
						? 'Not selected: accepted because its lot’s sample passed'
						: me?.state === 'awaiting_lot'
							? 'Not selected: waits on its lot’s sample'
							: 'Not selected',
				called,
				short
			};
		}),
		other: other.map((s) => ({ method: s.method, reason: s.reason, lot: s.lot })),
		indications: indicationsOf(jointId)
	};
}
