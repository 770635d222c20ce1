import { describe, expect, it } from 'vitest';
import { stageOrderRefusal, type OrderedRecord } from './stage-order';
import { deriveJointState, type StateInput } from './joint-state';

// The order is common practice on piping jobs: fit-up is inspected before welding, the visual
// after it, and NDE only on a weld whose visual was accepted (ASME B31.3-2018 344.7 and 341.4
// place the visual examination before the required NDE).
const at = Date.UTC(2026, 2, 4);
const record = (r: Partial<OrderedRecord> & Pick<OrderedRecord, 'id' | 'stage' | 'decision'>) =>
	({
		repairCycle: 0,
		supersedesId: null,
		inspectedAt: at,
		inspector: 'R. Okafor',
		...r
	}) as OrderedRecord;

function ask(
	stage: 'fitup' | 'visual' | 'nde',
	state: StateInput & { inspections: OrderedRecord[] },
	extra: { method?: 'RT' | 'UT'; correctingId?: number } = {}
) {
	return stageOrderRefusal({
		number: '12',
		stage,
		state,
		derived: deriveJointState(state),
		...extra
	});
}

const base = { voided: false, ndeMethods: ['RT' as const] };

describe('the order of a joint’s records', () => {
	it('takes a fit-up before welding, refuses one after', () => {
		expect(ask('fitup', { ...base, welds: [], inspections: [] })).toBeNull();
		const refusal = ask('fitup', {
			...base,
			welds: [{ repairCycle: 0 }],
			inspections: [record({ id: 1, stage: 'fitup', decision: 'accept' })]
		});
		expect(refusal).toMatchObject({ status: 409, field: 'stage' });
		expect(refusal!.message).toMatch(/already welded \(awaiting visual\)/);
	});

	it('refuses a visual before the weld, and a second visual of the same weld naming the first', () => {
		expect(ask('visual', { ...base, welds: [], inspections: [] })!.message).toMatch(
			/has not been welded yet/
		);
		const welded = {
			...base,
			welds: [{ repairCycle: 0 }],
			inspections: [
				record({ id: 1, stage: 'fitup', decision: 'accept' }),
				record({ id: 2, stage: 'visual', decision: 'reject' })
			]
		};
		const refusal = ask('visual', welded);
		expect(refusal!.message).toMatch(/#2, reject, R\. Okafor on 2026-03-04/);
		expect(refusal!.message).toMatch(/repair weld \(12-R1\) comes next/);
		// A correction of that visual does not count against itself.
		expect(ask('visual', welded, { correctingId: 2 })).toBeNull();
	});

	it('takes NDE after an accepted visual, for a method the joint asks, once', () => {
		const accepted = {
			...base,
			welds: [{ repairCycle: 0 }],
			inspections: [
				record({ id: 1, stage: 'fitup', decision: 'accept' }),
				record({ id: 2, stage: 'visual', decision: 'accept' })
			]
		};
		expect(ask('nde', accepted, { method: 'RT' })).toBeNull();
		expect(ask('nde', accepted, { method: 'UT' })).toMatchObject({ status: 409, field: 'method' });
		const done = {
			...accepted,
			inspections: [
				...accepted.inspections,
				record({ id: 3, stage: 'nde', method: 'RT', decision: 'accept' })
			]
		};
		expect(ask('nde', done, { method: 'RT' })!.message).toMatch(/already has a RT result/);
	});
});
