/**
 * Selecting welds for NDE in a lot: a seeded random proposal that meets the percent and
 * represents every welder, committed as one round with its seed; a swap of a selected weld
 * for another, with the reason; tracers picked again where the lot was short. Every
 * commit, swap and its seed goes to the audit trail, in the same transaction.
 */
import { and, eq, isNull } from 'drizzle-orm';
import { db, schema } from '../db';
import * as audit from '../audit';
import * as events from '../events';
import { refreshState } from '../joints';
import { DomainError } from '../errors';
import { isSeed, mixSeed, newSeed } from '$lib/random';
import {
	callsForReject,
	proposeSelection,
	swapProblem,
	type LotSelection,
	type Proposal
} from '$lib/nde/sampling';
import { jointsInfo, type JointInfo } from './joints-info';
import { lotData, stamps, type LotData, type Reader, type Tx } from './rows';
import { refreshLot } from './standing';

const s = schema.ndeSelections;

export interface Swap {
	out: number;
	in: number;
	reason: string;
}

/** The lot, checked to belong to the project: 404 otherwise. */
export function lotOf(reader: Reader, projectId: number, lotId: number): LotData {
	const data = lotData(reader, lotId);
	if (!data || data.lot.projectId !== projectId)
		throw new DomainError('There is no such lot.', 404);
	return data;
}

function proposal(data: LotData, seed: number): Proposal {
	return proposeSelection({
		members: data.members,
		selections: data.selections,
		percent: data.lot.percent,
		everyWelder: data.lot.everyWelder,
		seed
	});
}

/** Swaps applied to a proposal, each checked against the selection as it stands by then. */
function applySwaps(data: LotData, picks: number[], swaps: readonly Swap[]) {
	const current = [...picks];
	const applied: (Swap & { outLabel?: string })[] = [];
	for (const swap of swaps) {
		const reason = swap.reason.trim();
		if (reason.length < 3)
			throw new DomainError(
				`Say why weld ${swap.out} is swapped out (e.g. "no access: scaffold struck"); the reason stays in the record.`,
				400,
				'reason'
			);
		const rows: LotSelection[] = [
			...data.selections,
			...current.map((jointId, n) => ({
				id: -1 - n,
				jointId,
				reason: 'random' as const,
				level: 0,
				roundId: -1,
				roundAt: Date.now(),
				welderId: null,
				tracerOfId: null,
				carried: false,
				result: null
			}))
		];
		if (!current.includes(swap.out))
			throw new DomainError('Only a weld of this proposal can be swapped out of it.', 409, 'out');
		const problem = swapProblem({
			members: data.members,
			selections: rows,
			outJointId: swap.out,
			inJointId: swap.in,
			everyWelder: data.lot.everyWelder
		});
		if (problem) throw new DomainError(problem, 409, 'in');
		current[current.indexOf(swap.out)] = swap.in;
		applied.push({ ...swap, reason });
	}
	return { picks: current, applied };
}

/** Welds of a proposal or selection, named as the lot page shows them. */
function named(reader: Reader, ids: readonly number[]) {
	const info = jointsInfo(reader, ids);
	return ids.map((id) => info.get(id)).filter((x): x is JointInfo => !!x);
}

/** What a selection with this seed would take now; nothing is written. */
export function propose(projectId: number, lotId: number, seed?: number) {
	if (seed !== undefined && !isSeed(seed))
		throw new DomainError('A seed is a whole number from 0 to 4294967295.', 400, 'seed');
	const data = lotOf(db, projectId, lotId);
	const drawn = proposal(data, seed ?? newSeed());
	const ids = drawn.picks.map((p) => p.jointId);
	const selected = new Set(data.selections.map((x) => x.jointId));
	const welderStamps = stamps(db, [...new Set(drawn.unrepresentable.map((u) => u.welderId))]);
	return {
		lotId,
		seed: drawn.seed,
		joints: drawn.joints,
		required: drawn.required,
		sampled: drawn.sampled,
		short: drawn.short,
		picks: named(db, ids).map((joint) => ({
			...joint,
			because: drawn.picks.find((p) => p.jointId === joint.id)!.because
		})),
		unrepresentable: drawn.unrepresentable.map((u) => ({
			stamp: welderStamps.get(u.welderId) ?? String(u.welderId),
			welds: u.welds
		})),
		candidates: data.members.filter((x) => x.candidate && !selected.has(x.jointId)).length
	};
}

/**
 * Commit the selection the seed draws (a new seed when none is given), with any swaps made to
 * the proposal, as one round of the lot. The selected welds then await NDE.
 */
export function commit(
	projectId: number,
	lotId: number,
	input: { seed?: number; swaps?: Swap[] },
	userId: string
) {
	if (input.seed !== undefined && !isSeed(input.seed))
		throw new DomainError('A seed is a whole number from 0 to 4294967295.', 400, 'seed');
	const seed = input.seed ?? newSeed();
	const result = db.transaction((tx) =>
		commitIn(tx, projectId, lotId, { seed, swaps: input.swaps ?? [] }, userId, Date.now())
	);
	publish(projectId, result.selected);
	return { ...result, joints: named(db, result.selected) };
}

/** `commit` inside the caller's transaction, at a given time (the demo job's calendar). */
export function commitIn(
	tx: Tx,
	projectId: number,
	lotId: number,
	input: { seed: number; swaps: Swap[] },
	userId: string,
	now: number
) {
	const { seed } = input;
	const data = lotOf(tx, projectId, lotId);
	const drawn = proposal(data, seed);
	if (drawn.picks.length === 0) {
		const why =
			drawn.unrepresentable.length > 0
				? 'the welders still to be represented have no weld ready for NDE (welded and visually accepted)'
				: drawn.short > 0
					? 'no weld is ready for NDE (welded and visually accepted)'
					: `the sample is met: ${drawn.sampled} of ${drawn.joints} welds selected (${drawn.required} asked), every welder represented`;
		throw new DomainError(`Nothing to select in ${data.lot.label}: ${why}.`, 409);
	}
	const { picks, applied } = applySwaps(
		data,
		drawn.picks.map((p) => p.jointId),
		input.swaps
	);
	const round = tx
		.insert(schema.ndeRounds)
		.values({
			lotId,
			seed,
			joints: drawn.joints,
			required: drawn.required,
			candidates: data.members.filter((x) => x.candidate).length,
			committedBy: userId,
			committedAt: now
		})
		.returning()
		.get();
	const swappedIn = new Map(applied.map((a) => [a.in, a]));
	for (const jointId of picks) {
		const swap = swappedIn.get(jointId);
		tx.insert(s)
			.values({
				projectId,
				jointId,
				method: data.lot.method,
				lot: data.lot.label,
				lotId,
				roundId: round.id,
				reason: swap ? 'swap' : 'random',
				level: 0,
				note: swap ? `In place of joint ${swap.out}: ${swap.reason}` : null,
				selectedBy: userId,
				selectedAt: now
			})
			.run();
	}
	audit.record(
		{
			action: 'nde_select',
			entity: 'nde_lot',
			entityId: lotId,
			projectId,
			userId,
			at: now,
			after: {
				roundId: round.id,
				seed,
				drawn: drawn.picks.map((p) => p.jointId),
				selected: picks,
				swaps: applied,
				joints: drawn.joints,
				required: drawn.required
			}
		},
		tx
	);
	for (const jointId of picks) refreshState(jointId, tx, now);
	refreshLot(tx, lotId, now);
	return { seed, selected: picks, roundId: round.id };
}

/**
 * Swap a selected weld not yet examined for another of the lot, with the reason. A tracer
 * keeps its welder and level; 100 % is never swapped (src/lib/nde/sampling.ts swapProblem).
 */
export function swap(projectId: number, lotId: number, input: Swap, userId: string) {
	const reason = input.reason.trim();
	if (reason.length < 3)
		throw new DomainError(
			'Say why the weld is swapped (e.g. "no access: scaffold struck"); the reason stays in the record.',
			400,
			'reason'
		);
	const done = db.transaction((tx) => {
		const data = lotOf(tx, projectId, lotId);
		const out = data.selections.find((x) => x.jointId === input.out);
		if (!out) throw new DomainError('That weld is not selected in this lot.', 409, 'out');
		let notAfter: number | undefined;
		if (out.reason === 'tracer' && out.tracerOfId != null) {
			const call = tx
				.select({ at: schema.ndeTracerCalls.calledAt })
				.from(schema.ndeTracerCalls)
				.where(eq(schema.ndeTracerCalls.selectionId, out.tracerOfId))
				.get();
			notAfter = call?.at;
		}
		const problem = swapProblem({
			members: data.members,
			selections: data.selections,
			outJointId: input.out,
			inJointId: input.in,
			everyWelder: data.lot.everyWelder,
			notAfter
		});
		if (problem) throw new DomainError(problem, 409, 'in');
		const now = Date.now();
		tx.update(s)
			.set({
				cancelledAt: now,
				cancelledBy: userId,
				note: `Swapped for joint ${input.in}: ${reason}`
			})
			.where(eq(s.id, out.id))
			.run();
		const added = tx
			.insert(s)
			.values({
				projectId,
				jointId: input.in,
				method: data.lot.method,
				lot: data.lot.label,
				lotId,
				roundId: out.roundId,
				reason: out.reason === 'tracer' ? 'tracer' : 'swap',
				level: out.level,
				welderId: out.welderId,
				tracerOfId: out.tracerOfId,
				replacesId: out.id,
				note: reason,
				selectedBy: userId,
				selectedAt: now
			})
			.returning()
			.get();
		// A tracer swapped in is one of the reject's tracers in place of the one swapped out.
		audit.record(
			{
				action: 'nde_swap',
				entity: 'nde_lot',
				entityId: lotId,
				projectId,
				userId,
				at: now,
				before: { selectionId: out.id, jointId: input.out, reason: out.reason },
				after: {
					selectionId: added.id,
					jointId: input.in,
					reason,
					roundId: out.roundId,
					seed: out.seed
				}
			},
			tx
		);
		refreshState(input.out, tx, now);
		refreshState(input.in, tx, now);
		refreshLot(tx, lotId, now);
		return added;
	});
	publish(projectId, [input.out, input.in]);
	return done;
}

/** Pick again the tracers a reject called that the lot could not give then. */
export function pickShortTracers(projectId: number, lotId: number, userId: string) {
	const result = db.transaction((tx) => {
		const data = lotOf(tx, projectId, lotId);
		const c = schema.ndeTracerCalls;
		const short = tx
			.select()
			.from(c)
			.where(and(eq(c.lotId, lotId), isNull(c.withdrawnAt)))
			.all()
			.filter((call) => call.short > 0);
		if (short.length === 0) throw new DomainError('No tracer of this lot is short.', 409);
		const now = Date.now();
		const picked: number[] = [];
		let selections = data.selections as LotSelection[];
		for (const call of short) {
			const failing = data.selections.find((x) => x.id === call.selectionId);
			if (!failing) continue;
			const reject = call.inspectionId
				? tx
						.select({ at: schema.inspections.inspectedAt })
						.from(schema.inspections)
						.where(eq(schema.inspections.id, call.inspectionId))
						.get()
				: undefined;
			const seedOf = data.selections.find((x) => x.id === call.selectionId)?.seed ?? lotId;
			const calls = callsForReject(
				{
					selection: failing,
					welders: [call.welderId],
					at: reject?.at ?? now,
					repeated: false,
					seed: mixSeed(seedOf, `again:${call.id}:${now}`)
				},
				data.members,
				selections
			);
			const found = (calls.calls[0]?.jointIds ?? []).slice(0, call.short);
			for (const jointId of found) {
				const row = tx
					.insert(s)
					.values({
						projectId,
						jointId,
						method: data.lot.method,
						lot: data.lot.label,
						lotId,
						roundId: failing.roundId,
						reason: 'tracer',
						level: call.level,
						welderId: call.welderId,
						tracerOfId: failing.id,
						note: 'Picked again: the lot was short of tracers when the reject called them',
						selectedBy: userId,
						selectedAt: now
					})
					.returning()
					.get();
				selections = [...selections, { ...failing, id: row.id, jointId, result: null }];
				picked.push(jointId);
			}
			if (found.length > 0)
				tx.update(c)
					.set({ short: call.short - found.length })
					.where(eq(c.id, call.id))
					.run();
		}
		audit.record(
			{
				action: 'nde_tracers_again',
				entity: 'nde_lot',
				entityId: lotId,
				projectId,
				userId,
				at: now,
				after: { picked }
			},
			tx
		);
		for (const jointId of picked) refreshState(jointId, tx, now);
		refreshLot(tx, lotId, now);
		return picked;
	});
	publish(projectId, result);
	return { picked: result };
}

function publish(projectId: number, jointIds: readonly number[]) {
	if (jointIds.length === 0) return;
	const info = jointsInfo(db, jointIds);
	for (const joint of info.values())
		events.publish(projectId, {
			type: 'joint',
			action: 'updated',
			jointId: joint.id,
			drawingId: joint.drawingId
		});
}
