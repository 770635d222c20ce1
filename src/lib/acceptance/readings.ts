/**
 * The gauge readings an inspector records, and the joint fields the limits are set by.
 * Plausible ranges refuse typing slips (a bare "32" meant as 1/32 in) before they reach a verdict;
 * they are deliberately wide and are not acceptance limits.
 */

import type { PlausibleRange, QuantityKind, QuantitySpec } from '../units';

export type { PlausibleRange, QuantityKind, QuantitySpec };
/** A count of pores, or a surface roughness (µm Ra), besides lengths, angles and yes/no flags. */
export type ReadingKind = QuantityKind | 'boolean' | 'count' | 'roughness';

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
	'porosity',
	'porosityTotal',
	'poreLargest',
	'craterDepth',
	'overlapSize',
	'rootProtrusion',
	'rootWidth',
	'rootConcavity',
	'rootConcavityLength',
	'jointThickness',
	'incompletePenetrationLength',
	'incompletePenetrationDepth'
] as const;
export const angleReadingIds = ['bevelAngle'] as const;
export const countReadingIds = ['poreCount'] as const;
export const roughnessReadingIds = ['surfaceRoughness'] as const;
export const flagReadingIds = ['crack', 'overlap', 'craterUnfilled', 'incompleteFusion'] as const;

/** In the order a form lists them: fit-up, the face of the weld, then its root. */
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
	'porosityTotal',
	'poreLargest',
	'poreCount',
	'craterDepth',
	'overlapSize',
	'surfaceRoughness',
	'rootProtrusion',
	'rootWidth',
	'rootConcavity',
	'rootConcavityLength',
	'jointThickness',
	'incompletePenetrationLength',
	'incompletePenetrationDepth',
	'crack',
	'overlap',
	'craterUnfilled',
	'incompleteFusion'
] as const;

export type LengthReadingId = (typeof lengthReadingIds)[number];
export type AngleReadingId = (typeof angleReadingIds)[number];
export type CountReadingId = (typeof countReadingIds)[number];
export type RoughnessReadingId = (typeof roughnessReadingIds)[number];
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

/**
 * Readings counted over a length say which: a length or a sum "in any 12 in (300 mm)" is
 * the worst such stretch of the weld, and cannot be more than the stretch.
 */
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
	undercutLength: {
		id: 'undercutLength',
		...length('Undercut — total length in any 12 in (300 mm)', { min: 0, max: 12 * INCH })
	},
	undersizeLength: {
		id: 'undersizeLength',
		...length('Undersize — total length along the weld', { min: 0, max: 100_000 })
	},
	porosity: {
		id: 'porosity',
		...length('Porosity — sum of pore diameters in any 1 in (25 mm)', { min: 0, max: INCH })
	},
	porosityTotal: {
		id: 'porosityTotal',
		...length('Porosity — sum of pore diameters in any 12 in (300 mm)', {
			min: 0,
			max: 12 * INCH
		})
	},
	poreLargest: { id: 'poreLargest', ...length('Largest pore (diameter)', { min: 0, max: INCH }) },
	poreCount: {
		id: 'poreCount',
		kind: 'count',
		label: 'Pores — number in any 4 in (100 mm)',
		plausible: { min: 0, max: 1000 }
	},
	craterDepth: {
		id: 'craterDepth',
		...length('Crater — depth below the weld face', { min: 0, max: INCH })
	},
	overlapSize: {
		id: 'overlapSize',
		...length('Overlap — how far it lies over the parent metal', { min: 0, max: 2 * INCH })
	},
	surfaceRoughness: {
		id: 'surfaceRoughness',
		kind: 'roughness',
		label: 'Surface roughness (Ra)',
		plausible: { min: 0, max: 100 }
	},
	rootProtrusion: {
		id: 'rootProtrusion',
		...length('Root protrusion (internal)', { min: 0, max: INCH })
	},
	rootWidth: {
		id: 'rootWidth',
		...length('Root bead width', { min: 0, max: 4 * INCH, minExclusive: true })
	},
	rootConcavity: {
		id: 'rootConcavity',
		...length('Root concavity — depth', { min: 0, max: INCH })
	},
	rootConcavityLength: {
		id: 'rootConcavityLength',
		...length('Root concavity — total length in any 12 in (300 mm)', { min: 0, max: 12 * INCH })
	},
	jointThickness: {
		id: 'jointThickness',
		...length('Joint thickness at a concavity (reinforcement included)', {
			min: 0,
			max: 300,
			minExclusive: true
		})
	},
	incompletePenetrationLength: {
		id: 'incompletePenetrationLength',
		...length('Incomplete penetration — total length in any 12 in (300 mm)', {
			min: 0,
			max: 12 * INCH
		})
	},
	incompletePenetrationDepth: {
		id: 'incompletePenetrationDepth',
		...length('Incomplete penetration — depth', { min: 0, max: 2 * INCH })
	},
	crack: { id: 'crack', kind: 'boolean', label: 'Crack' },
	overlap: { id: 'overlap', kind: 'boolean', label: 'Overlap' },
	craterUnfilled: { id: 'craterUnfilled', kind: 'boolean', label: 'Unfilled crater' },
	incompleteFusion: { id: 'incompleteFusion', kind: 'boolean', label: 'Incomplete fusion' }
};

export const jointLengthFields = [
	'thickness',
	'requiredSize',
	'weldLength',
	'diameter',
	'socketWall'
] as const;
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
	},
	diameter: {
		kind: 'length',
		label: 'Outside diameter',
		plausible: { min: 0, max: 10_000, minExclusive: true }
	},
	socketWall: {
		kind: 'length',
		label: 'Socket wall or hub thickness',
		plausible: { min: 0, max: 300, minExclusive: true }
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
	if (!reading || !reading.plausible) return undefined;
	if (reading.kind !== 'length' && reading.kind !== 'angle') return undefined;
	return { label: reading.label, kind: reading.kind, plausible: reading.plausible };
}
