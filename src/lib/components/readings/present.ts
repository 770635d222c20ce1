/**
 * How readings and findings are shown on the joint card: which fields a stage asks for, the
 * gauge values offered as chips, and findings in the project's units. Pure, so it is tested on
 * its own and the components stay small.
 */
import {
	checkIds,
	quantitySpec,
	parseReading,
	readingDefinitions,
	readingIds,
	type CheckId,
	type CriteriaSet,
	type Evaluation,
	type EvaluationResult,
	type Finding,
	type FindingCheckId,
	type JointField,
	type JointInput,
	type JointKind,
	type Outcome,
	type ReadingId,
	type Stage
} from '$lib/acceptance';
import type { WpsJointDesign } from '$lib/acceptance/types';
import { checkDefinitions } from '$lib/acceptance/checks';
import {
	formatAngle,
	formatBoth,
	formatLength,
	parseAngle,
	parseLength,
	type ParsedQuantity,
	type UnitSystem
} from '$lib/units';

/** The caution beside every verdict, worded once in `$lib/caution`. */
export { CAUTION as verdictCaution } from '$lib/caution';

export interface SegmentedOption<V> {
	value: V;
	label: string;
	detail?: string;
}

/** What a form holds: the text typed for a length or angle, yes/no for a flag. */
export type ReadingEntries = Partial<Record<ReadingId, string | boolean>>;

// ---- Outcomes ------------------------------------------------------------------------------

export interface OutcomeLook {
	word: string;
	/** the banner's heading for a whole inspection */
	verdict: string;
	text: string;
	border: string;
	fill: string;
}

/** Colour never stands alone: each outcome also has its word and a glyph (OutcomeBadge). */
export const outcomeLooks: Record<Outcome, OutcomeLook> = {
	within: {
		word: 'within',
		verdict: 'Within the criteria',
		text: 'text-ok',
		border: 'border-ok',
		fill: 'bg-ok/10'
	},
	outside: {
		word: 'outside',
		verdict: 'Outside the criteria',
		text: 'text-danger',
		border: 'border-danger',
		fill: 'bg-danger/10'
	},
	judge: {
		word: 'needs judgement',
		verdict: 'Needs judgement',
		text: 'text-ink',
		border: 'border-signal',
		fill: 'bg-signal/15'
	}
};

const severity: Record<Outcome, number> = { within: 0, judge: 1, outside: 2 };

/** The length part of a banded limit, reported as a finding of its own. */
const lengthParts: Partial<Record<FindingCheckId, { check: FindingCheckId; reading: ReadingId }>> =
	{
		'undercut.depth': { check: 'undercut.length', reading: 'undercutLength' },
		'fillet.undersize': { check: 'fillet.undersizeLength', reading: 'undersizeLength' },
		'fillet.throat.min': { check: 'fillet.throat.length', reading: 'undersizeLength' },
		'rootConcavity.depth': { check: 'rootConcavity.length', reading: 'rootConcavityLength' }
	};

export interface FieldVerdict {
	finding?: Finding;
	/** a reading its limit still waits for, such as the length of undercut deeper than 1/32 in */
	pending?: ReadingId;
}

/**
 * What to show beside a reading: the worst finding it took part in. A depth within the deeper
 * band of a banded limit is only within over a limited length, so the length finding counts too.
 */
export function fieldVerdict(evaluation: Evaluation | undefined, reading: ReadingId): FieldVerdict {
	if (!evaluation) return {};
	const own = evaluation.findings.filter((finding) => finding.reading === reading);
	const parts = own.flatMap((finding) => {
		const part = lengthParts[finding.check];
		return part ? [part] : [];
	});
	const related = [
		...own,
		...evaluation.findings.filter((finding) => parts.some((part) => part.check === finding.check))
	];
	let worst: Finding | undefined;
	for (const finding of related) {
		if (!worst || severity[finding.outcome] > severity[worst.outcome]) worst = finding;
	}
	const pending = parts.find((part) => evaluation.missing.includes(part.reading))?.reading;
	return pending ? { finding: worst, pending } : { finding: worst };
}

// ---- Which readings a stage asks for ---------------------------------------------------------

/** The readings each check reads, including the ones its limit scales with. */
const readsOf: Record<CheckId, readonly ReadingId[]> = {
	'rootOpening.range': ['rootOpening'],
	'fillet.gap': ['rootOpening'],
	'socket.gap': ['rootOpening'],
	'bevelAngle.range': ['bevelAngle'],
	'rootFace.range': ['rootFace'],
	'misalignment.max': ['misalignment'],
	crack: ['crack'],
	fusion: ['incompleteFusion'],
	overlap: ['overlap'],
	crater: ['craterUnfilled'],
	'undercut.depth': ['undercutDepth', 'undercutLength'],
	'porosity.max': ['porosity'],
	'reinforcement.max': ['reinforcement'],
	'concavity.max': ['concavity'],
	'fillet.undersize': ['filletLeg1', 'filletLeg2', 'throat', 'undersizeLength'],
	'fillet.throat.min': ['filletLeg1', 'filletLeg2', 'throat', 'undersizeLength'],
	'fillet.throat.max': ['filletLeg1', 'filletLeg2', 'throat'],
	'fillet.convexity': ['convexity'],
	'fillet.asymmetry': ['filletLeg1', 'filletLeg2'],
	'socket.filletSize': ['filletLeg1', 'filletLeg2', 'throat'],
	'penetration.length': ['incompletePenetrationLength'],
	'penetration.depth': ['incompletePenetrationDepth'],
	'rootProtrusion.max': ['rootProtrusion'],
	'rootConcavity.depth': ['rootConcavity', 'rootConcavityLength'],
	'jointThickness.min': ['jointThickness', 'concavity', 'rootConcavity'],
	'porosity.total': ['porosityTotal'],
	'pore.largest': ['poreLargest'],
	'pore.count': ['poreCount'],
	'crater.depth': ['craterDepth'],
	'overlap.size': ['overlapSize'],
	'surfaceFinish.max': ['surfaceRoughness'],
	'flange.filletSize': ['filletLeg1', 'filletLeg2', 'throat'],
	'branch.coverFillet': ['filletLeg1', 'filletLeg2', 'throat'],
	'fillet.gapLeg': ['rootOpening']
};

/** True when a limit's data scales with `basis` somewhere inside it. */
function scalesWith(value: unknown, basis: string): boolean {
	if (Array.isArray(value)) return value.some((item) => scalesWith(item, basis));
	if (typeof value !== 'object' || value === null) return false;
	const record = value as Record<string, unknown>;
	if (record.of === basis || record.by === basis) return true;
	return Object.values(record).some((item) => scalesWith(item, basis));
}

export interface StageReading {
	id: ReadingId;
	/** false where the set makes no check with it: the reading is recorded, not judged */
	judged: boolean;
}

/**
 * Checks whose readings every inspection of the stage records, whether or not the set judges
 * them: the fit-up, the profile, undercut, porosity and the flags. Readings only some codes
 * judge (root side, pore counts, surface finish) are asked where the set makes the check.
 */
const RECORDED_ANYWAY: readonly CheckId[] = [
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
];

/** Readings a limit scales with: they feed other checks and are never "recorded only". */
const BASES: readonly ReadingId[] = ['wallThickness', 'faceWidth', 'rootWidth'];

/**
 * The readings a stage asks for on this joint kind: those the set's checks read, those every
 * inspection records (so a fit-up is recorded in full even where the set leaves it to the
 * WPS), the face or root bead width where one of the set's limits scales with it, and at
 * fit-up the wall thickness, which stands in for the joint's thickness when that is not
 * recorded.
 */
export function readingsFor(set: CriteriaSet, kind: JointKind, stage: Stage): StageReading[] {
	const asked = new Set<ReadingId>(stage === 'fitup' ? ['wallThickness'] : []);
	const judged = new Set<ReadingId>();
	for (const check of checkIds) {
		const definition = checkDefinitions[check];
		const limit = set.limits[check];
		const applies = (kinds: readonly JointKind[], stages: readonly Stage[]) =>
			kinds.includes(kind) && stages.includes(stage);
		const inSet =
			limit !== undefined &&
			applies(limit.kinds ?? definition.kinds, limit.stages ?? definition.stages);
		if (
			!inSet &&
			!(RECORDED_ANYWAY.includes(check) && applies(definition.kinds, definition.stages))
		)
			continue;
		for (const reading of readsOf[check]) {
			asked.add(reading);
			if (inSet) judged.add(reading);
		}
		if (inSet && scalesWith(limit.rule, 'faceWidth')) asked.add('faceWidth');
		if (inSet && scalesWith(limit.rule, 'rootWidth')) asked.add('rootWidth');
	}
	return readingIds
		.filter((id) => asked.has(id))
		.map((id) => ({ id, judged: judged.has(id) || BASES.includes(id) }));
}

/** Readings taken from the root side of a weld, where the root can be seen. */
export const ROOT_SIDE: readonly ReadingId[] = [
	'rootProtrusion',
	'rootWidth',
	'rootConcavity',
	'rootConcavityLength',
	'jointThickness',
	'incompletePenetrationLength',
	'incompletePenetrationDepth'
];

/** The trade's name for a reading on this joint: a fillet's root opening is its gap. */
export function readingLabel(id: ReadingId, kind?: JointKind, stage?: Stage): string {
	if (id === 'rootOpening' && kind === 'fillet' && stage === 'visual') {
		return 'Root opening at fit-up (gap)';
	}
	if (id === 'rootOpening' && kind === 'fillet') return 'Root opening (gap)';
	if (id === 'rootOpening' && kind === 'socket') return 'Gap before welding';
	if (id === 'wallThickness' && kind === 'fillet') return 'Material thickness';
	return readingDefinitions[id].label;
}

export const jointFieldLabels: Record<JointField, string> = {
	thickness: 'thickness',
	requiredSize: 'required fillet size',
	weldLength: 'weld length',
	member: 'member (primary or secondary)',
	stress: 'stress direction',
	loading: 'loading',
	seam: 'plate or longitudinal seam, or girth weld',
	diameter: 'outside diameter',
	socketWall: 'socket wall or hub thickness'
};

// ---- Gauge chips -----------------------------------------------------------------------------

export interface GaugeChip {
	label: string;
	/** what a tap enters, with its unit, so it reads the same in any project */
	text: string;
	/** mm or degrees, to show the chip as chosen when the typed value equals it */
	value: number;
}

const sixteenths = (from: number, to: number) =>
	Array.from({ length: to - from + 1 }, (_, i) => inchLabel((from + i) / 16));
const halfMillimetres = (to: number) => Array.from({ length: to * 2 + 1 }, (_, i) => String(i / 2));

function inchLabel(inches: number): string {
	const whole = Math.floor(inches);
	let numerator = Math.round((inches - whole) * 64);
	let denominator = 64;
	while (numerator > 0 && numerator % 2 === 0) {
		numerator /= 2;
		denominator /= 2;
	}
	const fraction = numerator === 0 ? '' : `${numerator}/${denominator}`;
	if (!whole) return fraction || '0';
	return fraction ? `${whole}-${fraction}` : String(whole);
}

const DEPTHS = { imperial: ['0', '1/32', '1/16', '3/32', '1/8'], metric: halfMillimetres(3) };
const FILLET_SIZES = {
	imperial: sixteenths(2, 16),
	metric: ['3', '4', '5', '6', '7', '8', '9', '10', '12', '14', '16', '18', '20', '22', '25']
};

/** Common gauge values, by the project's system; lengths without chips are typed. */
const chipLabels: Partial<Record<ReadingId, { imperial: string[]; metric: string[] }>> = {
	rootOpening: {
		imperial: ['0', '1/16', '3/32', '1/8', '5/32', '3/16'],
		metric: ['0', '1.5', '2', '2.5', '3', '4']
	},
	rootFace: { imperial: ['1/32', '1/16', '3/32', '1/8'], metric: ['1', '1.5', '2', '2.5', '3'] },
	misalignment: DEPTHS,
	filletLeg1: FILLET_SIZES,
	filletLeg2: FILLET_SIZES,
	throat: FILLET_SIZES,
	convexity: DEPTHS,
	concavity: DEPTHS,
	reinforcement: DEPTHS,
	undercutDepth: DEPTHS,
	porosity: DEPTHS,
	poreLargest: DEPTHS,
	craterDepth: DEPTHS,
	rootProtrusion: DEPTHS,
	rootConcavity: DEPTHS,
	incompletePenetrationDepth: DEPTHS
};

/** Counts of pores, and roughness comparator grades (µin Ra, or µm Ra in a metric project). */
const countChips = ['0', '1', '2', '3'];
const roughnessChips = { imperial: ['125', '250', '500'], metric: ['3.2', '6.3', '12.5'] };

const BEVELS = ['30', '35', '37.5', '40'];

export function chipsFor(id: ReadingId, units: UnitSystem): GaugeChip[] {
	if (id === 'bevelAngle') {
		return BEVELS.map((label) => ({ label: `${label}°`, text: `${label}°`, value: Number(label) }));
	}
	const kind = readingDefinitions[id].kind;
	if (kind === 'count' || kind === 'roughness') {
		const labels = kind === 'count' ? countChips : roughnessChips[units];
		const suffix = kind === 'count' ? '' : units === 'imperial' ? ' µin' : ' µm';
		return labels.flatMap((label) => {
			const parsed = parseReading(id, `${label}${suffix}`, units);
			return parsed.ok && typeof parsed.value === 'number'
				? [{ label, text: `${label}${suffix}`, value: parsed.value }]
				: [];
		});
	}
	const labels = chipLabels[id]?.[units] ?? [];
	const suffix = units === 'imperial' ? ' in' : ' mm';
	return labels.flatMap((label) => {
		const parsed = parseLength(`${label}${suffix}`, { units });
		return parsed.ok ? [{ label, text: `${label}${suffix}`, value: parsed.value }] : [];
	});
}

// ---- Typed values and findings in words ------------------------------------------------------

/** A field's value as read: mm, degrees, a count, or µm Ra. */
export type TypedReading =
	{ ok: true; value: number; unit: 'mm' | 'deg' | 'count' | 'um' } | { ok: false; message: string };

/** What a field reads as it is typed; undefined while blank. */
export function parseTyped(
	id: ReadingId,
	text: string,
	units: UnitSystem
): TypedReading | undefined {
	if (text.trim() === '') return undefined;
	const kind = readingDefinitions[id].kind;
	if (kind === 'angle' || kind === 'length') {
		const parsed: ParsedQuantity =
			kind === 'angle'
				? parseAngle(text, { reading: quantitySpec(id) })
				: parseLength(text, { units, reading: quantitySpec(id) });
		return parsed.ok
			? { ok: true, value: parsed.value, unit: parsed.unit === 'deg' ? 'deg' : 'mm' }
			: parsed;
	}
	const parsed = parseReading(id, text, units);
	if (!parsed.ok) return parsed;
	return typeof parsed.value === 'number' && (parsed.unit === 'count' || parsed.unit === 'um')
		? { ok: true, value: parsed.value, unit: parsed.unit }
		: { ok: false, message: `${readingDefinitions[id].label}: cannot read "${text}"` };
}

const MICROINCH_IN_UM = 0.0254;

/** A roughness in µm as read in the project's column: `500 µin Ra (12.7 µm)` or `12.5 µm Ra`. */
export function roughnessWords(um: number, units: UnitSystem): string {
	const metric = `${Number(um.toFixed(2))} µm`;
	return units === 'imperial'
		? `${Math.round(um / MICROINCH_IN_UM)} µin Ra (${metric})`
		: `${metric} Ra`;
}

/** The value in both systems, the project's first: `= 9.5 mm (3/8")` or `= 3/8 in (9.5 mm)`. */
export function bothUnits(parsed: TypedReading & { ok: true }, units: UnitSystem): string {
	if (parsed.unit === 'deg') return `= ${formatAngle(parsed.value)}`;
	if (parsed.unit === 'count') return `= ${parsed.value} ${parsed.value === 1 ? 'pore' : 'pores'}`;
	if (parsed.unit === 'um') return `= ${roughnessWords(parsed.value, units)}`;
	if (units === 'imperial') return `= ${formatBoth(parsed.value)}`;
	return `= ${formatLength(parsed.value, 'metric')} (${formatLength(parsed.value, 'imperial')})`;
}

export type Detail = 'short' | 'both';

export function formatMeasure(
	value: number,
	unit: Finding['unit'],
	units: UnitSystem,
	detail: Detail = 'short'
): string {
	if (unit === 'flag') return value > 0 ? 'present' : 'none';
	if (unit === 'deg') return formatAngle(value);
	if (unit === 'count') return String(value);
	if (unit === 'um') return roughnessWords(value, units);
	if (detail === 'both' && units === 'imperial') return formatBoth(value);
	return formatLength(value, units);
}

/** Checks whose limit is a least value; every other single limit is a greatest one. */
const MINIMUM_CHECKS: readonly FindingCheckId[] = [
	'socket.gap',
	'socket.filletSize',
	'flange.filletSize',
	'branch.coverFillet',
	'jointThickness.min',
	'fillet.gapLeg'
];

/**
 * The limit in words. It depends on the joint, never on the value typed: where joint data is
 * missing it shows both ends the limit could have; a banded limit shows its deeper band too.
 */
export function limitText(
	finding: Pick<Finding, 'check' | 'unit' | 'limit' | 'range' | 'bounds' | 'band'>,
	units: UnitSystem,
	detail: Detail = 'short'
): string {
	const show = (value: number) => formatMeasure(value, finding.unit, units, detail);
	const least = MINIMUM_CHECKS.includes(finding.check as FindingCheckId);
	if (finding.unit === 'flag') return 'none';
	if (finding.range) return `${show(finding.range.min)} to ${show(finding.range.max)}`;
	if (finding.bounds) {
		const [from, to] = least
			? [finding.bounds.max, finding.bounds.min]
			: [finding.bounds.min, finding.bounds.max];
		return `${least ? 'at least' : 'at most'} ${show(from)} or ${show(to)}, by joint data not given`;
	}
	if (finding.limit === null) return 'no fixed limit';
	const band = finding.band ? `; up to ${show(finding.band.upTo)} over a limited length` : '';
	return `${least ? 'at least' : 'at most'} ${show(finding.limit)}${band}`;
}

export const checkLabels: Record<FindingCheckId, string> = {
	'rootOpening.range': 'Root opening',
	'fillet.gap': 'Fillet gap',
	'socket.gap': 'Socket gap',
	'bevelAngle.range': 'Bevel angle',
	'rootFace.range': 'Root face',
	'misalignment.max': 'Misalignment (hi-lo)',
	crack: 'Crack',
	fusion: 'Incomplete fusion',
	overlap: 'Overlap',
	crater: 'Unfilled crater',
	'undercut.depth': 'Undercut depth',
	'undercut.length': 'Undercut length',
	'porosity.max': 'Porosity',
	'reinforcement.max': 'Reinforcement',
	'concavity.max': 'Concavity',
	'fillet.undersize': 'Fillet undersize',
	'fillet.undersizeLength': 'Undersize length',
	'fillet.throat.min': 'Throat shortfall',
	'fillet.throat.length': 'Throat shortfall length',
	'fillet.throat.max': 'Excess throat',
	'fillet.convexity': 'Convexity',
	'fillet.asymmetry': 'Leg asymmetry',
	'socket.filletSize': 'Socket fillet size',
	'penetration.length': 'Incomplete penetration length',
	'penetration.depth': 'Incomplete penetration depth',
	'rootProtrusion.max': 'Root protrusion',
	'rootConcavity.depth': 'Root concavity',
	'rootConcavity.length': 'Root concavity length',
	'jointThickness.min': 'Joint thickness',
	'porosity.total': 'Porosity in 12 in (300 mm)',
	'pore.largest': 'Largest pore',
	'pore.count': 'Pores in 4 in (100 mm)',
	'crater.depth': 'Crater depth',
	'overlap.size': 'Overlap',
	'surfaceFinish.max': 'Surface finish',
	'flange.filletSize': 'Flange fillet size',
	'branch.coverFillet': 'Branch cover fillet throat',
	'fillet.gapLeg': 'Fillet leg over the root opening',
	'wps.rootOpening': 'Root opening to the WPS',
	'wps.rootFace': 'Root face to the WPS',
	'wps.bevelAngle': 'Bevel angle to the WPS'
};

/**
 * What the inspector reads beside a limit's clause. A limit resting on one source, or on none
 * found, keeps its tag in the data; on screen it is one plain word.
 */
export const confidenceWords: Record<Finding['confidence'], string | undefined> = {
	'2+': undefined,
	'1': 'unconfirmed — check the clause',
	mem: 'unconfirmed — check the clause',
	practice: 'common practice',
	project: 'project limit'
};

/** The props FitupForm and VisualForm share. */
export interface StageFormProps {
	criteriaId: string;
	/** a project's own set; when absent the built-in set named by criteriaId */
	criteriaSet?: CriteriaSet;
	joint: JointInput;
	units: UnitSystem;
	readings?: ReadingEntries;
	/** the latest evaluation, for the form around it; undefined for an unknown criteria set */
	evaluation?: EvaluationResult;
	/** the joint design of the joint's WPS, which a fit-up is also judged against */
	wps?: WpsJointDesign;
}
