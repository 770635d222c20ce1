import {
	GAUGED_STAGES,
	JOINT_KINDS,
	type GaugedStage,
	type JointKind,
	type UnitSystem,
	type Verdict
} from '../domain';
import type { ReadingId } from './readings';

/** The joints and stages the engine judges: the record's own lists. */
export const jointKinds = JOINT_KINDS;
export const stages = GAUGED_STAGES;
export const loadings = ['static', 'cyclic'] as const;
export const members = ['primary', 'secondary'] as const;
export const stressDirections = ['transverse', 'parallel'] as const;

export type { JointKind };
export type Stage = GaugedStage;
export type Loading = (typeof loadings)[number];
export type Member = (typeof members)[number];
export type StressDirection = (typeof stressDirections)[number];

/** The joint as the API receives it; lengths as typed, or numbers in mm. */
export interface JointInput {
	kind: JointKind;
	/** material or wall thickness; the thinner part of a butt joint */
	thickness?: string | number;
	/** specified fillet size (leg) */
	requiredSize?: string | number;
	weldLength?: string | number;
	loading?: Loading;
	member?: Member;
	/** direction of the weld to the computed tensile stress */
	stress?: StressDirection;
}

/** A length or angle as typed, a number in mm or degrees, or yes/no for flags. */
export type ReadingValue = string | number | boolean;
export type ReadingsInput = Readonly<Record<string, ReadingValue | null | undefined>>;

export interface EvaluateOptions {
	/** what a bare number means, and which column of a dual-unit code applies; default imperial */
	units?: UnitSystem;
}

// ---- Limits as data -------------------------------------------------------------------------

/**
 * A code value in both of its unit systems. Dual-unit codes (AWS, ASME, API) state that the
 * inch and SI values are not exact equivalents and that each system is used on its own, so the
 * project's unit system picks the column; a plain number is millimetres (or degrees).
 */
export interface Dual {
	in: number;
	mm: number;
}
export type Quantity = number | Dual;

/** What a limit can scale with. `nominalThroat` is 0.7071 × the required fillet size. */
export type Basis = 'thickness' | 'faceWidth' | 'requiredSize' | 'nominalThroat' | 'weldLength';

export type Condition =
	| { kindIn: readonly JointKind[] }
	| { member: Member }
	| { stress: StressDirection }
	| { loading: Loading };

/** Step of a table: `upTo` includes the bound (≤), `below` excludes it (<). */
export type Step = { upTo: Quantity; value: Expr } | { below: Quantity; value: Expr };

/**
 * A limit value. When the joint data it depends on is missing, the engine takes the strictest
 * and the most lenient value it could have, and says "judge" where they disagree.
 */
export type Expr =
	| Quantity
	| { of: Basis; times: number; plus?: Quantity }
	| { by: Basis; steps: readonly Step[]; otherwise: Expr }
	| { when: Condition; then: Expr; otherwise: Expr }
	| { lesserOf: readonly Expr[] }
	| { greaterOf: readonly Expr[] }
	/** the code gives alternatives the joint data cannot tell apart (plate or pipe) */
	| { either: readonly Expr[]; because: string }
	/** the code gives no number: zero is within, anything else is for the inspector */
	| { open: string };

export type LengthAllowance =
	/** accumulated length allowed, e.g. 2 in in any 12 in, or a share of the weld length */
	| { max: Expr }
	/** ISO 5817 "short imperfection": at most 25 mm in any 100 mm, or 25 % of a shorter weld */
	| { short: true };

/**
 * How a measured value is judged. `beyond: 'judge'` is for a code's "should": past the limit
 * the inspector decides instead of the engine rejecting.
 */
export type Rule =
	| { type: 'absent'; beyond?: 'judge' }
	| { type: 'max'; max: Expr; judgeUpTo?: Expr; beyond?: 'judge' }
	| { type: 'min'; min: Expr; judgeAbove?: Expr }
	| { type: 'range'; min: Expr; max: Expr }
	/** depth allowed at any length (`max`), and deeper up to `band.upTo` over a limited length */
	| { type: 'banded'; max: Expr; band?: { upTo: Expr; length: LengthAllowance } };

/** How sure we are of a limit: two or more sources, one source, from memory, trade practice, or set by the project. */
export type Confidence = '2+' | '1' | 'mem' | 'practice' | 'project';

export const checkIds = [
	'rootOpening.range',
	'fillet.gap',
	'socket.gap',
	'bevelAngle.range',
	'rootFace.range',
	'misalignment.max',
	'crack',
	'fusion',
	'overlap',
	'crater',
	'undercut.depth',
	'porosity.max',
	'reinforcement.max',
	'concavity.max',
	'fillet.undersize',
	'fillet.throat.min',
	'fillet.throat.max',
	'fillet.convexity',
	'fillet.asymmetry',
	'socket.filletSize'
] as const;
export type CheckId = (typeof checkIds)[number];

/** Findings also report the length part of a banded limit under these ids. */
export type LengthCheckId = 'undercut.length' | 'fillet.undersizeLength' | 'fillet.throat.length';
export type FindingCheckId = CheckId | LengthCheckId;

export interface Limit {
	rule: Rule;
	/** clause, table or figure of the set's edition */
	clause: string;
	confidence: Confidence;
	/** why the value is what it is, and how sure we are of it */
	note?: string;
	/** defaults come from the check; set here where the code covers other joints */
	kinds?: readonly JointKind[];
	stages?: readonly Stage[];
}

export interface CriteriaSet {
	id: string;
	name: string;
	standard: string;
	edition: string;
	/** 1 for built-in sets; bumped each time a project revises its own */
	version: number;
	scope: string;
	basedOn?: { id: string; version: number };
	/** limits a derived set changed from its base */
	changed?: readonly CheckId[];
	limits: Readonly<Partial<Record<CheckId, Limit>>>;
}

// ---- Results ---------------------------------------------------------------------------------

export type Outcome = Verdict;
export type { Verdict };

/**
 * One check made from the readings. Lengths are mm, angles degrees. A yes/no reading has unit
 * `flag`: measured 1 when present, 0 when absent, limit 0. `limit` is null when the engine could
 * not fix it (the code gives no number, or joint data it depends on is missing). For a range,
 * `limit` is the bound that governs (the one crossed, or the nearer) and `range` has both.
 */
export interface Finding {
	check: FindingCheckId;
	reading: ReadingId;
	measured: number;
	limit: number | null;
	range?: { min: number; max: number };
	unit: 'mm' | 'deg' | 'flag';
	outcome: Outcome;
	clause: string;
	confidence: Confidence;
	note: string;
}

export type JointField =
	'thickness' | 'requiredSize' | 'weldLength' | 'member' | 'stress' | 'loading';

export interface Derived {
	thicknessMm?: number;
	requiredSizeMm?: number;
	weldLengthMm?: number;
	theoreticalThroatMm?: number;
	filletSizeMm?: number;
	nominalThroatMm?: number;
	undersizeMm?: number;
	throatShortfallMm?: number;
	throatExcessMm?: number;
	legAsymmetryMm?: number;
	misalignmentShareOfThickness?: number;
}

/**
 * One reading as the engine read it, as the record keeps it: the text as typed (a number sent
 * in mm or degrees carries its unit, so it reads the same in an inch project), and its value
 * in mm, degrees or yes/no.
 */
export interface ReadReading {
	id: ReadingId;
	text: string;
	value: number | boolean;
	unit: 'mm' | 'deg' | 'bool';
}

export interface Evaluation {
	verdict: Verdict;
	/** every reading given, as read: what the server stores with the record */
	readings: ReadReading[];
	criteria: { id: string; name: string; standard: string; edition: string; version: number };
	findings: Finding[];
	/** readings this stage normally needs, for the checks of this set, that were not given */
	missing: ReadingId[];
	/** joint data a check needed and did not get */
	missingJoint: JointField[];
	derived: Derived;
}

/** An input the engine could not read. `field` is a path: `readings.rootOpening`, `joint.thickness`, `stage`. */
export interface ReadingError {
	field: string;
	message: string;
}

export type EvaluationResult = ({ ok: true } & Evaluation) | { ok: false; errors: ReadingError[] };
