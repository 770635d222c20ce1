/**
 * Where a joint stands, derived from its records and never typed in.
 * Also the one place that says how each state looks: label, colour and glyph.
 * Pure: used by the server (cached state column, lists), the viewer and the export.
 */
import { NDE_METHODS, type Decision, type InspectionStage, type NdeMethod } from './domain';

export const JOINT_STATES = [
	'awaiting_fitup',
	'fitup_rejected',
	'ready_to_weld',
	'awaiting_visual',
	'repair',
	'awaiting_nde',
	'awaiting_lot',
	'accepted_by_lot',
	'accepted',
	'void'
] as const;

export type JointState = (typeof JOINT_STATES)[number];

/** The states in which a joint needs nothing more: accepted on its own records, or by its lot's sample. */
export const COMPLETE_STATES = ['accepted_by_lot', 'accepted'] as const satisfies JointState[];

export function isComplete(state: JointState): boolean {
	return (COMPLETE_STATES as readonly JointState[]).includes(state);
}

export { NDE_METHODS, type NdeMethod, type InspectionStage, type Decision };

/** The role that owes the next step; the foreman welds and repairs, the inspector examines. */
export type StateOwner = 'foreman' | 'inspector' | null;

export interface StateLook {
	label: string;
	/** What has to happen next, in the words of the site. */
	next: string;
	owner: StateOwner;
	/** Hex colour, mirrored by the `--color-state-*` tokens in app.css (a test keeps them equal). */
	color: string;
	/** A text colour readable on `color`. */
	onColor: string;
	glyph: Glyph;
}

/**
 * A glyph is drawn in a 20 × 20 box centred on the pin (y down, as in SVG), so the same
 * path data serves the SVG overlay and the stamped PDF. Shapes differ per state, so the map
 * reads without colour.
 */
export interface Glyph {
	/** Outline of the shape. */
	shape: string;
	/** Filled with the state's colour, or drawn as a ring on white. */
	filled: boolean;
	/** A mark inside the shape, stroked. Glyphs are always drawn (SVG, PDF), never typed. */
	mark?: string;
}

const circle = 'M 0 -9 A 9 9 0 1 1 0 9 A 9 9 0 1 1 0 -9 Z';

export const STATE_LOOKS: Record<JointState, StateLook> = {
	awaiting_fitup: {
		label: 'Awaiting fit-up',
		next: 'Fit-up inspection',
		owner: 'inspector',
		color: '#627da0',
		onColor: '#ffffff',
		glyph: { shape: circle, filled: false }
	},
	fitup_rejected: {
		label: 'Fit-up rejected',
		next: 'Correct the fit-up and call the inspector again',
		owner: 'foreman',
		color: '#b5541f',
		onColor: '#ffffff',
		glyph: { shape: circle, filled: false, mark: 'M -6.4 6.4 L 6.4 -6.4' }
	},
	ready_to_weld: {
		label: 'Ready to weld',
		next: 'Weld the joint',
		owner: 'foreman',
		color: '#236972',
		onColor: '#ffffff',
		glyph: { shape: 'M 0 -9.5 L 9.5 7.5 L -9.5 7.5 Z', filled: true }
	},
	awaiting_visual: {
		label: 'Awaiting visual',
		next: 'Visual inspection',
		owner: 'inspector',
		color: '#d17b00',
		onColor: '#1a1a1a',
		glyph: { shape: 'M 0 -10 L 10 0 L 0 10 L -10 0 Z', filled: true }
	},
	repair: {
		label: 'Repair',
		next: 'Repair the weld',
		owner: 'foreman',
		color: '#9b211b',
		onColor: '#ffffff',
		glyph: {
			shape: 'M -8.5 -8.5 L 8.5 -8.5 L 8.5 8.5 L -8.5 8.5 Z',
			filled: true,
			mark: 'M -4.5 -4.5 L 4.5 4.5 M 4.5 -4.5 L -4.5 4.5'
		}
	},
	awaiting_nde: {
		label: 'Awaiting NDE',
		next: 'NDE and its result',
		owner: 'inspector',
		color: '#6a4ba1',
		onColor: '#ffffff',
		glyph: {
			shape: 'M -4.8 -8.5 L 4.8 -8.5 L 9.7 0 L 4.8 8.5 L -4.8 8.5 L -9.7 0 Z',
			filled: true
		}
	},
	// Not selected in its NDE lot: it stands or falls with the lot's sample (ASME B31.3 341.3.4).
	awaiting_lot: {
		label: 'Awaiting lot sample',
		next: "Its lot's NDE sample: selected, examined and passed",
		owner: null,
		color: '#785aff',
		onColor: '#ffffff',
		glyph: {
			shape: 'M -4.8 -8.5 L 4.8 -8.5 L 9.7 0 L 4.8 8.5 L -4.8 8.5 L -9.7 0 Z',
			filled: false,
			mark: 'M -3.5 0 L 3.5 0'
		}
	},
	accepted_by_lot: {
		label: 'Accepted by lot sample',
		next: 'Complete',
		owner: null,
		color: '#0f5a4b',
		onColor: '#ffffff',
		glyph: {
			shape: 'M -8 -8 L 8 -8 L 8 8 L -8 8 Z',
			filled: false,
			mark: 'M -4.6 0.4 L -1.4 3.8 L 5 -3.6'
		}
	},
	accepted: {
		label: 'Accepted',
		next: 'Complete',
		owner: null,
		color: '#3b8654',
		onColor: '#ffffff',
		glyph: { shape: circle, filled: true, mark: 'M -4.6 0.4 L -1.4 3.8 L 5 -3.6' }
	},
	void: {
		label: 'Void',
		next: '—',
		owner: null,
		color: '#868c92',
		onColor: '#ffffff',
		glyph: { shape: circle, filled: false, mark: 'M -5.5 0 L 5.5 0' }
	}
};

/** The inspection rows that matter to the state; superseded corrections are dropped here. */
export interface StateInspection {
	id: number;
	stage: InspectionStage;
	method?: NdeMethod | null;
	repairCycle: number;
	decision: Decision;
	supersedesId?: number | null;
}

export interface StateInput {
	voided: boolean;
	/** NDE methods this joint must pass: its own requirement plus any sample selection. */
	ndeMethods: readonly NdeMethod[];
	welds: readonly { repairCycle: number }[];
	/** In the order they were recorded. */
	inspections: readonly StateInspection[];
	/**
	 * For a weld in an NDE lot that is not itself selected there: whether the lot's sample has
	 * accepted it yet. Absent when the joint is in no such lot.
	 */
	lotSample?: 'passed' | 'pending' | null;
}

export interface DerivedState {
	state: JointState;
	/** 0 for the original weld, 1 for R1 and so on. */
	repairCycle: number;
}

/** The record that corrects each corrected record: id of the corrected row → its correction. */
export function correctionsOf<T extends Standing>(rows: readonly T[]): Map<number, T> {
	const correctionOf = new Map<number, T>();
	for (const row of rows) if (row.supersedesId != null) correctionOf.set(row.supersedesId, row);
	return correctionOf;
}

/** What the standing rule needs of an inspection record. */
export interface Standing {
	id: number;
	supersedesId?: number | null;
}

/**
 * The one rule of which inspection records stand: a correction takes the place of the row it
 * names, in that row's place in the order, so correcting an earlier fit-up never outranks the
 * re-fit recorded after it. Give the rows in the order they were recorded; the joint state,
 * the weld log and its files, the turnover records and the card's history all read it.
 */
export function effectiveInspections<T extends Standing>(inspections: readonly T[]): T[] {
	const ids = new Set(inspections.map((i) => i.id));
	const correctionOf = correctionsOf(inspections);
	const rows: T[] = [];
	for (const i of inspections) {
		if (i.supersedesId != null && ids.has(i.supersedesId)) continue;
		let last = i;
		for (let next = correctionOf.get(last.id); next; next = correctionOf.get(last.id)) last = next;
		rows.push(last);
	}
	return rows;
}

/** Does this record stand, or has a later record corrected it? */
export function stands(record: Standing, rows: readonly Standing[]): boolean {
	return !rows.some((row) => row.supersedesId === record.id);
}

function latest(
	rows: readonly StateInspection[],
	match: (row: StateInspection) => boolean
): StateInspection | undefined {
	for (let i = rows.length - 1; i >= 0; i--) if (match(rows[i])) return rows[i];
	return undefined;
}

export function deriveJointState(input: StateInput): DerivedState {
	const repairCycle = input.welds.reduce((max, w) => Math.max(max, w.repairCycle), 0);
	if (input.voided) return { state: 'void', repairCycle };

	const rows = effectiveInspections(input.inspections);

	if (input.welds.length === 0) {
		const fitup = latest(rows, (r) => r.stage === 'fitup');
		if (!fitup) return { state: 'awaiting_fitup', repairCycle };
		return { state: fitup.decision === 'accept' ? 'ready_to_weld' : 'fitup_rejected', repairCycle };
	}

	const visual = latest(rows, (r) => r.stage === 'visual' && r.repairCycle === repairCycle);
	if (!visual) return { state: 'awaiting_visual', repairCycle };
	if (visual.decision === 'reject') return { state: 'repair', repairCycle };

	let waiting = false;
	for (const method of input.ndeMethods) {
		const nde = latest(
			rows,
			(r) => r.stage === 'nde' && r.method === method && r.repairCycle === repairCycle
		);
		if (nde?.decision === 'reject') return { state: 'repair', repairCycle };
		if (!nde) waiting = true;
	}
	if (waiting) return { state: 'awaiting_nde', repairCycle };
	if (input.lotSample === 'pending') return { state: 'awaiting_lot', repairCycle };
	if (input.lotSample === 'passed') return { state: 'accepted_by_lot', repairCycle };
	return { state: 'accepted', repairCycle };
}

/** The weld number as it is written on the map: `12`, or `12-R1` after a first repair. */
export function displayWeldNumber(number: string, repairCycle: number): string {
	return repairCycle > 0 ? `${number}-R${repairCycle}` : number;
}

/** Parse a joint's NDE requirement such as `RT`, `RT+MT` or `none`. */
export function parseNdeRequirement(text: string | null | undefined): NdeMethod[] {
	if (!text) return [];
	return NDE_METHODS.filter((m) =>
		text
			.toUpperCase()
			.split(/[^A-Z]+/)
			.includes(m)
	);
}
