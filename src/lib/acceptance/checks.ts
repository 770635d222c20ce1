/**
 * What each check measures. A criteria set says which checks it makes and with which limits;
 * this says which readings a check reads, at which stage and on which joints by default.
 */
import { JOINT_KINDS } from '../domain';
import { filletSizeFromThroat } from './geometry';
import type { ResolvedJoint } from './inputs';
import type { FlagReadingId, LengthReadingId, ReadingId } from './readings';
import type {
	CheckId,
	Derived,
	FindingUnit,
	JointKind,
	LengthCheckId,
	Quantity,
	Stage
} from './types';

export type ParsedReadings = Partial<Record<Exclude<ReadingId, FlagReadingId>, number>> &
	Partial<Record<FlagReadingId, boolean>>;

export interface CheckContext {
	readings: ParsedReadings;
	derived: Derived;
}

export interface Measurement {
	value: number;
	reading: ReadingId;
	unit: FindingUnit;
}

export interface CheckDefinition {
	kinds: readonly JointKind[];
	stages: readonly Stage[];
	/** readings normally taken for this check; those not given are reported missing */
	wants(ctx: CheckContext): readonly ReadingId[];
	/** the check cannot be made at all without the required fillet size */
	needsRequiredSize?: boolean;
	measure(ctx: CheckContext): Measurement | undefined;
	/**
	 * Where a banded limit reads the length of the imperfection, and the stretch of weld that
	 * reading covers (undefined: the whole weld).
	 */
	length?: { reading: LengthReadingId; check: LengthCheckId; window?: Quantity };
	/** for a `length` rule: the stretch of weld the reading itself covers */
	window?: Quantity;
	/** joints the check is made on at all, beyond their kind */
	when?: (joint: ResolvedJoint) => boolean;
}

const ALL_JOINTS: readonly JointKind[] = JOINT_KINDS;
const GROOVE_JOINTS: readonly JointKind[] = ['butt', 'branch'];
const FILLET_JOINTS: readonly JointKind[] = ['fillet', 'socket'];
/** "in any 12 in (300 mm)": the stretch the length readings of undercut, concavity and so on cover */
export const LENGTH_WINDOW: Quantity = { in: 12, mm: 300 };

const UNITS: Partial<Record<ReadingId, FindingUnit>> = {
	bevelAngle: 'deg',
	poreCount: 'count',
	surfaceRoughness: 'um'
};

function lengthReading(
	id: Exclude<ReadingId, FlagReadingId>,
	kinds: readonly JointKind[],
	stage: Stage
): CheckDefinition {
	return {
		kinds,
		stages: [stage],
		wants: () => [id],
		measure: ({ readings }) => {
			const value = readings[id];
			return value === undefined ? undefined : { value, reading: id, unit: UNITS[id] ?? 'mm' };
		}
	};
}

function flagReading(id: FlagReadingId): CheckDefinition {
	return {
		kinds: ALL_JOINTS,
		stages: ['visual'],
		wants: () => [id],
		measure: ({ readings }) => {
			const value = readings[id];
			return value === undefined ? undefined : { value: value ? 1 : 0, reading: id, unit: 'flag' };
		}
	};
}

/** Both legs, unless the fillet was gauged by its throat alone (a concave face). */
function filletWants({ readings }: CheckContext): readonly ReadingId[] {
	const legsGiven = readings.filletLeg1 !== undefined || readings.filletLeg2 !== undefined;
	return readings.throat !== undefined && !legsGiven ? [] : ['filletLeg1', 'filletLeg2'];
}

/** The reading that sets the credited fillet size: the shorter leg, or the throat of a concave face. */
function governingSizeReading({ readings }: CheckContext): ReadingId | undefined {
	const candidates: [ReadingId, number | undefined][] = [
		['filletLeg1', readings.filletLeg1],
		['filletLeg2', readings.filletLeg2],
		['throat', readings.throat === undefined ? undefined : filletSizeFromThroat(readings.throat)]
	];
	let governing: [ReadingId, number] | undefined;
	for (const [id, size] of candidates) {
		if (size !== undefined && (governing === undefined || size < governing[1]))
			governing = [id, size];
	}
	return governing?.[0];
}

/** No pores at all: any porosity reading given as zero says so for the others. */
function noPores({ readings }: CheckContext): boolean {
	const { porosity, porosityTotal, poreLargest, poreCount } = readings;
	return [porosity, porosityTotal, poreLargest, poreCount].some((value) => value === 0);
}

/** A reading taken only where there is something to measure; wanted once the other says so. */
const wantedWhen =
	(id: ReadingId, seen: (ctx: CheckContext) => boolean) =>
	(ctx: CheckContext): readonly ReadingId[] =>
		seen(ctx) ? [id] : [];

const positive = (value: number | boolean | undefined) =>
	value === true || (typeof value === 'number' && value > 0);

function throatReading({ readings }: CheckContext): ReadingId {
	return readings.throat !== undefined
		? 'throat'
		: readings.filletLeg1 !== undefined
			? 'filletLeg1'
			: 'filletLeg2';
}

function derivedMeasure(
	key: keyof Derived,
	reading: (ctx: CheckContext) => ReadingId | undefined
): (ctx: CheckContext) => Measurement | undefined {
	return (ctx) => {
		const value = ctx.derived[key];
		const id = reading(ctx);
		return value === undefined || id === undefined ? undefined : { value, reading: id, unit: 'mm' };
	};
}

export const checkDefinitions: Record<CheckId, CheckDefinition> = {
	'rootOpening.range': lengthReading('rootOpening', GROOVE_JOINTS, 'fitup'),
	'fillet.gap': lengthReading('rootOpening', ['fillet'], 'fitup'),
	'socket.gap': lengthReading('rootOpening', ['socket'], 'fitup'),
	'bevelAngle.range': lengthReading('bevelAngle', GROOVE_JOINTS, 'fitup'),
	'rootFace.range': lengthReading('rootFace', GROOVE_JOINTS, 'fitup'),
	'misalignment.max': lengthReading('misalignment', ['butt'], 'fitup'),
	crack: flagReading('crack'),
	fusion: flagReading('incompleteFusion'),
	overlap: flagReading('overlap'),
	crater: flagReading('craterUnfilled'),
	'undercut.depth': {
		...lengthReading('undercutDepth', ALL_JOINTS, 'visual'),
		length: { reading: 'undercutLength', check: 'undercut.length', window: LENGTH_WINDOW }
	},
	'porosity.max': {
		...lengthReading('porosity', ALL_JOINTS, 'visual'),
		wants: (ctx) => (noPores(ctx) ? [] : ['porosity'])
	},
	'reinforcement.max': lengthReading('reinforcement', GROOVE_JOINTS, 'visual'),
	// Concavity of a butt weld is read only when there is some, so it is never reported missing.
	'concavity.max': { ...lengthReading('concavity', GROOVE_JOINTS, 'visual'), wants: () => [] },
	'fillet.undersize': {
		kinds: FILLET_JOINTS,
		stages: ['visual'],
		wants: filletWants,
		needsRequiredSize: true,
		measure: derivedMeasure('undersizeMm', governingSizeReading),
		length: { reading: 'undersizeLength', check: 'fillet.undersizeLength' }
	},
	'fillet.throat.min': {
		kinds: FILLET_JOINTS,
		stages: ['visual'],
		wants: filletWants,
		needsRequiredSize: true,
		measure: derivedMeasure('throatShortfallMm', throatReading),
		length: { reading: 'undersizeLength', check: 'fillet.throat.length' }
	},
	'fillet.throat.max': {
		kinds: FILLET_JOINTS,
		stages: ['visual'],
		wants: filletWants,
		needsRequiredSize: true,
		measure: derivedMeasure('throatExcessMm', throatReading)
	},
	'fillet.convexity': lengthReading('convexity', FILLET_JOINTS, 'visual'),
	'fillet.asymmetry': {
		kinds: FILLET_JOINTS,
		stages: ['visual'],
		wants: () => ['filletLeg1', 'filletLeg2'],
		measure: derivedMeasure('legAsymmetryMm', () => 'filletLeg2')
	},
	'socket.filletSize': {
		kinds: ['socket'],
		stages: ['visual'],
		wants: filletWants,
		measure: derivedMeasure('filletSizeMm', governingSizeReading),
		// A socket-welding flange has its own minimum (flange.filletSize).
		when: (joint) => joint.flange === undefined
	},
	// Root-side readings are taken where the root can be seen, so none is wanted by default.
	'penetration.length': {
		...lengthReading('incompletePenetrationLength', GROOVE_JOINTS, 'visual'),
		wants: () => [],
		window: LENGTH_WINDOW
	},
	'penetration.depth': {
		...lengthReading('incompletePenetrationDepth', GROOVE_JOINTS, 'visual'),
		wants: wantedWhen('incompletePenetrationDepth', ({ readings }) =>
			positive(readings.incompletePenetrationLength)
		)
	},
	'rootProtrusion.max': {
		...lengthReading('rootProtrusion', GROOVE_JOINTS, 'visual'),
		wants: () => []
	},
	'rootConcavity.depth': {
		...lengthReading('rootConcavity', GROOVE_JOINTS, 'visual'),
		wants: () => [],
		length: { reading: 'rootConcavityLength', check: 'rootConcavity.length', window: LENGTH_WINDOW }
	},
	'jointThickness.min': {
		...lengthReading('jointThickness', GROOVE_JOINTS, 'visual'),
		wants: wantedWhen(
			'jointThickness',
			({ readings }) => positive(readings.concavity) || positive(readings.rootConcavity)
		)
	},
	'porosity.total': {
		...lengthReading('porosityTotal', ALL_JOINTS, 'visual'),
		wants: wantedWhen('porosityTotal', ({ readings }) => positive(readings.porosity))
	},
	'pore.largest': {
		...lengthReading('poreLargest', ALL_JOINTS, 'visual'),
		wants: (ctx) => (noPores(ctx) ? [] : ['poreLargest'])
	},
	'pore.count': {
		...lengthReading('poreCount', ALL_JOINTS, 'visual'),
		wants: (ctx) => (noPores(ctx) ? [] : ['poreCount'])
	},
	'crater.depth': {
		...lengthReading('craterDepth', ALL_JOINTS, 'visual'),
		wants: wantedWhen('craterDepth', ({ readings }) => readings.craterUnfilled === true)
	},
	'overlap.size': {
		...lengthReading('overlapSize', ALL_JOINTS, 'visual'),
		wants: wantedWhen('overlapSize', ({ readings }) => readings.overlap === true)
	},
	'surfaceFinish.max': lengthReading('surfaceRoughness', ALL_JOINTS, 'visual'),
	'flange.filletSize': {
		kinds: FILLET_JOINTS,
		stages: ['visual'],
		wants: filletWants,
		measure: derivedMeasure('filletSizeMm', governingSizeReading),
		when: (joint) => joint.flange !== undefined
	},
	'branch.coverFillet': {
		kinds: ['branch'],
		stages: ['visual'],
		wants: filletWants,
		measure: ({ readings, derived }) => {
			const throat = readings.throat ?? derived.theoreticalThroatMm;
			return throat === undefined
				? undefined
				: { value: throat, reading: throatReading({ readings, derived }), unit: 'mm' };
		}
	},
	// A fillet over a root opening wider than the code's allowance needs a longer leg.
	'fillet.gapLeg': {
		kinds: ['fillet'],
		stages: ['visual'],
		wants: () => [],
		needsRequiredSize: true,
		measure: derivedMeasure('filletSizeMm', governingSizeReading)
	}
};
