/**
 * The gauge readings an inspector records, and the joint fields the limits are set by.
 * Plausible ranges refuse typing slips (a bare "32" meant as 1/32 in) before they reach a verdict;
 * they are deliberately wide and are not acceptance limits.
 */

import type { PlausibleRange, QuantityKind, QuantitySpec } from '../units';

export type { PlausibleRange, QuantityKind, QuantitySpec };
export type ReadingKind = QuantityKind | 'boolean';

const INCH = 25.4;

export const lengthReadingIds = [
	'rootOpening',
	'rootFace',
	'misalignment',
	'wallThickness',
	'filletLeg1',
	'filletLeg2',
	'throat',
	'faceWidth',
	'convexity',
	'concavity',
	'reinforcement',
	'undercutDepth',
	'undercutLength',
	'undersizeLength',
	'porosity'
] as const;
export const angleReadingIds = ['bevelAngle'] as const;
export const flagReadingIds = ['crack', 'overlap', 'craterUnfilled', 'incompleteFusion'] as const;

export const readingIds = [
	'rootOpening',
	'bevelAngle',
	'rootFace',
	'misalignment',
	'wallThickness',
	'filletLeg1',
	'filletLeg2',
	'throat',
	'faceWidth',
	'convexity',
	'concavity',
	'reinforcement',
	'undercutDepth',
	'undercutLength',
	'undersizeLength',
	'porosity',
	'crack',
	'overlap',
	'craterUnfilled',
	'incompleteFusion'
] as const;

export type LengthReadingId = (typeof lengthReadingIds)[number];
export type AngleReadingId = (typeof angleReadingIds)[number];
export type FlagReadingId = (typeof flagReadingIds)[number];
export type ReadingId = (typeof readingIds)[number];

export interface ReadingDefinition {
	id: ReadingId;
	kind: ReadingKind;
	label: string;
	/** absent for yes/no readings */
	plausible?: PlausibleRange;
}

const length = (label: string, plausible: PlausibleRange) =>
	({ kind: 'length', label, plausible }) as const;

export const readingDefinitions: Record<ReadingId, ReadingDefinition> = {
	rootOpening: { id: 'rootOpening', ...length('Root opening', { min: 0, max: INCH }) },
	bevelAngle: {
		id: 'bevelAngle',
		kind: 'angle',
		label: 'Bevel angle',
		plausible: { min: 0, max: 90 }
	},
	rootFace: { id: 'rootFace', ...length('Root face', { min: 0, max: INCH }) },
	misalignment: { id: 'misalignment', ...length('Misalignment (hi-lo)', { min: 0, max: INCH }) },
	wallThickness: {
		id: 'wallThickness',
		...length('Wall thickness', { min: 0, max: 300, minExclusive: true })
	},
	filletLeg1: {
		id: 'filletLeg1',
		...length('Fillet leg 1', { min: 0, max: 100, minExclusive: true })
	},
	filletLeg2: {
		id: 'filletLeg2',
		...length('Fillet leg 2', { min: 0, max: 100, minExclusive: true })
	},
	throat: { id: 'throat', ...length('Throat', { min: 0, max: 75, minExclusive: true }) },
	faceWidth: { id: 'faceWidth', ...length('Face width', { min: 0, max: 150, minExclusive: true }) },
	convexity: { id: 'convexity', ...length('Convexity', { min: 0, max: INCH }) },
	concavity: { id: 'concavity', ...length('Concavity', { min: 0, max: INCH }) },
	reinforcement: { id: 'reinforcement', ...length('Reinforcement', { min: 0, max: INCH }) },
	undercutDepth: { id: 'undercutDepth', ...length('Undercut depth', { min: 0, max: INCH / 2 }) },
	// The reading is the accumulated length within any 12 in (300 mm), so it cannot exceed the window.
	undercutLength: {
		id: 'undercutLength',
		...length('Undercut length', { min: 0, max: 12 * INCH })
	},
	undersizeLength: {
		id: 'undersizeLength',
		...length('Undersize length', { min: 0, max: 100_000 })
	},
	// Sum of pore diameters within any 1 in (25 mm): more than the window is a slip.
	porosity: { id: 'porosity', ...length('Porosity', { min: 0, max: INCH }) },
	crack: { id: 'crack', kind: 'boolean', label: 'Crack' },
	overlap: { id: 'overlap', kind: 'boolean', label: 'Overlap' },
	craterUnfilled: { id: 'craterUnfilled', kind: 'boolean', label: 'Unfilled crater' },
	incompleteFusion: { id: 'incompleteFusion', kind: 'boolean', label: 'Incomplete fusion' }
};

export const jointLengthFields = ['thickness', 'requiredSize', 'weldLength'] as const;
export type JointLengthField = (typeof jointLengthFields)[number];

export const jointFieldSpecs: Record<JointLengthField, QuantitySpec> = {
	thickness: {
		kind: 'length',
		label: 'Thickness',
		plausible: { min: 0, max: 300, minExclusive: true }
	},
	requiredSize: {
		kind: 'length',
		label: 'Required fillet size',
		plausible: { min: 0, max: 100, minExclusive: true }
	},
	weldLength: {
		kind: 'length',
		label: 'Weld length',
		plausible: { min: 0, max: 100_000, minExclusive: true }
	}
};

export function isReadingId(id: string): id is ReadingId {
	return (readingIds as readonly string[]).includes(id);
}

/** The spec a units parser checks a value against, for a reading id or a joint field. */
export function quantitySpec(id: ReadingId | JointLengthField): QuantitySpec | undefined {
	if ((jointLengthFields as readonly string[]).includes(id))
		return jointFieldSpecs[id as JointLengthField];
	const reading = readingDefinitions[id as ReadingId];
	if (!reading || reading.kind === 'boolean' || !reading.plausible) return undefined;
	return { label: reading.label, kind: reading.kind, plausible: reading.plausible };
}
