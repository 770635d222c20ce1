/** Joints per state, as lists and overviews count them. Pure. */
import { COMPLETE_STATES, JOINT_STATES, type JointState } from './joint-state';

export type StateCounts = Record<JointState, number>;

export function emptyCounts(): StateCounts {
	return Object.fromEntries(JOINT_STATES.map((s) => [s, 0])) as StateCounts;
}

export function totalJoints(counts: StateCounts, { withVoid = true } = {}): number {
	return JOINT_STATES.reduce((sum, s) => (s === 'void' && !withVoid ? sum : sum + counts[s]), 0);
}

/** Joints that need nothing more: accepted on their own records or by their lot's sample. */
export function completeJoints(counts: StateCounts): number {
	return COMPLETE_STATES.reduce((sum, s) => sum + counts[s], 0);
}

/** Accepted share of the live joints (voided ones are out of scope). */
export function acceptedShare(counts: StateCounts): number {
	const live = totalJoints(counts, { withVoid: false });
	return live === 0 ? 0 : completeJoints(counts) / live;
}
