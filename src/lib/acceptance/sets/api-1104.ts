/**
 * API Standard 1104, Welding of Pipelines and Related Facilities, 21st edition (2013).
 * Clause numbers of the 20th/21st editions; the values were the same from the 19th to the 22nd
 * as far as the sources show. The wall thickness is that of the thinner pipe. Section 9's
 * acceptance standards apply to radiography and to visual examination alike; 9.7 adds the
 * depth of undercut gauged visually.
 */
import type { CriteriaSet, Expr, IndicationLimit, Limit, MethodCriteria, Quantity } from '../types';

const perWps = (what: string): Limit => ({
	rule: { type: 'range', min: { open: what }, max: { open: what } },
	clause: '5.4 (procedure specification, joint design)',
	confidence: 'mem',
	note: 'Joint design is an item of the qualified procedure; the clause number is unconfirmed.'
});

const inch = (inches: number, mm: number): Quantity => ({ in: inches, mm });
const TWELVE: Quantity = inch(12, 300);
const wall = (times: number): Expr => ({ of: 'thickness', times });
const ofWeld = (times: number): Expr => ({ of: 'weldLength', times });

/** "In any continuous 12 in (300 mm)"; welds shorter than that: a share of the weld length. */
const perTwelve = (max: Quantity, shortShare: number) => ({
	max: {
		by: 'weldLength',
		steps: [{ below: TWELVE, value: ofWeld(shortShare) }],
		otherwise: max
	} as Expr,
	per: TWELVE
});

/** 9.3.1 IP: individual over 1 in (25 mm); over 1 in in any 12 in; over 8 % of a weld under 12 in. */
const IP: IndicationLimit = {
	clause: '9.3.1 (inadequate penetration without high-low, IP)',
	confidence: '2+',
	length: inch(1, 25),
	aggregate: [perTwelve(inch(1, 25), 0.08)]
};

/** 9.3.4 IF: as IP. */
const IF: IndicationLimit = {
	clause: '9.3.4 (incomplete fusion, IF)',
	confidence: '2+',
	length: inch(1, 25),
	aggregate: [perTwelve(inch(1, 25), 0.08)]
};

/** Outside diameters of 2.375 in (60.3 mm) and more: the large-pipe rows of 9.3.7 and 9.3.8. */
const LARGE_PIPE: Quantity = inch(2.375, 60.3);
const smallPipe = (clause: string, large: Expr): Expr => ({
	by: 'diameter',
	steps: [
		{
			below: LARGE_PIPE,
			value: { open: `Pipe under 2.375 in (60.3 mm) OD has rows of its own (${clause}).` }
		}
	],
	otherwise: large
});

const radiography: MethodCriteria = {
	clause: '9.3 (radiographic testing)',
	limits: {
		crack: { clause: '9.3.10 (cracks)', confidence: '2+', absent: true },
		craterCrack: {
			clause: '9.3.10 (cracks)',
			confidence: '2+',
			note: 'Shallow crater cracks or star cracks at the stopping point of a bead, at most 5/32 in (4 mm) long.',
			length: inch(5 / 32, 4)
		},
		incompletePenetration: IP,
		hiLoPenetration: {
			clause: '9.3.2 (incomplete penetration due to high-low, IPD)',
			confidence: '2+',
			length: inch(2, 50),
			aggregate: [{ max: inch(3, 75), per: TWELVE }]
		},
		crossPenetration: {
			clause: '9.3.3 (inadequate cross penetration, ICP)',
			confidence: '2+',
			length: inch(2, 50),
			aggregate: [{ max: inch(2, 50), per: TWELVE }]
		},
		lackOfFusion: IF,
		coldLap: {
			clause: '9.3.5 (incomplete fusion due to cold lap, IFD)',
			confidence: '2+',
			length: inch(2, 50),
			aggregate: [{ max: inch(2, 50), per: TWELVE }, { max: ofWeld(0.08) }]
		},
		internalConcavity: {
			clause: '9.3.6 (internal concavity, IC)',
			confidence: '2+',
			note: 'Any length, provided the image is no darker than the thinnest adjacent parent metal; darker areas are judged as burn-through.',
			darkerAs: 'burnThrough'
		},
		burnThrough: {
			clause: '9.3.7 (burn-through, BT)',
			confidence: '1',
			note: 'Counting burn-throughs whose image is darker than the thinnest adjacent parent metal: none over 1/4 in (6 mm) or over the thinner wall; in pipe of 2.375 in (60.3 mm) OD and more, at most 1/2 in (13 mm) in all in any 12 in (300 mm); in smaller pipe, no more than one.',
			onlyDarker: true,
			length: { lesserOf: [inch(1 / 4, 6), wall(1)] },
			aggregate: [
				{
					max: {
						by: 'diameter',
						steps: [{ below: LARGE_PIPE, value: inch(1 / 4, 6) }],
						otherwise: inch(1 / 2, 13)
					},
					per: TWELVE
				}
			],
			count: { max: 1, underDiameter: LARGE_PIPE }
		},
		elongatedSlag: {
			clause: '9.3.8.2 (elongated slag inclusions, ESI)',
			confidence: '2+',
			note: 'Parallel lines separated by more than 1/32 in (0.8 mm) are separate indications.',
			length: smallPipe('9.3.8.3', inch(2, 50)),
			width: smallPipe('9.3.8.3', inch(1 / 16, 1.6)),
			aggregate: [{ max: smallPipe('9.3.8.3', inch(2, 50)), per: TWELVE }]
		},
		isolatedSlag: {
			clause: '9.3.8.2 (isolated slag inclusions, ISI)',
			confidence: '2+',
			width: smallPipe('9.3.8.3', inch(1 / 8, 3)),
			aggregate: [{ max: smallPipe('9.3.8.3', inch(1 / 2, 13)), per: TWELVE }],
			count: { max: smallPipe('9.3.8.3', 4), per: TWELVE }
		},
		tungsten: {
			clause: '9.3 (no tungsten row)',
			confidence: 'mem',
			open: 'API 1104 has no tungsten inclusion row; it counts in the accumulation of imperfections (9.3.12).'
		},
		porosity: {
			clause: '9.3.9.2 (individual or scattered porosity, P)',
			confidence: 'mem',
			note: 'No pore over 1/8 in (3 mm) or 25 % of the thinner wall, whichever is smaller; the distribution is compared with Figures 18 and 19 by the examiner.',
			width: { lesserOf: [inch(1 / 8, 3), wall(0.25)] },
			open: 'Distribution against Figures 18 and 19.'
		},
		clusterPorosity: {
			clause: '9.3.9.3 (cluster porosity, CP)',
			confidence: 'mem',
			note: 'Outside the finish pass: cluster at most 1/2 in (13 mm) across, at most 1/2 in in all in any 12 in (300 mm), no pore in a cluster over 1/16 in (2 mm). In the finish pass it is judged as individual porosity.',
			length: inch(1 / 2, 13),
			width: inch(1 / 16, 2),
			aggregate: [{ max: inch(1 / 2, 13), per: TWELVE }]
		},
		hollowBead: {
			clause: '9.3.9.4 (hollow-bead porosity, HB)',
			confidence: 'mem',
			note: 'Individual at most 1/2 in (13 mm); at most 2 in (50 mm) in any 12 in (300 mm); in all at most 8 % of the weld length. Hollow beads over 1/4 in (6 mm) must be 2 in (50 mm) apart: for the examiner.',
			length: inch(1 / 2, 13),
			aggregate: [{ max: inch(2, 50), per: TWELVE }, { max: ofWeld(0.08) }]
		},
		undercut: {
			clause: '9.3.11 (undercutting, EU and IU)',
			confidence: '2+',
			note: 'External and internal undercut together: at most 2 in (50 mm) in any 12 in (300 mm), and at most one-sixth of the weld length. Depth is gauged visually (9.7).',
			aggregate: [{ max: inch(2, 50), per: TWELVE }, { max: ofWeld(1 / 6) }]
		}
	},
	groups: [
		{
			id: 'slag',
			label: 'Slag inclusions (ESI and ISI) together',
			types: ['elongatedSlag', 'isolatedSlag'],
			aggregate: [{ max: ofWeld(0.08) }],
			clause: '9.3.8.2 (slag inclusions)',
			confidence: '2+',
			note: 'Aggregate length of ESI and ISI at most 8 % of the weld length.'
		},
		{
			id: 'accumulation',
			label: 'Accumulation of imperfections',
			types: [
				'crack',
				'craterCrack',
				'lackOfFusion',
				'coldLap',
				'incompletePenetration',
				'crossPenetration',
				'burnThrough',
				'elongatedSlag',
				'isolatedSlag',
				'tungsten',
				'porosity',
				'clusterPorosity',
				'hollowBead'
			],
			aggregate: [{ max: inch(2, 50), per: TWELVE }, { max: ofWeld(0.08) }],
			clause: '9.3.12 (accumulation of imperfections)',
			confidence: '1',
			note: 'Excluding incomplete penetration due to high-low and undercutting: at most 2 in (50 mm) in any 12 in (300 mm), and at most 8 % of the weld length.'
		}
	]
};

export const api1104: CriteriaSet = {
	id: 'api-1104',
	name: 'API 1104 pipeline girth welds',
	standard: 'API Std 1104',
	edition: '21st edition (2013)',
	version: 1,
	scope:
		'Visual acceptance and fit-up of pipeline girth and fillet welds, and radiographic indications.',
	limits: {
		'rootOpening.range': perWps('Root opening as the qualified procedure specifies.'),
		'bevelAngle.range': perWps('Bevel angle as the qualified procedure specifies.'),
		'rootFace.range': perWps('Root face as the qualified procedure specifies.'),
		'misalignment.max': {
			rule: { type: 'max', max: inch(1 / 8, 3), beyond: 'judge' },
			clause: '7.2',
			confidence: '1',
			note: 'Equal nominal walls: the offset should not exceed 1/8 in (3 mm); more is permitted when it comes from pipe-end tolerances and is spread evenly round the circumference, so the inspector judges.'
		},
		crack: {
			rule: { type: 'absent' },
			clause: '9.3.10 (cracks)',
			confidence: '2+',
			note: 'A crack of any size or location is a defect, except shallow crater or star cracks up to 5/32 in (4 mm) long.'
		},
		fusion: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '9.3.4 (incomplete fusion, IF)',
			confidence: '2+',
			note: 'Incomplete fusion is limited by length: an indication at most 1 in (25 mm), at most 1 in in any 12 in (300 mm), at most 8 % of a weld under 12 in; the inspector measures it.'
		},
		overlap: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '9.7',
			confidence: 'mem',
			note: 'API 1104 has no overlap row; for the inspector.'
		},
		crater: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '7.8.2',
			confidence: 'mem',
			note: 'An unfilled crater leaves the crown below the pipe surface; for the inspector.'
		},
		'undercut.depth': {
			rule: {
				type: 'banded',
				max: { lesserOf: [inch(1 / 64, 0.4), wall(0.06)] },
				band: {
					upTo: { lesserOf: [inch(1 / 32, 0.8), wall(0.125)] },
					length: { max: { lesserOf: [inch(2, 50), ofWeld(1 / 6)] }, per: TWELVE }
				}
			},
			clause: '9.7 (undercut, visual or mechanical measurement)',
			confidence: '1',
			note: 'Over 1/32 in (0.8 mm) or 12.5 % of the wall, whichever is smaller, is a defect; over 1/64 in (0.4 mm) or 6 % up to that, at most 2 in (50 mm) in any continuous 12 in (300 mm) or 1/6 of the weld length, whichever is smaller. The 6 % is unconfirmed.'
		},
		'pore.largest': {
			rule: { type: 'max', max: { lesserOf: [inch(1 / 8, 3), wall(0.25)] } },
			clause: '9.3.9.2 (individual or scattered porosity)',
			confidence: 'mem',
			note: 'No pore over 1/8 in (3 mm) or 25 % of the thinner wall, whichever is smaller; the distribution is compared with Figures 18 and 19.'
		},
		'penetration.length': {
			rule: { type: 'length', allowance: perTwelve(inch(1, 25), 0.08) },
			clause: '9.3.1 (inadequate penetration, IP)',
			confidence: '2+',
			note: 'An indication at most 1 in (25 mm); at most 1 in in any 12 in (300 mm); in a weld under 12 in, at most 8 % of its length.'
		},
		'jointThickness.min': {
			rule: { type: 'min', min: wall(1) },
			clause: '9.3.6 (internal concavity, IC)',
			confidence: '1',
			note: 'Internal concavity of any length is acceptable where the joint is no thinner than the thinnest adjacent parent metal; thinner is judged as burn-through.'
		},
		'reinforcement.max': {
			rule: { type: 'max', max: inch(1 / 16, 1.6), beyond: 'judge' },
			clause: '7.8.2',
			confidence: '1',
			note: 'The cap should not stand more than 1/16 in (1.6 mm) above the parent metal: a "should", so the inspector judges beyond it (company specs often allow 0.100–0.125 in).'
		},
		'concavity.max': {
			rule: { type: 'max', max: 0 },
			clause: '7.8.2',
			confidence: '1',
			note: 'The crown shall not be below the outside surface of the pipe.'
		}
	},
	volumetric: {
		RT: radiography,
		UT: {
			clause: '9.6 (ultrasonic testing)',
			limits: {},
			notBuiltIn:
				'Ultrasonic indications are classed and judged by 9.6 (linear surface, linear buried, transverse, volumetric), which is not built in: for the examiner and the inspector.'
		}
	}
};
