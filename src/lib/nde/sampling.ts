/**
 * Random NDE sampling of a lot and progressive examination (ASME B31.3-2018 341.3.4), as pure
 * functions of the lot's rows: which welds a seeded selection proposes, whether a swap keeps
 * the sample whole, which tracers a reject calls, and where each weld and welder stands.
 * The server reads the rows and writes what these return; the same rows and seed always give
 * the same answer, so a selection can be drawn again and checked by anyone.
 */
import { mixSeed, shuffled } from '../random';
import { requiredCount } from './extent';

/** A weld in the lot. */
export interface LotMember {
	jointId: number;
	/** Welders of the original weld (root, fill, cap), by id. */
	welders: readonly number[];
	kind: string;
	/** When the original weld was recorded (ms). */
	weldedAt: number;
	/** Welded and visually accepted, so it can be examined now. */
	candidate: boolean;
	/** Voided since (deleted by a revision, or cut out): out of the lot's count, its records kept. */
	voided?: boolean;
}

const live = (m: LotMember) => !m.voided;

/** Why a weld is in the sample: a random draw, a swap for one, the client's pick … */
export const SELECTION_REASONS = [
	'random',
	'swap',
	'client',
	'tracer',
	'full',
	'required'
] as const;
export type SelectionReason = (typeof SELECTION_REASONS)[number];

/** The reasons that make up the random sample itself (tracers and 100 % come on top). */
export const SAMPLE_REASONS: readonly SelectionReason[] = ['random', 'swap', 'client'];

export const REASON_WORDS: Record<SelectionReason, string> = {
	random: 'Random',
	swap: 'Swapped in',
	client: "Client's pick",
	tracer: 'Tracer',
	full: '100 %',
	required: 'Required (100 %)'
};

/** A weld selected in the lot (cancelled ones are left out before these functions see them). */
export interface LotSelection {
	id: number;
	jointId: number;
	reason: SelectionReason;
	/** 0 for the sample, 1 and 2 for tracers, 3 for 100 % of a welder's work. */
	level: number;
	roundId: number | null;
	/** When its round was committed (ms). */
	roundAt: number;
	/** Whose work a tracer or a 100 % selection examines. */
	welderId: number | null;
	/** The selection whose reject called this one. */
	tracerOfId: number | null;
	/** Carried to a cut-out's replacement: its failure calls no tracers (341.3.4(f)). */
	carried: boolean;
	/** The first result of the method on this weld; null while it waits. */
	result: 'accept' | 'reject' | null;
}

/** Tracers (or 100 %) a reject called for one welder. */
export interface TracerCall {
	/** The selection whose reject called them. */
	selectionId: number;
	welderId: number;
	level: number;
	/** How many were asked for, and how many the lot could not give. */
	wanted: number;
	short: number;
	roundId: number | null;
}

export const isSample = (s: Pick<LotSelection, 'reason'>) => SAMPLE_REASONS.includes(s.reason);

// Proposing a selection -------------------------------------------------------------------

export interface ProposalInput {
	members: readonly LotMember[];
	selections: readonly LotSelection[];
	percent: number;
	everyWelder: boolean;
	seed: number;
}

export interface Proposal {
	seed: number;
	/** Welds in the lot (not void). */
	joints: number;
	/** Sample size the percent asks, rounded up. */
	required: number;
	/** Sample welds already selected. */
	sampled: number;
	picks: { jointId: number; welders: number[]; because: 'welder' | 'percent' }[];
	/** Welders with welds that no sample represents yet and no weld ready to examine. */
	unrepresentable: { welderId: number; welds: number }[];
	/** Welds the percent still lacks for want of candidates. */
	short: number;
}

/** For each welder, when their work was last sampled (the latest round holding a weld of theirs). */
function lastSampled(members: readonly LotMember[], selections: readonly LotSelection[]) {
	const byJoint = new Map(members.map((m) => [m.jointId, m]));
	const last = new Map<number, number>();
	for (const s of selections) {
		if (!isSample(s)) continue;
		for (const w of byJoint.get(s.jointId)?.welders ?? [])
			last.set(w, Math.max(last.get(w) ?? -Infinity, s.roundAt));
	}
	return last;
}

/**
 * A random selection that meets the percent (rounded up) and, with `everyWelder`, represents
 * every welder whose welds no sample represents yet (ASME B31.3-2018 341.4.1(b)(1)). Only
 * candidates (welded, visually accepted, not yet selected) are drawn. The candidates are put
 * in a seeded random order once; each welder needing a sample takes the first weld of theirs
 * in that order (one welded since their last sample, where there is one), then the order
 * fills the percent.
 */
export function proposeSelection(input: ProposalInput): Proposal {
	const members = input.members.filter(live);
	const active = new Set(members.map((m) => m.jointId));
	const selections = input.selections.filter((s) => active.has(s.jointId));
	const selected = new Set(selections.map((s) => s.jointId));
	const required = requiredCount(members.length, input.percent);
	const sampled = new Set(selections.filter(isSample).map((s) => s.jointId)).size;
	const order = shuffled(
		members
			.filter((m) => m.candidate && !selected.has(m.jointId))
			.sort((a, b) => a.jointId - b.jointId),
		input.seed
	);
	const picks: Proposal['picks'] = [];
	const picked = new Set<number>();
	const unrepresentable: Proposal['unrepresentable'] = [];

	if (input.everyWelder) {
		const last = lastSampled(members, selections);
		const welders = [...new Set(members.flatMap((m) => m.welders))].sort((a, b) => a - b);
		for (const welder of welders) {
			const since = last.get(welder) ?? -Infinity;
			const waiting = members.filter(
				(m) => m.welders.includes(welder) && !selected.has(m.jointId) && m.weldedAt > since
			);
			if (waiting.length === 0) continue;
			if (picks.some((p) => p.welders.includes(welder))) continue;
			const theirs = order.filter((m) => m.welders.includes(welder) && !picked.has(m.jointId));
			const pick = theirs.find((m) => m.weldedAt > since) ?? theirs[0];
			if (!pick) {
				unrepresentable.push({ welderId: welder, welds: waiting.length });
				continue;
			}
			picks.push({ jointId: pick.jointId, welders: [...pick.welders], because: 'welder' });
			picked.add(pick.jointId);
		}
	}
	const need = Math.max(0, required - sampled);
	for (const m of order) {
		if (picks.length >= need) break;
		if (picked.has(m.jointId)) continue;
		picks.push({ jointId: m.jointId, welders: [...m.welders], because: 'percent' });
		picked.add(m.jointId);
	}
	return {
		seed: input.seed,
		joints: members.length,
		required,
		sampled,
		picks,
		unrepresentable,
		short: Math.max(0, need - picks.length)
	};
}

// Swapping -----------------------------------------------------------------------------------

export interface SwapInput {
	members: readonly LotMember[];
	/** The selection so far: committed rows, or a proposal as rows without results. */
	selections: readonly LotSelection[];
	outJointId: number;
	inJointId: number;
	everyWelder: boolean;
	/** For a tracer: the time of the reject that called it; the weld swapped in is no later. */
	notAfter?: number;
}

/**
 * Why a weld may not take another's place in the selection, or null when it may. A weld
 * with a result stays (a result is never swapped away); the one swapped in is a candidate of
 * the same kind, not selected yet, and carries the welders only the one swapped out
 * represents, so the swap never drops a welder from the sample. A tracer is swapped only for
 * another weld of the same welder's made before the reject; 100 % is never swapped.
 */
export function swapProblem(input: SwapInput): string | null {
	const byJoint = new Map(input.members.map((m) => [m.jointId, m]));
	const out = input.selections.find((s) => s.jointId === input.outJointId);
	if (!out) return 'The weld to swap out is not in the selection.';
	if (out.result) return 'That weld has been examined: a result stands and is never swapped away.';
	if (out.reason === 'full' || out.reason === 'required')
		return 'A weld examined at 100 % cannot be swapped: every weld of that work is examined.';
	const outMember = byJoint.get(out.jointId);
	const inMember = byJoint.get(input.inJointId);
	if (!inMember) return 'The weld to swap in is not in this lot.';
	if (input.selections.some((s) => s.jointId === input.inJointId))
		return 'The weld to swap in is already selected in this lot.';
	if (!inMember.candidate)
		return 'The weld to swap in is not ready for NDE: it must be welded and visually accepted.';
	if (outMember && inMember.kind !== outMember.kind)
		return `The weld to swap in is a ${inMember.kind} weld; the sample keeps its kind (${outMember.kind}).`;
	if (out.reason === 'tracer') {
		if (out.welderId != null && !inMember.welders.includes(out.welderId))
			return "A tracer examines the same welder's work: swap it for another weld of that welder's.";
		if (input.notAfter != null && inMember.weldedAt > input.notAfter)
			return 'A tracer is taken from the work the reject represents: that weld was made after the reject was found.';
		return null;
	}
	if (input.everyWelder && outMember) {
		const others = input.selections.filter(
			(s) => s.jointId !== out.jointId && s.roundId === out.roundId && isSample(s)
		);
		const coveredElsewhere = new Set(others.flatMap((s) => byJoint.get(s.jointId)?.welders ?? []));
		const alone = outMember.welders.filter((w) => !coveredElsewhere.has(w));
		if (alone.some((w) => !inMember.welders.includes(w)))
			return 'The weld swapped in must carry the welders only the weld swapped out represents, so every welder stays represented.';
	}
	return null;
}

// Progressive examination ------------------------------------------------------------------

export interface RejectInput {
	selection: LotSelection;
	/** Welders of the rejected weld; the reject calls tracers of each one's work. */
	welders: readonly number[];
	/** When the reject was recorded (ms). */
	at: number;
	/** True when the weld already had a reject by this method: a repair or replacement failed. */
	repeated: boolean;
	seed: number;
}

export interface Calls {
	calls: {
		welderId: number;
		level: number;
		jointIds: number[];
		wanted: number;
		short: number;
		/** The sub-paragraph of ASME B31.3-2018 341.3.4 that calls them. */
		clause: string;
	}[];
	/** Why none were called, when none were. */
	none?: string;
}

export const TRACERS_PER_REJECT = 2;
export const FULL_LEVEL = 3;

/**
 * What a reject calls (ASME B31.3-2018 341.3.4): a reject in the sample calls two more welds
 * of the same kind by each welder of it, from the same lot (a); a reject among those calls two
 * more for each (c); a reject among those puts all of that welder's work in the lot under
 * examination (e). A repair or replacement that fails again calls none (f). Tracers are taken
 * from welds made no later than the reject was found, candidates only, in a seeded random
 * order; where the lot has too few, the call says how many it is short instead of inventing.
 */
export function callsForReject(
	input: RejectInput,
	members: readonly LotMember[],
	selections: readonly LotSelection[]
): Calls {
	const { selection } = input;
	if (input.repeated || selection.carried)
		return {
			calls: [],
			none: 'A repaired or replaced weld that fails again is repaired again; it calls no tracers (ASME B31.3-2018 341.3.4(f)).'
		};
	if (selection.reason === 'full' || selection.reason === 'required')
		return {
			calls: [],
			none: 'Every weld of this work is examined already (100 %): the reject is repaired and examined again (ASME B31.3-2018 341.3.3).'
		};
	const rejected = members.find((m) => m.jointId === selection.jointId);
	const kind = rejected?.kind;
	const taken = new Set(selections.map((s) => s.jointId));
	taken.add(selection.jointId);
	const calls: Calls['calls'] = [];
	for (const welder of [...new Set(input.welders)].sort((a, b) => a - b)) {
		const level =
			(selection.reason === 'tracer' && selection.welderId === welder ? selection.level : 0) + 1;
		const theirs = members.filter(
			(m) => live(m) && m.welders.includes(welder) && !taken.has(m.jointId)
		);
		if (level >= FULL_LEVEL) {
			const all = theirs.map((m) => m.jointId).sort((a, b) => a - b);
			for (const id of all) taken.add(id);
			calls.push({
				welderId: welder,
				level: FULL_LEVEL,
				jointIds: all,
				wanted: all.length,
				short: 0,
				clause: 'ASME B31.3-2018 341.3.4(e)'
			});
			continue;
		}
		const pool = theirs
			.filter((m) => m.candidate && m.kind === kind && m.weldedAt <= input.at)
			.sort((a, b) => a.jointId - b.jointId);
		const chosen = shuffled(pool, mixSeed(input.seed, `tracers:${selection.id}:${welder}`))
			.slice(0, TRACERS_PER_REJECT)
			.map((m) => m.jointId);
		for (const id of chosen) taken.add(id);
		calls.push({
			welderId: welder,
			level,
			jointIds: chosen,
			wanted: TRACERS_PER_REJECT,
			short: TRACERS_PER_REJECT - chosen.length,
			clause: level === 1 ? 'ASME B31.3-2018 341.3.4(a)' : 'ASME B31.3-2018 341.3.4(c)'
		});
	}
	return { calls };
}

// Where welds and welders stand ------------------------------------------------------------

export interface StandingInput {
	members: readonly LotMember[];
	selections: readonly LotSelection[];
	calls: readonly TracerCall[];
}

/** How a weld of the lot that is not itself selected stands: its lot's sample passed, or not yet. */
export type MemberStanding = 'passed' | 'pending';

/** Welders whose work in the lot is all examined (a reject at the last level of tracers). */
export function fullWelders(selections: readonly LotSelection[]): Set<number> {
	return new Set(
		selections.filter((s) => s.reason === 'full' && s.welderId != null).map((s) => s.welderId!)
	);
}

/**
 * Whether the lot's sample accepts a weld that is not itself selected. For each of its
 * welders: the first round committed after the weld was made that sampled that welder's work
 * represents it (a weld made after an examination is not accepted by it); every weld of
 * that welder's in that round, tracers among them, has a result; every reject among them
 * called its tracers with none short; and the welder's work is not under 100 %. Then the
 * weld is accepted by the sample (341.3.4(b), (d)); otherwise it waits.
 */
export function memberStanding(member: LotMember, input: StandingInput): MemberStanding {
	return standings(input)(member);
}

/**
 * `memberStanding` for many welds of one lot: the lot is read once, and each welder's
 * rounds are judged once however many welds they made.
 */
export function standings(input: StandingInput): (member: LotMember) => MemberStanding {
	const byJoint = new Map(input.members.map((m) => [m.jointId, m]));
	// A weld voided before its examination (deleted by a revision) drops out of the sample.
	const selections = input.selections.filter(
		(s) => !(s.result === null && byJoint.get(s.jointId)?.voided)
	);
	const full = fullWelders(selections);
	const rounds = [
		...new Map(selections.filter(isSample).map((s) => [s.roundId, s.roundAt] as const)).entries()
	].sort((a, b) => a[1] - b[1]);
	const callOf = new Map(input.calls.map((c) => [`${c.selectionId}/${c.welderId}`, c]));
	const weldersOf = (s: LotSelection) => byJoint.get(s.jointId)?.welders ?? [];
	const bears = (s: LotSelection, welder: number) =>
		s.welderId === welder || weldersOf(s).includes(welder);

	/** The rounds that sampled a welder's work, oldest first, each judged once. */
	const judged = new Map<number, { at: number; passed: boolean }[]>();
	function roundsOf(welder: number) {
		let list = judged.get(welder);
		if (list) return list;
		list = [];
		for (const [roundId, at] of rounds) {
			const chain = selections.filter((s) => s.roundId === roundId && bears(s, welder));
			if (!chain.some((s) => isSample(s) && bears(s, welder))) continue;
			let passed = chain.every((s) => s.result !== null);
			for (const s of chain) {
				if (!passed) break;
				if (s.result !== 'reject' || s.carried || s.reason === 'full' || s.reason === 'required')
					continue;
				if (!weldersOf(s).includes(welder)) continue;
				const call = callOf.get(`${s.id}/${welder}`);
				if (!call || call.short > 0) passed = false;
			}
			list.push({ at, passed });
		}
		judged.set(welder, list);
		return list;
	}

	return (member) => {
		if (member.welders.length === 0) return 'pending';
		for (const welder of member.welders) {
			if (full.has(welder)) return 'pending';
			const round = roundsOf(welder).find((r) => r.at >= member.weldedAt);
			if (!round?.passed) return 'pending';
		}
		return 'passed';
	};
}

export type LotStage = 'open' | 'sampled' | 'progressive' | 'full' | 'closed';

export const STAGE_WORDS: Record<LotStage, string> = {
	open: 'Open: sample to draw',
	sampled: 'Sampled',
	progressive: 'Under progressive examination',
	full: '100 % of a welder’s work',
	closed: 'Closed'
};

export interface WelderCoverage {
	welderId: number;
	joints: number;
	selected: number;
	examined: number;
	rejected: number;
	/** Every weld of theirs in the lot is represented by a sample, or selected. */
	represented: boolean;
	/** Their work in the lot is all under examination (341.3.4(e)). */
	full: boolean;
	/** Tracers asked of their work that the lot could not give. */
	short: number;
}

export interface LotSummary {
	joints: number;
	required: number;
	/** Sample welds selected (random, swapped in, client's). */
	sampled: number;
	/** Every weld selected: sample, tracers and 100 %. */
	selected: number;
	examined: number;
	rejected: number;
	/** Sample welds as a percent of the lot's welds. */
	reached: number;
	tracersOpen: number;
	tracersShort: number;
	welders: WelderCoverage[];
	/** The percent is met and, where asked, every welder is represented. */
	sampleMet: boolean;
	/** …and every selected weld has a result, no tracer is open or short. */
	complete: boolean;
	/** Welds not selected and visually accepted that the sample has accepted, and those still waiting on it. */
	acceptedBySample: number;
	waitingOnSample: number;
	stage: LotStage;
}

export function summarizeLot(
	input: StandingInput & { percent: number; everyWelder: boolean; closed: boolean }
): LotSummary {
	const members = input.members.filter(live);
	const byJoint = new Map(input.members.map((m) => [m.jointId, m]));
	const recorded = input.selections.filter((s) => byJoint.has(s.jointId));
	// Selected welds that are still in the lot; a voided weld keeps only its result.
	const current = recorded.filter((s) => !byJoint.get(s.jointId)!.voided);
	const selectedIds = new Set(current.map((s) => s.jointId));
	const required = requiredCount(members.length, input.percent);
	const sampled = new Set(current.filter(isSample).map((s) => s.jointId)).size;
	const examined = recorded.filter((s) => s.result !== null);
	const rejected = recorded.filter((s) => s.result === 'reject');
	const full = fullWelders(current);
	const tracersOpen = current.filter(
		(s) => (s.reason === 'tracer' || s.reason === 'full') && s.result === null
	).length;
	const tracersShort = input.calls.reduce((n, c) => n + c.short, 0);

	let acceptedBySample = 0;
	let waitingOnSample = 0;
	const standingOf = standings(input);
	for (const m of members) {
		// Welds not selected and ready (visually accepted): the sample accepts them, or not yet.
		if (selectedIds.has(m.jointId) || !m.candidate) continue;
		if (standingOf(m) === 'passed') acceptedBySample++;
		else waitingOnSample++;
	}
	const last = lastSampled(members, current);
	const welderIds = [...new Set(members.flatMap((m) => m.welders))].sort((a, b) => a - b);
	const welders = welderIds.map((welderId): WelderCoverage => {
		const theirs = members.filter((m) => m.welders.includes(welderId));
		const mine = current.filter((s) => byJoint.get(s.jointId)?.welders.includes(welderId));
		const since = last.get(welderId) ?? -Infinity;
		return {
			welderId,
			joints: theirs.length,
			selected: mine.length,
			examined: mine.filter((s) => s.result !== null).length,
			rejected: mine.filter((s) => s.result === 'reject').length,
			represented: theirs.every((m) => selectedIds.has(m.jointId) || m.weldedAt <= since),
			full: full.has(welderId),
			short: input.calls.filter((c) => c.welderId === welderId).reduce((n, c) => n + c.short, 0)
		};
	});
	const sampleMet =
		sampled >= required && (!input.everyWelder || welders.every((w) => w.represented));
	const complete =
		sampleMet && current.every((s) => s.result !== null) && tracersOpen === 0 && tracersShort === 0;
	const fullOpen = current.some((s) => s.reason === 'full' && s.result === null);
	const stage: LotStage = fullOpen
		? 'full'
		: tracersOpen > 0 || tracersShort > 0
			? 'progressive'
			: input.closed
				? 'closed'
				: sampleMet
					? 'sampled'
					: 'open';
	return {
		joints: members.length,
		required,
		sampled,
		selected: current.length,
		examined: examined.length,
		rejected: rejected.length,
		reached: members.length ? (100 * sampled) / members.length : 0,
		tracersOpen,
		tracersShort,
		welders,
		sampleMet,
		complete,
		acceptedBySample,
		waitingOnSample,
		stage
	};
}
