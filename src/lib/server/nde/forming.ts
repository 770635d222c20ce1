/**
 * Lots form as welds are made: a joint's original weld puts it in the open lot of its
 * grouping for each method its criteria set's extent asks (the project's own figure, else the
 * code's), unless the joint's own requirement already examines it in full by that method. A
 * closed lot takes no more welds: the next weld of that grouping starts the next lot.
 */
import { and, asc, desc, eq, gt, inArray, isNull, like, max, sql } from 'drizzle-orm';
import { db, schema } from '../db';
import * as audit from '../audit';
import { extentFor, extentsForKind, readLotRule, type Extent, type LotRule } from '$lib/nde/extent';
import { groupOf, lotLabel } from '$lib/nde/lots';
import { parseNdeRequirement } from '$lib/joint-state';
import { builtInCriteriaSetIds } from '$lib/acceptance';
import { weldersOf, type Reader, type Tx } from './rows';

const l = schema.ndeLots;
const m = schema.ndeLotJoints;
const s = schema.ndeSelections;
const j = schema.joints;

export function projectRule(reader: Reader, projectId: number): LotRule {
	const row = reader
		.select({ rule: schema.projects.ndeLotRule })
		.from(schema.projects)
		.where(eq(schema.projects.id, projectId))
		.get();
	return readLotRule(row?.rule);
}

/**
 * A criteria set and the sets it derives from, down to the built-in one: the project's
 * extent for the nearest of them applies.
 */
export function chainOf(reader: Reader, projectId: number, setId: string): string[] {
	const chain = [setId];
	let id = setId;
	for (let depth = 0; depth < 20 && !builtInCriteriaSetIds.includes(id); depth++) {
		const row = reader
			.select({ baseId: schema.criteriaSets.baseId })
			.from(schema.criteriaSets)
			.where(
				and(
					eq(schema.criteriaSets.projectId, projectId),
					like(schema.criteriaSets.id, `${projectId}/${id}@%`)
				)
			)
			.orderBy(desc(schema.criteriaSets.version))
			.get();
		if (!row) break;
		id = row.baseId.replace(/@\d+$/, '');
		chain.push(id);
	}
	return chain;
}

/** The joint as lot forming reads it: what groups it, and its original weld. */
function facts(reader: Reader, jointIds: readonly number[]) {
	if (jointIds.length === 0) return [];
	const rows = reader
		.select({
			id: j.id,
			projectId: j.projectId,
			kind: j.kind,
			location: j.location,
			line: j.line,
			criteriaSetId: j.criteriaSetId,
			ndeRequired: j.ndeRequired,
			voidedAt: j.voidedAt,
			drawing: schema.drawings.number,
			drawingLine: schema.drawings.line,
			system: schema.drawings.system,
			weldedOn: schema.welds.weldedOn,
			weldedAt: schema.welds.recordedAt,
			weldId: schema.welds.id
		})
		.from(j)
		.innerJoin(schema.drawings, eq(schema.drawings.id, j.drawingId))
		.innerJoin(schema.welds, and(eq(schema.welds.jointId, j.id), eq(schema.welds.repairCycle, 0)))
		.where(inArray(j.id, [...jointIds]))
		.all();
	const roots = new Map(
		reader
			.select({ weldId: schema.weldWelders.weldId, stamp: schema.welders.stamp })
			.from(schema.weldWelders)
			.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
			.where(
				and(
					inArray(
						schema.weldWelders.weldId,
						rows.map((r) => r.weldId)
					),
					eq(schema.weldWelders.pass, 'root')
				)
			)
			.all()
			.map((r) => [r.weldId, r.stamp])
	);
	return rows.map((r) => ({ ...r, rootStamp: roots.get(r.weldId) ?? null }));
}

type Facts = ReturnType<typeof facts>[number];

/** Caches for one run of lot forming, so a thousand welds read the rule and sets once. */
export class Forming {
	private rules = new Map<number, LotRule>();
	private chains = new Map<string, string[]>();
	private openLots = new Map<string, { id: number; label: string }>();
	private fullOf = new Map<number, Map<number, number>>();
	readonly touched = new Set<number>();

	constructor(
		private tx: Tx,
		private at: number
	) {}

	rule(projectId: number): LotRule {
		let rule = this.rules.get(projectId);
		if (!rule) this.rules.set(projectId, (rule = projectRule(this.tx, projectId)));
		return rule;
	}

	extents(f: Facts): Extent[] {
		const key = `${f.projectId}/${f.criteriaSetId}`;
		let chain = this.chains.get(key);
		if (!chain) this.chains.set(key, (chain = chainOf(this.tx, f.projectId, f.criteriaSetId)));
		const own = parseNdeRequirement(f.ndeRequired);
		// A joint its drawing already examines in full by a method is no sample of that method.
		return extentsForKind(extentFor(this.rule(f.projectId), chain), f.kind).filter(
			(e) => !own.includes(e.method)
		);
	}

	/** The open lot for a key, made when there is none (the next `seq` after closed ones). */
	lot(projectId: number, extent: Extent, rule: LotRule, f: Facts) {
		const group = groupOf(rule.groupBy, {
			location: f.location,
			line: f.line,
			drawingLine: f.drawingLine,
			system: f.system,
			drawing: f.drawing,
			weldedOn: f.weldedOn,
			rootStamp: f.rootStamp
		});
		const kinds = [...extent.kinds].sort().join(',');
		const key = JSON.stringify([
			projectId,
			extent.method,
			extent.percent,
			kinds,
			rule.groupBy,
			group.key
		]);
		const cached = this.openLots.get(key);
		if (cached) return cached;
		const match = and(
			eq(l.projectId, projectId),
			eq(l.method, extent.method),
			eq(l.percent, extent.percent),
			eq(l.kinds, kinds),
			eq(l.groupBy, rule.groupBy),
			eq(l.groupKey, group.key)
		);
		const open = this.tx
			.select({ id: l.id, label: l.label })
			.from(l)
			.where(and(match, eq(l.status, 'open')))
			.orderBy(desc(l.seq))
			.get();
		if (open) {
			this.openLots.set(key, open);
			return open;
		}
		const seq =
			(this.tx
				.select({ n: max(l.seq) })
				.from(l)
				.where(match)
				.get()?.n ?? 0) + 1;
		const label = lotLabel(group.words, extent.method, extent.percent, seq);
		const made = this.tx
			.insert(l)
			.values({
				projectId,
				method: extent.method,
				percent: extent.percent,
				kinds,
				groupBy: rule.groupBy,
				groupKey: group.key,
				seq,
				label,
				everyWelder: rule.everyWelder,
				createdAt: this.at
			})
			.returning({ id: l.id, label: l.label })
			.get();
		audit.record(
			{
				action: 'nde_lot_open',
				entity: 'nde_lot',
				entityId: made.id,
				projectId,
				at: this.at,
				after: {
					label,
					method: extent.method,
					percent: extent.percent,
					kinds,
					groupBy: rule.groupBy
				}
			},
			this.tx
		);
		this.openLots.set(key, made);
		return made;
	}

	/** Welders whose work in the lot is under 100 %, with the selection that put it there. */
	full(lotId: number): Map<number, number> {
		let full = this.fullOf.get(lotId);
		if (!full) {
			full = new Map(
				this.tx
					.select({ welderId: s.welderId, tracerOfId: s.tracerOfId })
					.from(s)
					.where(and(eq(s.lotId, lotId), eq(s.reason, 'full'), isNull(s.cancelledAt)))
					.all()
					.filter((r) => r.welderId != null)
					.map((r) => [r.welderId!, r.tracerOfId ?? 0])
			);
			this.fullOf.set(lotId, full);
		}
		return full;
	}

	/** Put welded joints in their lots; joints already in a lot of a method are left as they are. */
	assign(jointIds: readonly number[]): number {
		let added = 0;
		const all = facts(this.tx, jointIds).filter((f) => f.voidedAt == null);
		const already = new Map<number, Set<string>>();
		for (const row of this.tx
			.select({ jointId: m.jointId, method: l.method })
			.from(m)
			.innerJoin(l, eq(l.id, m.lotId))
			.where(
				inArray(
					m.jointId,
					all.map((f) => f.id)
				)
			)
			.all())
			already.set(row.jointId, (already.get(row.jointId) ?? new Set()).add(row.method));
		const welders = weldersOf(
			this.tx,
			all.map((f) => f.id)
		);
		for (const f of all) {
			const rule = this.rule(f.projectId);
			for (const extent of this.extents(f)) {
				if (already.get(f.id)?.has(extent.method)) continue;
				const lot = this.lot(f.projectId, extent, rule, f);
				this.tx
					.insert(m)
					.values({ lotId: lot.id, jointId: f.id, weldedAt: f.weldedAt, addedAt: this.at })
					.onConflictDoNothing()
					.run();
				this.touched.add(lot.id);
				added++;
				const base = {
					projectId: f.projectId,
					jointId: f.id,
					method: extent.method,
					lot: lot.label,
					lotId: lot.id,
					selectedAt: this.at
				};
				if (extent.percent >= 100) {
					// Every weld of the lot is examined: no sample to draw, no tracers to call.
					this.tx
						.insert(s)
						.values({ ...base, reason: 'required', level: 0 })
						.run();
					continue;
				}
				const full = this.full(lot.id);
				const under = (welders.get(f.id) ?? []).find((w) => full.has(w));
				if (under != null) {
					// That welder's work in this lot is examined in full (341.3.4(e)), later welds too.
					this.tx
						.insert(s)
						.values({
							...base,
							reason: 'full',
							level: 3,
							welderId: under,
							tracerOfId: full.get(under) || null
						})
						.run();
				}
			}
		}
		return added;
	}
}

/**
 * Form lots from the welds recorded since the project's mark: the welds made before lots were
 * kept, or written by anything that did not go through `welds.record` (an import, the demo
 * seed). Returns the lots that took welds.
 */
export function formFromWelds(tx: Tx, projectId: number, at = Date.now()): Set<number> {
	const mark =
		tx
			.select({ weldId: schema.ndeLotMarks.weldId })
			.from(schema.ndeLotMarks)
			.where(eq(schema.ndeLotMarks.projectId, projectId))
			.get()?.weldId ?? 0;
	const welds = tx
		.select({ id: schema.welds.id, jointId: schema.welds.jointId })
		.from(schema.welds)
		.innerJoin(j, eq(j.id, schema.welds.jointId))
		.where(
			and(eq(j.projectId, projectId), eq(schema.welds.repairCycle, 0), gt(schema.welds.id, mark))
		)
		.orderBy(asc(schema.welds.id))
		.all();
	const forming = new Forming(tx, at);
	for (let start = 0; start < welds.length; start += 500)
		forming.assign(welds.slice(start, start + 500).map((w) => w.jointId));
	const last = welds.at(-1)?.id ?? mark;
	tx.insert(schema.ndeLotMarks)
		.values({ projectId, weldId: last })
		.onConflictDoUpdate({ target: schema.ndeLotMarks.projectId, set: { weldId: last } })
		.run();
	return forming.touched;
}

/** Read every weld again on the next forming (the extent in the settings changed). */
export function resetMark(tx: Tx, projectId: number) {
	tx.delete(schema.ndeLotMarks).where(eq(schema.ndeLotMarks.projectId, projectId)).run();
}

/** Projects with welds the lots have not read yet. */
export function projectsBehind(reader: Reader = db): number[] {
	return reader
		.select({ projectId: j.projectId })
		.from(schema.welds)
		.innerJoin(j, eq(j.id, schema.welds.jointId))
		.leftJoin(schema.ndeLotMarks, eq(schema.ndeLotMarks.projectId, j.projectId))
		.where(
			and(
				eq(schema.welds.repairCycle, 0),
				sql`${schema.welds.id} > coalesce(${schema.ndeLotMarks.weldId}, 0)`
			)
		)
		.groupBy(j.projectId)
		.all()
		.map((r) => r.projectId);
}
