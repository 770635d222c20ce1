/**
 * The words of the record, listed once: joint kinds and locations, inspection stages, NDE
 * methods, verdicts and decisions, weld passes and unit systems, with the labels the screens
 * and messages use. The database schema, the input schemas and the acceptance engine all
 * import these lists, so a value the database stores is a value every input accepts.
 * Pure: no server, database or DOM imports.
 */

export const UNIT_SYSTEMS = ['imperial', 'metric'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

export const JOINT_KINDS = ['butt', 'fillet', 'socket', 'branch'] as const;
export type JointKind = (typeof JOINT_KINDS)[number];

export const JOINT_LOCATIONS = ['shop', 'field'] as const;
export type JointLocation = (typeof JOINT_LOCATIONS)[number];

/** Every stage a record is signed at: fit-up before welding, visual after, then NDE. */
export const INSPECTION_STAGES = ['fitup', 'visual', 'nde'] as const;
export type InspectionStage = (typeof INSPECTION_STAGES)[number];

/** The stages the acceptance engine judges from gauge readings; NDE is the report's own. */
export const GAUGED_STAGES = ['fitup', 'visual'] as const satisfies readonly InspectionStage[];
export type GaugedStage = (typeof GAUGED_STAGES)[number];

export const NDE_METHODS = ['RT', 'UT', 'MT', 'PT'] as const;
export type NdeMethod = (typeof NDE_METHODS)[number];

/** What the engine says of the readings. */
export const VERDICTS = ['within', 'outside', 'judge'] as const;
export type Verdict = (typeof VERDICTS)[number];

/** What the inspector signs. */
export const DECISIONS = ['accept', 'reject'] as const;
export type Decision = (typeof DECISIONS)[number];

export const WELD_PASSES = ['root', 'fill', 'cap'] as const;
export type WeldPass = (typeof WELD_PASSES)[number];

/**
 * A welder stamp as it is compared: Unicode-normalised (NFKC, so a full-width `Ｂ１` is `B1`)
 * and upper-cased in every script (`é1` and `É1` are one stamp). The database keeps this key
 * beside the stamp as typed, under a unique index, so JS and SQL compare stamps one way.
 */
export function stampKey(stamp: string): string {
	return stamp.trim().normalize('NFKC').toLocaleUpperCase('und');
}

/** A stage as a sentence names it ("the fit-up result"), and as a heading or list shows it. */
export const STAGE_LABELS: Record<
	InspectionStage,
	{ word: string; title: string; record: string }
> = {
	fitup: { word: 'fit-up', title: 'Fit-up', record: 'fit-up' },
	visual: { word: 'visual', title: 'Visual', record: 'visual inspection' },
	nde: { word: 'NDE', title: 'NDE', record: 'NDE result' }
};

/** The stage as a sentence names it; an NDE result by its method (`RT`) where it has one. */
export function stageWord(stage: InspectionStage, method?: string | null): string {
	return stage === 'nde' && method ? method : STAGE_LABELS[stage].word;
}

/**
 * The fewest characters a written reason has: a correction, a decision against the verdict,
 * a void, a cut-out or a qualification override. Three letters ("RT1", "fit") is the least
 * that names something; the reason stays with the record.
 */
export const REASON_MIN_LENGTH = 3;

/** Is a written reason long enough to keep with the record? */
export function isReasonGiven(reason: string | null | undefined): reason is string {
	return (reason?.trim().length ?? 0) >= REASON_MIN_LENGTH;
}

/**
 * A decision against the verdict: accepting readings outside the limits, or rejecting
 * readings within them. It needs a written reason and is flagged in the log. A verdict of
 * `judge` (or none, for NDE) leaves the decision to the inspector, so nothing is against it.
 */
export function isAgainstVerdict(decision: Decision, verdict: Verdict | null | undefined): boolean {
	return (
		(decision === 'accept' && verdict === 'outside') ||
		(decision === 'reject' && verdict === 'within')
	);
}

/**
 * A pure rule's "no": the status the server answers, the message a person can act on, and
 * the field it concerns. The server turns it into its domain error; the screens show the
 * message as it is.
 */
export interface Refusal {
	status: 400 | 403 | 404 | 409;
	message: string;
	field?: string;
}
