import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
	deriveJointState,
	displayWeldNumber,
	isComplete,
	JOINT_STATES,
	parseNdeRequirement,
	STATE_LOOKS,
	type StateInput,
	type StateInspection
} from './joint-state';

let nextId = 1;
function row(
	stage: StateInspection['stage'],
	decision: 'accept' | 'reject',
	extra: Partial<StateInspection> = {}
): StateInspection {
	return { id: nextId++, stage, decision, repairCycle: 0, method: null, ...extra };
}

function joint(extra: Partial<StateInput> = {}): StateInput {
	return { voided: false, ndeMethods: [], welds: [], inspections: [], ...extra };
}

describe('joint state from its records', () => {
	it('waits for fit-up until a fit-up inspection is recorded', () => {
		expect(deriveJointState(joint()).state).toBe('awaiting_fitup');
	});

	it('follows the fit-up decision', () => {
		expect(deriveJointState(joint({ inspections: [row('fitup', 'reject')] })).state).toBe(
			'fitup_rejected'
		);
		expect(deriveJointState(joint({ inspections: [row('fitup', 'accept')] })).state).toBe(
			'ready_to_weld'
		);
		// A second fit-up after the correction is the one that counts.
		expect(
			deriveJointState(joint({ inspections: [row('fitup', 'reject'), row('fitup', 'accept')] }))
				.state
		).toBe('ready_to_weld');
	});

	it('waits for visual once welded', () => {
		const s = deriveJointState(
			joint({ welds: [{ repairCycle: 0 }], inspections: [row('fitup', 'accept')] })
		);
		expect(s).toEqual({ state: 'awaiting_visual', repairCycle: 0 });
	});

	it('goes to repair on a visual reject, and back to visual once the repair is welded', () => {
		const fit = row('fitup', 'accept');
		const rejected = row('visual', 'reject');
		expect(
			deriveJointState(joint({ welds: [{ repairCycle: 0 }], inspections: [fit, rejected] }))
		).toEqual({ state: 'repair', repairCycle: 0 });
		expect(
			deriveJointState(
				joint({ welds: [{ repairCycle: 0 }, { repairCycle: 1 }], inspections: [fit, rejected] })
			)
		).toEqual({ state: 'awaiting_visual', repairCycle: 1 });
		expect(
			deriveJointState(
				joint({
					welds: [{ repairCycle: 0 }, { repairCycle: 1 }],
					inspections: [fit, rejected, row('visual', 'accept', { repairCycle: 1 })]
				})
			)
		).toEqual({ state: 'accepted', repairCycle: 1 });
	});

	it('is accepted after visual when no NDE is required', () => {
		const s = deriveJointState(
			joint({
				welds: [{ repairCycle: 0 }],
				inspections: [row('fitup', 'accept'), row('visual', 'accept')]
			})
		);
		expect(s.state).toBe('accepted');
	});

	it('waits for every required NDE method, and repairs on any NDE reject', () => {
		const base = { welds: [{ repairCycle: 0 }], ndeMethods: ['RT', 'MT'] as const };
		const done = [row('fitup', 'accept'), row('visual', 'accept')];
		expect(deriveJointState(joint({ ...base, inspections: done })).state).toBe('awaiting_nde');
		expect(
			deriveJointState(
				joint({ ...base, inspections: [...done, row('nde', 'accept', { method: 'RT' })] })
			).state
		).toBe('awaiting_nde');
		expect(
			deriveJointState(
				joint({
					...base,
					inspections: [
						...done,
						row('nde', 'accept', { method: 'RT' }),
						row('nde', 'accept', { method: 'MT' })
					]
				})
			).state
		).toBe('accepted');
		expect(
			deriveJointState(
				joint({ ...base, inspections: [...done, row('nde', 'reject', { method: 'RT' })] })
			).state
		).toBe('repair');
	});

	it('ignores an NDE result of an earlier repair cycle', () => {
		const s = deriveJointState(
			joint({
				ndeMethods: ['RT'],
				welds: [{ repairCycle: 0 }, { repairCycle: 1 }],
				inspections: [
					row('fitup', 'accept'),
					row('visual', 'accept'),
					row('nde', 'reject', { method: 'RT' }),
					row('visual', 'accept', { repairCycle: 1 })
				]
			})
		);
		expect(s).toEqual({ state: 'awaiting_nde', repairCycle: 1 });
	});

	it('lets a correction supersede the row it names', () => {
		const wrong = row('visual', 'reject');
		const correction = row('visual', 'accept', { supersedesId: wrong.id });
		const s = deriveJointState(
			joint({
				welds: [{ repairCycle: 0 }],
				inspections: [row('fitup', 'accept'), correction, wrong]
			})
		);
		expect(s.state).toBe('accepted');
	});

	it('puts a correction in the place of the row it names, also a correction of a correction', () => {
		// Fit-up rejected, re-fitted and accepted; then the first (rejected) record is corrected
		// for a misread gauge but still rejected. The re-fit's acceptance is still the last word.
		const first = row('fitup', 'reject');
		const refit = row('fitup', 'accept');
		const fixed = row('fitup', 'reject', { supersedesId: first.id });
		expect(deriveJointState(joint({ inspections: [first, refit, fixed] })).state).toBe(
			'ready_to_weld'
		);
		// A visual corrected twice: the last correction in the chain decides.
		const visual = row('visual', 'accept');
		const once = row('visual', 'reject', { supersedesId: visual.id });
		const twice = row('visual', 'accept', { supersedesId: once.id });
		const welded = { welds: [{ repairCycle: 0 }] };
		expect(
			deriveJointState(joint({ ...welded, inspections: [row('fitup', 'accept'), visual, once] }))
				.state
		).toBe('repair');
		expect(
			deriveJointState(
				joint({ ...welded, inspections: [row('fitup', 'accept'), visual, once, twice] })
			).state
		).toBe('accepted');
	});

	// A weld in an NDE lot that is not itself selected stands or falls with the lot's sample:
	// the items a passing sample represents are accepted (ASME B31.3-2018 341.3.4(b), (d)).
	it("waits on its lot's sample, then is accepted by it, once its visual is accepted", () => {
		const visual = {
			welds: [{ repairCycle: 0 }],
			inspections: [row('fitup', 'accept'), row('visual', 'accept')]
		};
		expect(deriveJointState(joint({ ...visual, lotSample: 'pending' })).state).toBe('awaiting_lot');
		expect(deriveJointState(joint({ ...visual, lotSample: 'passed' })).state).toBe(
			'accepted_by_lot'
		);
		expect(deriveJointState(joint({ ...visual, lotSample: null })).state).toBe('accepted');
		// Before its visual, and after a visual reject, the lot changes nothing.
		expect(
			deriveJointState(
				joint({
					welds: [{ repairCycle: 0 }],
					inspections: [row('fitup', 'accept')],
					lotSample: 'passed'
				})
			).state
		).toBe('awaiting_visual');
		expect(
			deriveJointState(
				joint({
					welds: [{ repairCycle: 0 }],
					inspections: [row('fitup', 'accept'), row('visual', 'reject')],
					lotSample: 'passed'
				})
			).state
		).toBe('repair');
	});

	it("puts its own NDE first: selected, it awaits NDE whatever its lot's sample says", () => {
		const visual = {
			welds: [{ repairCycle: 0 }],
			inspections: [row('fitup', 'accept'), row('visual', 'accept')]
		};
		expect(
			deriveJointState(joint({ ...visual, ndeMethods: ['MT'], lotSample: 'passed' })).state
		).toBe('awaiting_nde');
		expect(
			deriveJointState(
				joint({
					...visual,
					ndeMethods: ['MT'],
					lotSample: 'pending',
					inspections: [...visual.inspections, row('nde', 'accept', { method: 'MT' })]
				})
			).state
		).toBe('awaiting_lot');
		expect(isComplete('accepted_by_lot')).toBe(true);
		expect(isComplete('accepted')).toBe(true);
		expect(isComplete('awaiting_lot')).toBe(false);
	});

	it('is void whatever the records say once voided', () => {
		expect(
			deriveJointState(
				joint({ voided: true, welds: [{ repairCycle: 0 }], inspections: [row('fitup', 'accept')] })
			).state
		).toBe('void');
	});
});

describe('state looks', () => {
	it('gives every state a label, a glyph of its own and a colour of its own', () => {
		const shapes = new Set(
			JOINT_STATES.map(
				(s) =>
					`${STATE_LOOKS[s].glyph.shape}|${STATE_LOOKS[s].glyph.filled}|${STATE_LOOKS[s].glyph.mark}`
			)
		);
		const colours = new Set(JOINT_STATES.map((s) => STATE_LOOKS[s].color));
		expect(shapes.size).toBe(JOINT_STATES.length);
		expect(colours.size).toBe(JOINT_STATES.length);
		for (const s of JOINT_STATES) expect(STATE_LOOKS[s].label.length).toBeGreaterThan(2);
	});

	it('matches the colour tokens in app.css', () => {
		const css = fs.readFileSync(new URL('../app.css', import.meta.url), 'utf8');
		for (const state of JOINT_STATES) {
			const token = `--color-state-${state.replaceAll('_', '-')}`;
			const match = new RegExp(`${token}:\\s*(#[0-9a-f]{6})`, 'i').exec(css);
			expect(match?.[1].toLowerCase(), token).toBe(STATE_LOOKS[state].color);
		}
	});
});

describe('weld number with repair suffix and NDE requirement', () => {
	// Common practice: R1, R2 … after the weld number for repairs (a published contractor procedure).
	it('writes the repair cycle after the number', () => {
		expect(displayWeldNumber('12', 0)).toBe('12');
		expect(displayWeldNumber('12', 2)).toBe('12-R2');
	});

	it('reads NDE methods from the requirement text', () => {
		expect(parseNdeRequirement('RT+MT')).toEqual(['RT', 'MT']);
		expect(parseNdeRequirement('100% UT')).toEqual(['UT']);
		expect(parseNdeRequirement('')).toEqual([]);
		expect(parseNdeRequirement('none')).toEqual([]);
	});
});
