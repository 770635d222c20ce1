/**
 * Where a weld stands in its lots, for the joint state: a weld not itself selected waits on
 * its lot's sample, then is accepted by it (ASME B31.3-2018 341.3.4(b), (d)). `lotSample` is
 * what `stateInput` (src/lib/server/joints.ts) asks for one joint; `refreshLot` rewrites the
 * cached state of every weld of a lot whose standing a change moved, in the caller's
 * transaction, reading the lot once.
 */
import { and, count, eq, inArray, isNull } from 'drizzle-orm';
import { schema } from '../db';
import { refreshState } from '../joints';
import type { JointState, NdeMethod } from '$lib/joint-state';
import {
	standings,
	summarizeLot,
	type LotMember,
	type LotSelection,
	type MemberStanding
} from '$lib/nde/sampling';
import { calls, firstResults, lotData, toSelection, weldersOf, type Reader, type Tx } from './rows';

const l = schema.ndeLots;
const m = schema.ndeLotJoints;
const s = schema.ndeSelections;

/**
 * Standings worked out for a whole lot, read by `lotSample` while that lot's welds are
 * refreshed (synchronously, inside one transaction), so each weld is not read again.
 */
let preset: Map<number, MemberStanding> | null = null;

/** How one weld of one lot stands, reading only that lot's selections and the weld itself. */
function standingIn(
	reader: Reader,
	lot: { lotId: number; method: NdeMethod; weldedAt: number },
	jointId: number
): MemberStanding {
	const rows = reader
		.select({ row: s, roundAt: schema.ndeRounds.committedAt })
		.from(s)
		.leftJoin(schema.ndeRounds, eq(schema.ndeRounds.id, s.roundId))
		.where(and(eq(s.lotId, lot.lotId), isNull(s.cancelledAt)))
		.all();
	const ids = [...new Set([jointId, ...rows.map((r) => r.row.jointId)])];
	const welders = weldersOf(reader, ids);
	const live = new Set(
		reader
			.select({ id: schema.joints.id })
			.from(schema.joints)
			.where(and(inArray(schema.joints.id, ids), isNull(schema.joints.voidedAt)))
			.all()
			.map((r) => r.id)
	);
	const results = firstResults(
		reader,
		rows.map((r) => r.row.jointId),
		lot.method
	);
	const selections: LotSelection[] = rows.map(({ row, roundAt }) =>
		toSelection(row, roundAt, results.get(row.jointId)?.decision ?? null)
	);
	const members: LotMember[] = ids.map((id) => ({
		jointId: id,
		welders: welders.get(id) ?? [],
		kind: '',
		weldedAt: id === jointId ? lot.weldedAt : 0,
		candidate: false,
		voided: !live.has(id)
	}));
	const me = members.find((x) => x.jointId === jointId)!;
	return standings({ members, selections, calls: calls(reader, lot.lotId) })(me);
}

/**
 * For a weld in NDE lots: 'pending' while a lot where it is not itself selected has not yet
 * accepted it by its sample, 'passed' once every such lot has; null for a weld in no lot, or
 * selected in each of its lots (its own NDE results then say where it stands).
 */
export function lotSample(reader: Reader, jointId: number): MemberStanding | null {
	if (preset?.has(jointId)) return preset.get(jointId)!;
	const lots = reader
		.select({ lotId: m.lotId, weldedAt: m.weldedAt, method: l.method })
		.from(m)
		.innerJoin(l, eq(l.id, m.lotId))
		.where(eq(m.jointId, jointId))
		.all();
	if (lots.length === 0) return null;
	const selectedIn = new Set(
		reader
			.select({ lotId: s.lotId })
			.from(s)
			.where(and(eq(s.jointId, jointId), isNull(s.cancelledAt)))
			.all()
			.map((r) => r.lotId)
	);
	let standing: MemberStanding | null = null;
	for (const lot of lots) {
		if (selectedIn.has(lot.lotId)) continue;
		if (standingIn(reader, lot, jointId) === 'pending') return 'pending';
		standing = 'passed';
	}
	return standing;
}

/** States a weld's lot standing can move it between. */
const LOT_STATES: readonly JointState[] = ['awaiting_lot', 'accepted_by_lot', 'accepted'];

/**
 * After a change to a lot (a selection, a swap, a result, a weld joining it): rewrite the
 * cached state of each weld whose standing moved, and the lot's stage. Call it in the
 * transaction that made the change.
 */
export function refreshLot(tx: Tx, lotId: number, at = Date.now()) {
	const data = lotData(tx, lotId);
	if (!data) return undefined;
	const { lot, members } = data;
	const selectedIds = new Set(data.selections.map((x) => x.jointId));
	const standingOf = standings(data);
	const waiting = members.filter(
		(x) => !x.voided && !selectedIds.has(x.jointId) && LOT_STATES.includes(x.state)
	);
	// A weld in more than one lot (two methods) is judged by all of them, the slow way.
	const inOthers = new Set<number>();
	for (let start = 0; start < waiting.length; start += 500) {
		for (const row of tx
			.select({ jointId: m.jointId, n: count() })
			.from(m)
			.where(
				inArray(
					m.jointId,
					waiting.slice(start, start + 500).map((x) => x.jointId)
				)
			)
			.groupBy(m.jointId)
			.all())
			if (row.n > 1) inOthers.add(row.jointId);
	}
	const known = new Map<number, MemberStanding>();
	const refresh: number[] = [];
	for (const member of waiting) {
		if (inOthers.has(member.jointId)) {
			refresh.push(member.jointId);
			continue;
		}
		const standing = standingOf(member);
		const target = standing === 'passed' ? 'accepted_by_lot' : 'awaiting_lot';
		if (member.state === target) continue;
		known.set(member.jointId, standing);
		refresh.push(member.jointId);
	}
	preset = known;
	try {
		for (const jointId of refresh) refreshState(jointId, tx, at);
	} finally {
		preset = null;
	}
	const summary = summarizeLot({
		members,
		selections: data.selections,
		calls: data.calls,
		percent: lot.percent,
		everyWelder: lot.everyWelder,
		closed: lot.status === 'closed'
	});
	if (summary.stage !== lot.stage)
		tx.update(l).set({ stage: summary.stage }).where(eq(l.id, lotId)).run();
	return { summary, changed: refresh };
}
