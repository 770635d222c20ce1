/**
 * What each role owes on the outstanding board, and how long a joint has waited. Pure: the
 * server builds the lists with it and the board shows the ages with it.
 */
import { JOINT_STATES, STATE_LOOKS, type JointState, type StateOwner } from './joint-state';

export type OwingRole = Exclude<StateOwner, null>;

/** The states each role owes, in the order the work runs; from STATE_LOOKS, written once. */
export const OWED_STATES: Record<OwingRole, JointState[]> = {
	foreman: JOINT_STATES.filter((s) => STATE_LOOKS[s].owner === 'foreman'),
	inspector: JOINT_STATES.filter((s) => STATE_LOOKS[s].owner === 'inspector')
};

export const ROLE_NAMES: Record<OwingRole, string> = {
	foreman: 'Welding foreman',
	inspector: 'Welding inspector'
};

/** The heading of what a role owes, as the crew says it. */
export const WAITING_ON: Record<OwingRole, string> = {
	foreman: 'Waiting on the foreman',
	inspector: 'Waiting on the inspector'
};

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** `3 d 4 h`, `5 h`, `under 1 h`: site people read waits in days and hours. */
export function formatAge(ms: number): string {
	if (!Number.isFinite(ms) || ms < HOUR) return 'under 1 h';
	const days = Math.floor(ms / DAY);
	const hours = Math.floor((ms % DAY) / HOUR);
	return days > 0 ? `${days} d ${hours} h` : `${hours} h`;
}

export type RequestStage = 'fitup' | 'visual';

/**
 * The states a joint may be in for each hold-point request: fit-up before welding (again
 * after a rejected fit-up is corrected), and the final visual once welded.
 */
export const REQUESTABLE_STATES: Record<RequestStage, readonly JointState[]> = {
	fitup: ['awaiting_fitup', 'fitup_rejected'],
	visual: ['awaiting_visual']
};

/** The request a joint in this state can take, if any. */
export function requestStageOf(state: JointState): RequestStage | null {
	if (REQUESTABLE_STATES.visual.includes(state)) return 'visual';
	if (REQUESTABLE_STATES.fitup.includes(state)) return 'fitup';
	return null;
}
