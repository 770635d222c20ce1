/**
 * The lots' life: welds joining them as they are made (`afterWeld`, from `welds.record`), a
 * cut-out's replacement taking over its selections (`afterCutOut`, from `joints.cutOut`),
 * forming lots for welds recorded any other way (`sync`), closing and reopening a lot, and
 * the project's lot rule.
 */
import { and, asc, eq, gt, isNull, ne } from 'drizzle-orm';
import { db, schema } from '../db';
import * as audit from '../audit';
import { refreshState } from '../joints';
import { DomainError } from '../errors';
import type { NdeSettings } from '$lib/schemas/nde';
import { Forming, formFromWelds, projectRule, projectsBehind, resetMark } from './forming';
import { firstResults, lotRow, type Tx } from './rows';
import { onReject } from './results';
import { refreshLot } from './standing';

const l = schema.ndeLots;
const s = schema.ndeSelections;

/**
 * A joint's original weld was just recorded (in the caller's transaction): it joins the open
 * lot of its grouping for each method its extent asks. A repair weld changes no lot.
 */
export function afterWeld(tx: Tx, jointId: number, repairCycle: number, at = Date.now()) {
	if (repairCycle !== 0) return;
	const forming = new Forming(tx, at);
	forming.assign([jointId]);
	for (const lotId of forming.touched) refreshLot(tx, lotId, at);
}

/**
 * A cut-out's replacement stands in the cut-out weld's lots, and takes over its selections:
 * a replaced weld is examined again by the same method (ASME B31.3-2018 341.3.3), and a
 * failure of it calls no tracers (341.3.4(f)).
 */
export function afterCutOut(tx: Tx, jointId: number, replacementId: number, at = Date.now()) {
	const memberships = tx
		.select()
		.from(schema.ndeLotJoints)
		.where(eq(schema.ndeLotJoints.jointId, jointId))
		.all();
	for (const m of memberships)
		tx.insert(schema.ndeLotJoints)
			.values({ lotId: m.lotId, jointId: replacementId, weldedAt: at, addedAt: at })
			.onConflictDoNothing()
			.run();
	const selected = tx
		.select()
		.from(s)
		.where(and(eq(s.jointId, jointId), isNull(s.cancelledAt)))
		.all()
		.filter((row) => row.lotId != null);
	for (const row of selected) {
		const { id: _id, ...rest } = row;
		tx.insert(s)
			.values({
				...rest,
				jointId: replacementId,
				replacesId: row.id,
				carried: true,
				note: 'Replaces the weld cut out: examined again by the same method (ASME B31.3 341.3.3)',
				selectedAt: at
			})
			.run();
	}
	refreshState(replacementId, tx, at);
	for (const lotId of new Set(memberships.map((m) => m.lotId))) refreshLot(tx, lotId, at);
}

/** Form lots from welds not read yet, in one transaction per project. */
export function sync(projectId: number) {
	return db.transaction((tx) => syncIn(tx, projectId, Date.now()));
}

/** `sync` inside the caller's transaction. */
export function syncIn(tx: Tx, projectId: number, at: number) {
	const touched = formFromWelds(tx, projectId, at);
	adoptOlderSelections(tx, projectId, at);
	for (const lotId of touched) refreshLot(tx, lotId, at);
	return touched.size;
}

/** At start: lots for every project with welds made before lots were kept, or written around them. */
export function syncAll() {
	let lots = 0;
	for (const projectId of projectsBehind()) lots += sync(projectId);
	return lots;
}

/**
 * Selections recorded before lots were kept (a random pick per line) join the lot their weld
 * is in, as one round without a seed at the time of the latest of them.
 */
function adoptOlderSelections(tx: Tx, projectId: number, at: number) {
	const older = tx
		.select({
			id: s.id,
			jointId: s.jointId,
			method: s.method,
			selectedAt: s.selectedAt,
			by: s.selectedBy
		})
		.from(s)
		.where(
			and(
				eq(s.projectId, projectId),
				isNull(s.lotId),
				isNull(s.cancelledAt),
				ne(s.reason, 'required')
			)
		)
		.orderBy(asc(s.id))
		.all();
	if (older.length === 0) return;
	const lotOf = new Map<string, { lotId: number; label: string }>();
	for (const row of tx
		.select({ jointId: schema.ndeLotJoints.jointId, lotId: l.id, method: l.method, label: l.label })
		.from(schema.ndeLotJoints)
		.innerJoin(l, eq(l.id, schema.ndeLotJoints.lotId))
		.where(eq(l.projectId, projectId))
		.all())
		lotOf.set(`${row.jointId}/${row.method}`, { lotId: row.lotId, label: row.label });
	const byLot = new Map<number, typeof older>();
	for (const row of older) {
		const lot = lotOf.get(`${row.jointId}/${row.method}`);
		if (lot) byLot.set(lot.lotId, [...(byLot.get(lot.lotId) ?? []), row]);
	}
	for (const [lotId, rows] of byLot) {
		const lot = lotRow(tx, lotId)!;
		const latest = Math.max(...rows.map((r) => r.selectedAt));
		const round = tx
			.insert(schema.ndeRounds)
			.values({
				lotId,
				seed: null,
				joints: 0,
				required: 0,
				candidates: 0,
				committedBy: rows.at(-1)!.by,
				committedAt: latest
			})
			.returning({ id: schema.ndeRounds.id })
			.get();
		for (const row of rows)
			tx.update(s).set({ lotId, roundId: round.id, lot: lot.label }).where(eq(s.id, row.id)).run();
		audit.record(
			{
				action: 'nde_adopt',
				entity: 'nde_lot',
				entityId: lotId,
				projectId,
				at,
				after: {
					roundId: round.id,
					selections: rows.map((r) => r.id),
					note: 'selected before lots were kept'
				}
			},
			tx
		);
		for (const row of rows) refreshState(row.jointId, tx, at);
		// A reject among them calls its tracers now, as it would have when recorded (341.3.4).
		const results = firstResults(
			tx,
			rows.map((r) => r.jointId),
			lot.method
		);
		for (const row of rows) {
			const first = results.get(row.jointId);
			if (first?.decision !== 'reject') continue;
			const inspection = tx
				.select()
				.from(schema.inspections)
				.where(eq(schema.inspections.id, first.inspectionId))
				.get()!;
			const joint = tx.select().from(schema.joints).where(eq(schema.joints.id, row.jointId)).get()!;
			onReject(tx, {
				selectionId: row.id,
				joint,
				inspection,
				repeated: false,
				userId: inspection.inspectorId,
				answer: { lot: null, tracers: [], short: [], none: null }
			});
		}
		refreshLot(tx, lotId, at);
	}
}

/** Close a lot: it takes no more welds, and the next weld of its grouping starts a new lot. */
export function close(projectId: number, lotId: number, note: string, userId: string) {
	return db.transaction((tx) => closeIn(tx, projectId, lotId, note, userId, Date.now()));
}

/** `close` inside the caller's transaction, at a given time. */
export function closeIn(
	tx: Tx,
	projectId: number,
	lotId: number,
	note: string,
	userId: string,
	now: number
) {
	const lot = lotRow(tx, lotId);
	if (!lot || lot.projectId !== projectId) throw new DomainError('There is no such lot.', 404);
	if (lot.status === 'closed') throw new DomainError(`${lot.label} is already closed.`, 409);
	tx.update(l)
		.set({ status: 'closed', closedAt: now, closedBy: userId, closeNote: note || null })
		.where(eq(l.id, lotId))
		.run();
	audit.record(
		{
			action: 'nde_lot_close',
			entity: 'nde_lot',
			entityId: lotId,
			projectId,
			userId,
			at: now,
			before: { status: 'open' },
			after: { status: 'closed', note }
		},
		tx
	);
	refreshLot(tx, lotId, now);
	return lotRow(tx, lotId)!;
}

/** Undo a close, while no later lot of the same grouping has taken welds. */
export function reopen(projectId: number, lotId: number, userId: string) {
	return db.transaction((tx) => {
		const lot = lotRow(tx, lotId);
		if (!lot || lot.projectId !== projectId) throw new DomainError('There is no such lot.', 404);
		if (lot.status === 'open') throw new DomainError(`${lot.label} is open already.`, 409);
		const later = tx
			.select({ label: l.label })
			.from(l)
			.where(
				and(
					eq(l.projectId, projectId),
					eq(l.method, lot.method),
					eq(l.percent, lot.percent),
					eq(l.kinds, lot.kinds),
					eq(l.groupBy, lot.groupBy),
					eq(l.groupKey, lot.groupKey),
					gt(l.seq, lot.seq)
				)
			)
			.get();
		if (later)
			throw new DomainError(
				`${lot.label} cannot be reopened: later welds of its grouping are in ${later.label}.`,
				409
			);
		const now = Date.now();
		tx.update(l)
			.set({ status: 'open', closedAt: null, closedBy: null, closeNote: null })
			.where(eq(l.id, lotId))
			.run();
		audit.record(
			{
				action: 'nde_lot_reopen',
				entity: 'nde_lot',
				entityId: lotId,
				projectId,
				userId,
				at: now,
				before: { status: 'closed', closedAt: lot.closedAt },
				after: { status: 'open' }
			},
			tx
		);
		refreshLot(tx, lotId, now);
		return lotRow(tx, lotId)!;
	});
}

/**
 * Save the project's lot rule. Lots already formed keep their grouping and extent; welds
 * not yet in a lot of a method the new extent asks are formed into lots at once.
 */
export function saveRule(projectId: number, settings: NdeSettings, userId: string) {
	return db.transaction((tx) => {
		const before = projectRule(tx, projectId);
		const after = {
			groupBy: settings.groupBy,
			everyWelder: settings.everyWelder,
			contractorEmail: settings.contractorEmail,
			extents: settings.extents
		};
		tx.update(schema.projects)
			.set({ ndeLotRule: after })
			.where(eq(schema.projects.id, projectId))
			.run();
		audit.record(
			{
				action: 'settings_change',
				entity: 'project',
				entityId: projectId,
				projectId,
				userId,
				before: { ndeLotRule: before },
				after: { ndeLotRule: after }
			},
			tx
		);
		resetMark(tx, projectId);
		const at = Date.now();
		const touched = formFromWelds(tx, projectId, at);
		for (const lotId of touched) refreshLot(tx, lotId, at);
		return { rule: after, lotsTouched: touched.size };
	});
}
