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
/** A butt weld along a plate or a pipe's seam, or round a pipe (girth). */
export const seams = ['longitudinal', 'circumferential'] as const;
/** The flange a fillet or socket weld attaches, where it is one (B31.3 Fig. 328.5.2B). */
export const flangeTypes = ['slip-on', 'socket-welding'] as const;

export type { JointKind };
export type Stage = GaugedStage;
export type Loading = (typeof loadings)[number];
export type Member = (typeof members)[number];
export type StressDirection = (typeof stressDirections)[number];
export type Seam = (typeof seams)[number];
export type FlangeType = (typeof flangeTypes)[number];

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
	/** butt welds: plate or longitudinal seam, or circumferential (girth) */
	seam?: Seam;
	/** outside diameter of pipe; a butt joint with one is a girth weld round it */
	diameter?: string | number;
	/** socket welds and flanges: the socket wall or hub thickness beside the fillet */
	socketWall?: string | number;
	/** fillet or socket welds attaching a flange */
	flange?: FlangeType;
}

/** A length or angle as typed, a number in mm or degrees, or yes/no for flags. */
export type ReadingValue = string | number | boolean;
export type ReadingsInput = Readonly<Record<string, ReadingValue | null | undefined>>;

export interface EvaluateOptions {
	/** what a bare number means, and which column of a dual-unit code applies; default imperial */
	units?: UnitSystem;
	/** the joint design of the joint's WPS: a fit-up is judged against it as well as the code */
	wps?: WpsJointDesign;
}

/** A min–max of a WPS joint design, in mm (or degrees for the bevel). */
export interface DesignRange {
	min: number;
	max: number;
}

/** The joint design a WPS qualifies: each dimension as a min–max, where the WPS gives one. */
export interface WpsJointDesign {
	number: string;
	revision: string;
	rootOpening?: DesignRange;
	rootFace?: DesignRange;
	bevelAngle?: DesignRange;
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
export type Basis =
	| 'thickness'
	| 'faceWidth'
	| 'requiredSize'
	| 'nominalThroat'
	| 'weldLength'
	/** readings a limit scales with: the width of the root bead, the root opening at fit-up */
	| 'rootWidth'
	| 'rootOpening'
	/** joint data: outside diameter, socket wall or flange hub */
	| 'diameter'
	| 'socketWall';

export type Condition =
	| { kindIn: readonly JointKind[] }
	| { member: Member }
	| { stress: StressDirection }
	| { loading: Loading }
	/** `unknown: 'no'`: where the joint does not say, take it as not this seam */
	| { seam: Seam; unknown?: 'no' }
	| { flange: FlangeType }
	/** the joint data or reading is recorded; where it is not, the other branch applies */
	| { given: Basis };

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
	| { sumOf: readonly Expr[] }
	/** the code gives alternatives the joint data cannot tell apart (plate or pipe) */
	| { either: readonly Expr[]; because: string }
	/** the code gives no number: zero is within, anything else is for the inspector */
	| { open: string };

export type LengthAllowance =
	/** accumulated length allowed in any `per` of weld (2 in in any 12 in), or in the whole weld */
	| { max: Expr; per?: Expr }
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
	| { type: 'banded'; max: Expr; band?: { upTo: Expr; length: LengthAllowance } }
	/** an accumulated length (the reading) against an allowance */
	| { type: 'length'; allowance: LengthAllowance };

/**
 * How a limit is sourced: two or more sources, one source, none found (`mem`: shown as
 * unconfirmed), trade practice, or set by the project.
 */
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
	'socket.filletSize',
	'penetration.length',
	'penetration.depth',
	'rootProtrusion.max',
	'rootConcavity.depth',
	'jointThickness.min',
	'porosity.total',
	'pore.largest',
	'pore.count',
	'crater.depth',
	'overlap.size',
	'surfaceFinish.max',
	'flange.filletSize',
	'branch.coverFillet',
	'fillet.gapLeg'
] as const;
export type CheckId = (typeof checkIds)[number];

/** Findings also report the length part of a banded limit under these ids. */
export type LengthCheckId =
	'undercut.length' | 'fillet.undersizeLength' | 'fillet.throat.length' | 'rootConcavity.length';
/** Findings of a fit-up against the joint design of the joint's WPS. */
export type WpsCheckId = 'wps.rootOpening' | 'wps.rootFace' | 'wps.bevelAngle';
export type FindingCheckId = CheckId | LengthCheckId | WpsCheckId;

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
	/** the check applies only where this reading is over the value (the D1.1 fillet gap rule) */
	appliesOver?: { reading: 'rootOpening'; value: Quantity };
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
	/** criteria for indications of radiography or ultrasonic examination, by method */
	volumetric?: VolumetricCriteria;
}

// ---- Results ---------------------------------------------------------------------------------

export type Outcome = Verdict;
export type { Verdict };

/** Where a limit depends on joint data not given: the strictest and the most lenient it can be. */
export interface LimitBounds {
	min: number;
	max: number;
}

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
	/**
	 * Set where `limit` is null because joint data is missing: the limit lies between these,
	 * whatever the reading, so the limit shown never moves with the value typed.
	 */
	bounds?: LimitBounds;
	/** a banded limit: `limit` holds at any length, deeper up to `band.upTo` over a limited length */
	band?: { upTo: number };
	unit: FindingUnit;
	outcome: Outcome;
	clause: string;
	confidence: Confidence;
	note: string;
}

/** mm, degrees, a yes/no flag, a count of pores, or a surface roughness in µm Ra */
export type FindingUnit = 'mm' | 'deg' | 'flag' | 'count' | 'um';

export type JointField =
	| 'thickness'
	| 'requiredSize'
	| 'weldLength'
	| 'member'
	| 'stress'
	| 'loading'
	| 'seam'
	| 'diameter'
	| 'socketWall';

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
	diameterMm?: number;
	socketWallMm?: number;
	/** the circumference of a girth weld, where the weld length was not given */
	girthLengthMm?: number;
}

/**
 * One reading as the engine read it, as the record keeps it: the text as typed (a number sent
 * in mm or degrees carries its unit, so it reads the same in an inch project), and its value
 * in mm, degrees, yes/no, a count, or µm Ra.
 */
export interface ReadReading {
	id: ReadingId;
	text: string;
	value: number | boolean;
	unit: ReadingUnit;
}

/** What a reading holds once read: mm, degrees, yes/no, a count, or µm Ra. */
export type ReadingUnit = 'mm' | 'deg' | 'bool' | 'count' | 'um';

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

// ---- Volumetric examination (RT, UT) ---------------------------------------------------------

export const ndeMethodsJudged = ['RT', 'UT'] as const;
export type VolumetricMethod = (typeof ndeMethodsJudged)[number];

/** Indications an RT or UT report names, in the words of B31.3 and API 1104. */
export const indicationTypes = [
	'crack',
	'craterCrack',
	'lackOfFusion',
	'coldLap',
	'incompletePenetration',
	'hiLoPenetration',
	'crossPenetration',
	'internalConcavity',
	'burnThrough',
	'elongatedSlag',
	'isolatedSlag',
	'tungsten',
	'porosity',
	'clusterPorosity',
	'hollowBead',
	'undercut'
] as const;
export type IndicationType = (typeof indicationTypes)[number];

/** One indication as the API receives it; lengths as typed, or numbers in mm. */
export interface IndicationInput {
	type: IndicationType;
	/** length along the weld (a pore's or cluster's largest dimension) */
	length?: string | number;
	/** width across the weld: a slag line's width, a pore's diameter */
	width?: string | number;
	/** depth or through-wall height, where the method shows it (UT) */
	depth?: string | number;
	/** start of the indication along the weld from the report's datum */
	position?: string | number;
	/** the image is darker than the thinnest adjacent parent metal (RT density) */
	darker?: boolean;
}

/** A dimension of an indication that a limit reads. */
export type IndicationPart =
	'present' | 'length' | 'width' | 'depth' | 'aggregate' | 'share' | 'count' | 'distribution';

/** How one kind of indication is judged; what it leaves out it does not limit. */
export interface IndicationLimit {
	clause: string;
	confidence: Confidence;
	note?: string;
	/** not permitted at all */
	absent?: boolean;
	/** the code sets no number the engine can apply (a chart, a density): for the inspector */
	open?: string;
	/** largest individual length, width, depth */
	length?: Expr;
	width?: Expr;
	depth?: Expr;
	/** accumulated length of all indications of the kind */
	aggregate?: readonly LengthAllowance[];
	/**
	 * Number of indications, in any `per` of weld or in the whole weld; `underDiameter`: the
	 * count is limited only in pipe of a smaller outside diameter (API 1104 burn-through).
	 */
	count?: { max: Expr; per?: Expr; underDiameter?: Quantity };
	/** only indications darker than the thinnest adjacent parent metal count (API 1104 BT) */
	onlyDarker?: boolean;
	/** a darker image is judged as this kind instead (API 1104 internal concavity) */
	darkerAs?: IndicationType;
}

/** Accumulated length of several kinds together (API 1104 9.3.12). */
export interface IndicationGroup {
	id: string;
	label: string;
	types: readonly IndicationType[];
	aggregate: readonly LengthAllowance[];
	clause: string;
	confidence: Confidence;
	note?: string;
}

export interface MethodCriteria {
	/** where the set's criteria for this method are, e.g. "Table 341.3.2, radiography" */
	clause: string;
	limits: Readonly<Partial<Record<IndicationType, IndicationLimit>>>;
	groups?: readonly IndicationGroup[];
	/** why a method of the set has no built-in criteria, shown instead of a verdict */
	notBuiltIn?: string;
}

export type VolumetricCriteria = Readonly<Partial<Record<VolumetricMethod, MethodCriteria>>>;

/** One check of an NDE verdict: like a Finding, for a kind of indication and one dimension. */
export interface IndicationFinding {
	check: `nde.${IndicationType}.${IndicationPart}` | `nde.group.${string}`;
	type: IndicationType | null;
	part: IndicationPart;
	/** index of the governing indication in the list given, or null for an accumulated value */
	indication: number | null;
	measured: number;
	limit: number | null;
	bounds?: LimitBounds;
	unit: FindingUnit;
	outcome: Outcome;
	clause: string;
	confidence: Confidence;
	note: string;
}

export interface IndicationEvaluation {
	verdict: Verdict;
	criteria: Evaluation['criteria'];
	method: VolumetricMethod;
	findings: IndicationFinding[];
	missingJoint: JointField[];
	/** why nothing could be judged: the set has no criteria for this method */
	note?: string;
	/** the indications as read, lengths in mm */
	indications: ParsedIndication[];
}

export interface ParsedIndication {
	type: IndicationType;
	lengthMm?: number;
	widthMm?: number;
	depthMm?: number;
	positionMm?: number;
	darker?: boolean;
}

export type IndicationEvaluationResult =
	({ ok: true } & IndicationEvaluation) | { ok: false; errors: ReadingError[] };
