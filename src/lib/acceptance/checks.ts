/**
 * What each check measures. A criteria set says which checks it makes and with which limits;
 * this says which readings a check reads, at which stage and on which joints by default.
 */
import { JOINT_KINDS } from '../domain';
import { filletSizeFromThroat } from './geometry';
import type { FlagReadingId, LengthReadingId, ReadingId } from './readings';
import type { CheckId, Derived, JointKind, LengthCheckId, Stage } from './types';

export type ParsedReadings = Partial<Record<Exclude<ReadingId, FlagReadingId>, number>> &
	Partial<Record<FlagReadingId, boolean>>;

export interface CheckContext {
	readings: ParsedReadings;
	derived: Derived;
}

export interface Measurement {
	value: number;
	reading: ReadingId;
	unit: 'mm' | 'deg' | 'flag';
}

export interface CheckDefinition {
	kinds: readonly JointKind[];
	stages: readonly Stage[];
	/** readings normally taken for this check; those not given are reported missing */
	wants(ctx: CheckContext): readonly ReadingId[];
	/** the check cannot be made at all without the required fillet size */
	needsRequiredSize?: boolean;
	measure(ctx: CheckContext): Measurement | undefined;
	/** where a banded limit reads the length of the imperfection */
	length?: { reading: LengthReadingId; check: LengthCheckId; windowMm?: number };
}

const ALL_JOINTS: readonly JointKind[] = JOINT_KINDS;
const GROOVE_JOINTS: readonly JointKind[] = ['butt', 'branch'];
const FILLET_JOINTS: readonly JointKind[] = ['fillet', 'socket'];
/** "within any 12 in (300 mm)": the window the undercut length reading covers */
const UNDERCUT_WINDOW_MM = 300;

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
			return value === undefined
				? undefined
				: { value, reading: id, unit: id === 'bevelAngle' ? 'deg' : 'mm' };
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
		length: { reading: 'undercutLength', check: 'undercut.length', windowMm: UNDERCUT_WINDOW_MM }
	},
	'porosity.max': lengthReading('porosity', ALL_JOINTS, 'visual'),
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
		measure: derivedMeasure('filletSizeMm', governingSizeReading)
	}
};
