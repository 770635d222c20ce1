/**
 * NDE sampling as pure functions: random selection by ASME B31.3-2018 341.4.1(b)(1) (at least
 * 5 %, every welder represented) and progressive examination by 341.3.4, checked against the
 * clause's own steps (reference/standards.md §2d: a failing chain is 1 + 2 + 4 = 7 sampled
 * welds before the lot goes to 100 %).
 */
import { describe, expect, it } from 'vitest';
import {
	callsForReject,
	memberStanding,
	proposeSelection,
	summarizeLot,
	swapProblem,
	type LotMember,
	type LotSelection,
	type TracerCall
} from './sampling';

const DAY = 86_400_000;

/** A lot of `n` butt welds, welder w = 1 + (i % welders), welded one a day. */
function lot(n: number, welders: number, extra: Partial<LotMember> = {}): LotMember[] {
	return Array.from({ length: n }, (_, i) => ({
		jointId: i + 1,
		welders: [1 + (i % welders)],
		kind: 'butt',
		weldedAt: i * DAY,
		candidate: true,
		...extra
	}));
}

let nextId = 1;
function sel(jointId: number, extra: Partial<LotSelection> = {}): LotSelection {
	return {
		id: nextId++,
		jointId,
		reason: 'random',
		level: 0,
		roundId: 1,
		roundAt: 1000 * DAY,
		welderId: null,
		tracerOfId: null,
		carried: false,
		result: null,
		...extra
	};
}

describe('a proposed selection (ASME B31.3-2018 341.4.1(b)(1))', () => {
	it('meets the percent, rounded up, and represents every welder', () => {
		const members = lot(100, 8);
		const p = proposeSelection({ members, selections: [], percent: 5, everyWelder: true, seed: 7 });
		expect(p.required).toBe(5);
		// Eight welders each need a weld of theirs in the sample: eight, more than 5 %.
		expect(p.picks).toHaveLength(8);
		expect(new Set(p.picks.flatMap((x) => x.welders))).toEqual(new Set([1, 2, 3, 4, 5, 6, 7, 8]));
		expect(p.short).toBe(0);
		expect(p.unrepresentable).toEqual([]);

		const few = proposeSelection({
			members: lot(200, 3),
			selections: [],
			percent: 5,
			everyWelder: true,
			seed: 7
		});
		expect(few.required).toBe(10);
		expect(few.picks).toHaveLength(10);
		expect(new Set(few.picks.flatMap((x) => x.welders)).size).toBe(3);
	});

	it('gives the same selection for the same candidates and seed, another for another seed', () => {
		const members = lot(500, 12);
		const a = proposeSelection({
			members,
			selections: [],
			percent: 5,
			everyWelder: true,
			seed: 42
		});
		const b = proposeSelection({
			members: [...members].reverse(),
			selections: [],
			percent: 5,
			everyWelder: true,
			seed: 42
		});
		const c = proposeSelection({
			members,
			selections: [],
			percent: 5,
			everyWelder: true,
			seed: 43
		});
		expect(b.picks.map((p) => p.jointId)).toEqual(a.picks.map((p) => p.jointId));
		expect(c.picks.map((p) => p.jointId)).not.toEqual(a.picks.map((p) => p.jointId));
	});

	it('draws only candidates: welded, visually accepted, not selected, not void', () => {
		const members = lot(40, 2).map((m) => ({
			...m,
			candidate: m.jointId % 4 === 0,
			voided: m.jointId === 8
		}));
		const p = proposeSelection({
			members,
			selections: [sel(4)],
			percent: 20,
			everyWelder: false,
			seed: 1
		});
		// 39 live welds: 20 % is 8; one is selected already, so seven more.
		expect(p.required).toBe(8);
		expect(p.sampled).toBe(1);
		// Only 12, 16, … 40 are left to draw: eight candidates, not 4 (selected) nor 8 (void).
		for (const pick of p.picks) {
			expect(pick.jointId % 4).toBe(0);
			expect([4, 8]).not.toContain(pick.jointId);
		}
		expect(p.picks).toHaveLength(7);
		expect(p.short).toBe(0);
	});

	it('says so when a welder has welds but none ready to examine, and when the percent cannot be met', () => {
		const members = lot(10, 2).map((m) => ({ ...m, candidate: m.welders[0] === 1 }));
		const p = proposeSelection({
			members,
			selections: [],
			percent: 100,
			everyWelder: true,
			seed: 3
		});
		expect(p.unrepresentable).toEqual([{ welderId: 2, welds: 5 }]);
		expect(p.picks).toHaveLength(5);
		expect(p.short).toBe(5);
	});

	it("asks a new sample of a welder's welds made since their last one (a weld made after an examination is not accepted by it)", () => {
		const members = lot(40, 2);
		// Welder 1's work was sampled at day 20; welder 2's at day 100 (after all their welds).
		const selections = [sel(1, { roundAt: 20 * DAY }), sel(2, { roundAt: 100 * DAY, roundId: 2 })];
		const p = proposeSelection({ members, selections, percent: 5, everyWelder: true, seed: 9 });
		expect(p.required).toBe(2);
		expect(p.picks).toHaveLength(1);
		const pick = members.find((m) => m.jointId === p.picks[0].jointId)!;
		expect(pick.welders).toEqual([1]);
		expect(pick.weldedAt).toBeGreaterThan(20 * DAY);
	});
});

describe('swapping a selected weld', () => {
	const members = lot(20, 2);
	it('keeps every welder represented and refuses to swap away a result', () => {
		const selections = [sel(1), sel(2)];
		const swap = (outJointId: number, inJointId: number, s = selections) =>
			swapProblem({ members, selections: s, outJointId, inJointId, everyWelder: true });
		expect(swap(1, 3)).toBeNull(); // 1 and 3 are welder 1's
		expect(swap(1, 4)).toMatch(/every welder stays represented/);
		expect(swap(1, 2)).toMatch(/already selected/);
		expect(swap(5, 3)).toMatch(/not in the selection/);
		expect(swap(1, 3, [sel(1, { result: 'accept' }), sel(2)])).toMatch(/never swapped away/);
		expect(swap(1, 3, [sel(1, { reason: 'full', welderId: 1 })])).toMatch(/100 %/);
	});

	it("keeps a tracer to the same welder's work made before the reject", () => {
		const selections = [sel(1, { reason: 'tracer', level: 1, welderId: 1 })];
		const problem = (inJointId: number) =>
			swapProblem({
				members,
				selections,
				outJointId: 1,
				inJointId,
				everyWelder: true,
				notAfter: 10 * DAY
			});
		expect(problem(3)).toBeNull();
		expect(problem(4)).toMatch(/same welder/);
		expect(problem(13)).toMatch(/after the reject/);
	});
});

describe('progressive examination (ASME B31.3-2018 341.3.4)', () => {
	const members = lot(60, 3);
	const at = 200 * DAY;

	it('341.3.4(a): one reject in the sample calls two more of the same kind by the same welder', () => {
		const reject = sel(1, { result: 'reject' });
		const { calls } = callsForReject(
			{ selection: reject, welders: [1], at, repeated: false, seed: 5 },
			members,
			[reject]
		);
		expect(calls).toHaveLength(1);
		expect(calls[0]).toMatchObject({ welderId: 1, level: 1, wanted: 2, short: 0 });
		expect(calls[0].clause).toBe('ASME B31.3-2018 341.3.4(a)');
		for (const id of calls[0].jointIds) {
			expect(members.find((m) => m.jointId === id)!.welders).toEqual([1]);
			expect(id).not.toBe(1);
		}
	});

	it('341.3.4(c): a failed tracer calls two more for each failure', () => {
		const reject = sel(1, { result: 'reject' });
		const t1 = sel(4, {
			reason: 'tracer',
			level: 1,
			welderId: 1,
			tracerOfId: reject.id,
			result: 'reject'
		});
		const t2 = sel(7, {
			reason: 'tracer',
			level: 1,
			welderId: 1,
			tracerOfId: reject.id,
			result: 'reject'
		});
		const all = [reject, t1, t2];
		const first = callsForReject(
			{ selection: t1, welders: [1], at, repeated: false, seed: 5 },
			members,
			all
		);
		expect(first.calls[0]).toMatchObject({ level: 2, wanted: 2, short: 0 });
		expect(first.calls[0].clause).toBe('ASME B31.3-2018 341.3.4(c)');
		const second = callsForReject(
			{ selection: t2, welders: [1], at, repeated: false, seed: 5 },
			members,
			[
				...all,
				...first.calls[0].jointIds.map((id) => sel(id, { reason: 'tracer', level: 2, welderId: 1 }))
			]
		);
		// Two for each failure: four second-level tracers in all, none twice.
		const four = [...first.calls[0].jointIds, ...second.calls[0].jointIds];
		expect(new Set(four).size).toBe(4);
	});

	it("341.3.4(e): a failure at that level puts all of that welder's work in the lot under examination", () => {
		const t = sel(10, { reason: 'tracer', level: 2, welderId: 1, result: 'reject' });
		const selections = [sel(1, { result: 'reject' }), t];
		const { calls } = callsForReject(
			{ selection: t, welders: [1], at, repeated: false, seed: 5 },
			members,
			selections
		);
		expect(calls[0]).toMatchObject({ welderId: 1, level: 3, short: 0 });
		expect(calls[0].clause).toBe('ASME B31.3-2018 341.3.4(e)');
		// Welder 1 made 20 welds; two are selected already: the other 18 are all examined.
		expect(calls[0].jointIds).toHaveLength(18);
	});

	it('341.3.4(f): a repaired or replaced weld that fails again calls no tracers', () => {
		const reject = sel(1, { result: 'reject' });
		const repaired = callsForReject(
			{ selection: reject, welders: [1], at, repeated: true, seed: 5 },
			members,
			[reject]
		);
		expect(repaired.calls).toEqual([]);
		expect(repaired.none).toMatch(/341\.3\.4\(f\)/);
		const carried = sel(2, { carried: true, result: 'reject' });
		expect(
			callsForReject({ selection: carried, welders: [2], at, repeated: false, seed: 5 }, members, [
				carried
			]).calls
		).toEqual([]);
	});

	it('calls tracers of each welder of a weld made by two, and the same ones for the same seed', () => {
		const two = members.map((m) => (m.jointId === 1 ? { ...m, welders: [1, 2] } : m));
		const reject = sel(1, { result: 'reject' });
		const input = { selection: reject, welders: [1, 2], at, repeated: false, seed: 11 };
		const a = callsForReject(input, two, [reject]);
		expect(a.calls.map((c) => c.welderId)).toEqual([1, 2]);
		expect(callsForReject(input, two, [reject])).toEqual(a);
	});

	it('says how many tracers the lot is short rather than inventing them', () => {
		const small = lot(4, 2); // welder 1: welds 1 and 3
		const reject = sel(1, { result: 'reject' });
		const { calls } = callsForReject(
			{ selection: reject, welders: [1], at, repeated: false, seed: 5 },
			small,
			[reject]
		);
		expect(calls[0]).toMatchObject({ jointIds: [3], wanted: 2, short: 1 });
	});

	it('takes tracers only from welds made before the reject was found, and ready to examine', () => {
		const members2 = lot(30, 1).map((m) => ({ ...m, candidate: m.jointId !== 2 }));
		const reject = sel(1, { result: 'reject' });
		const { calls } = callsForReject(
			{ selection: reject, welders: [1], at: 3.5 * DAY, repeated: false, seed: 5 },
			members2,
			[reject]
		);
		// Welds 2 (no accepted visual) and 5… (made after the reject) are out: only 3 and 4.
		expect(calls[0].jointIds.sort()).toEqual([3, 4]);
	});
});

describe('where the lot and its welds stand', () => {
	const members = lot(40, 2);

	it('341.3.4(b): welds not selected are accepted once the sample and its tracers pass', () => {
		const reject = sel(1, { result: 'reject' });
		const t1 = sel(3, { reason: 'tracer', level: 1, welderId: 1, tracerOfId: reject.id });
		const t2 = sel(5, { reason: 'tracer', level: 1, welderId: 1, tracerOfId: reject.id });
		const other = sel(2, { result: 'accept' });
		const call: TracerCall = {
			selectionId: reject.id,
			welderId: 1,
			level: 1,
			wanted: 2,
			short: 0,
			roundId: 1
		};
		const member = members[6]; // joint 7, welder 1
		const input = { members, selections: [reject, t1, t2, other], calls: [call] };
		expect(memberStanding(member, input)).toBe('pending');
		t1.result = 'accept';
		t2.result = 'accept';
		expect(memberStanding(member, input)).toBe('passed');
		expect(memberStanding(members[1 + 6], input)).toBe('passed'); // joint 8, welder 2
		// A reject without its call, or with tracers short, does not pass.
		expect(memberStanding(member, { ...input, calls: [] })).toBe('pending');
		expect(memberStanding(member, { ...input, calls: [{ ...call, short: 1 }] })).toBe('pending');
	});

	it('does not accept a weld made after the round that sampled its welder', () => {
		const late = { ...members[0], jointId: 99, weldedAt: 2000 * DAY };
		const input = {
			members: [...members, late],
			selections: [sel(1, { result: 'accept' }), sel(2, { result: 'accept' })],
			calls: []
		};
		expect(memberStanding(members[2], input)).toBe('passed');
		expect(memberStanding(late, input)).toBe('pending');
	});

	it('summarises the stage: open, sampled, under progressive, 100 %, closed', () => {
		const base = {
			members,
			percent: 5,
			everyWelder: true,
			closed: false,
			calls: [] as TracerCall[]
		};
		expect(summarizeLot({ ...base, selections: [] }).stage).toBe('open');
		const sampled = summarizeLot({ ...base, selections: [sel(1), sel(2)] });
		expect(sampled).toMatchObject({
			stage: 'sampled',
			required: 2,
			sampled: 2,
			sampleMet: true,
			complete: false
		});
		expect(sampled.reached).toBe(5);
		const reject = sel(1, { result: 'reject' });
		const progressive = summarizeLot({
			...base,
			selections: [
				reject,
				sel(2, { result: 'accept' }),
				sel(3, { reason: 'tracer', level: 1, welderId: 1 })
			],
			calls: [{ selectionId: reject.id, welderId: 1, level: 1, wanted: 2, short: 1, roundId: 1 }]
		});
		expect(progressive).toMatchObject({
			stage: 'progressive',
			tracersOpen: 1,
			tracersShort: 1,
			rejected: 1
		});
		expect(
			summarizeLot({
				...base,
				selections: [sel(1), sel(2), sel(3, { reason: 'full', level: 3, welderId: 1 })]
			}).stage
		).toBe('full');
		const closed = summarizeLot({
			...base,
			closed: true,
			selections: [sel(1, { result: 'accept' }), sel(2, { result: 'accept' })]
		});
		expect(closed).toMatchObject({
			stage: 'closed',
			complete: true,
			acceptedBySample: 38,
			waitingOnSample: 0
		});
		expect(closed.welders).toEqual([
			{
				welderId: 1,
				joints: 20,
				selected: 1,
				examined: 1,
				rejected: 0,
				represented: true,
				full: false,
				short: 0
			},
			{
				welderId: 2,
				joints: 20,
				selected: 1,
				examined: 1,
				rejected: 0,
				represented: true,
				full: false,
				short: 0
			}
		]);
	});
});
