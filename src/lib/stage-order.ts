/**
 * The order of a joint's records: fit-up before welding, visual once welded, NDE after an
 * accepted visual, all of the current repair cycle; one result per stage (per method for NDE)
 * and cycle unless it is a correction. Pure: the server asks it with the rows it read, in the
 * transaction that writes the new record.
 */
import { stageWord, type Refusal } from './domain';
import {
	displayWeldNumber,
	effectiveInspections,
	STATE_LOOKS,
	type DerivedState,
	type InspectionStage,
	type NdeMethod,
	type StateInput,
	type StateInspection
} from './joint-state';

/** A record as the refusal names it: who signed it and when. */
export interface OrderedRecord extends StateInspection {
	inspectedAt: number;
	inspector: string | null;
}

export interface StageOrderInput {
	number: string;
	stage: InspectionStage;
	method?: NdeMethod | null;
	state: StateInput & { inspections: readonly OrderedRecord[] };
	derived: DerivedState;
	/** The id of the record a correction replaces; it does not count against the new one. */
	correctingId?: number;
}

function dateOf(ms: number): string {
	return new Date(ms).toISOString().slice(0, 10);
}

function describe(r: OrderedRecord): string {
	return `#${r.id}, ${r.decision}, ${r.inspector ?? 'inspector'} on ${dateOf(r.inspectedAt)}`;
}

/** Why this record cannot be taken now, or null when it comes in its turn. */
export function stageOrderRefusal(input: StageOrderInput): Refusal | null {
	const { number, stage, state, derived } = input;
	const label = displayWeldNumber(number, derived.repairCycle);
	const welded = state.welds.length > 0;
	const cycle = derived.repairCycle;
	const field = 'stage';
	if (stage === 'fitup') {
		if (!welded) return null;
		return {
			status: 409,
			field,
			message: `Joint ${label} is already welded (${STATE_LOOKS[derived.state].label.toLowerCase()}); fit-up is inspected before welding. Record a visual inspection of the weld instead.`
		};
	}
	if (!welded) {
		const next =
			derived.state === 'ready_to_weld'
				? 'the foreman records the weld with the welder stamps first'
				: 'its fit-up must be accepted and the weld recorded first';
		return {
			status: 409,
			field,
			message: `Joint ${label} has not been welded yet: ${next}, then the ${stageWord(stage, input.method)} result can be recorded.`
		};
	}
	const rows = effectiveInspections(state.inspections).filter(
		(r) => r.repairCycle === cycle && r.id !== input.correctingId
	);
	const previous = (match: (r: OrderedRecord) => boolean) => rows.filter(match).at(-1);
	const visual = previous((r) => r.stage === 'visual');
	if (stage === 'visual') {
		if (!visual) return null;
		const then =
			visual.decision === 'reject'
				? ` It was rejected: the repair weld (${displayWeldNumber(number, cycle + 1)}) comes next, and its own visual after it.`
				: '';
		return {
			status: 409,
			field,
			message: `Weld ${label} already has a visual result (${describe(visual)}).${then} To change that result, record a correction that supersedes it.`
		};
	}
	if (!visual || visual.decision !== 'accept') {
		return {
			status: 409,
			field,
			message: visual
				? `The visual inspection of weld ${label} was rejected (${describe(visual)}): the weld is repaired before any NDE.`
				: `Weld ${label} has no accepted visual inspection yet: NDE comes after the visual is accepted.`
		};
	}
	const method = input.method!;
	if (!state.ndeMethods.includes(method)) {
		const asked = state.ndeMethods.length ? state.ndeMethods.join(', ') : 'none';
		return {
			status: 409,
			field: 'method',
			message: `${method} is not asked of joint ${label} (required or selected: ${asked}). Select the joint for ${method} first, so the result counts toward its state.`
		};
	}
	const nde = previous((r) => r.stage === 'nde' && r.method === method);
	if (!nde) return null;
	return {
		status: 409,
		field,
		message: `Weld ${label} already has a ${method} result (${describe(nde)}). To change it, record a correction that supersedes it.`
	};
}
