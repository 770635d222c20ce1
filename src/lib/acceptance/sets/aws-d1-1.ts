/**
 * AWS D1.1/D1.1M:2020 Structural Welding Code — Steel, nontubular connections.
 * Clause numbers of the 2020 edition (the 2025 edition keeps them); 2015 and earlier used
 * Table 6.1 and clause 5 (5.22 in 2010, 5.21 in 2015, 7.21 in 2020 for fit-up tolerances).
 * Inch and SI values are separate columns, as the code states.
 */
import type { CriteriaSet, Expr, Limit } from '../types';

const EDITION = '2020';

/** Table 8.1 (6) undersized welds: allowed shortfall U by specified size L. */
const undersizeAllowance: Expr = {
	by: 'requiredSize',
	steps: [
		// L ≤ 3/16 in [5 mm] → 1/16 in [2 mm]; sizes between the table's rows take the smaller allowance.
		{ below: { in: 1 / 4, mm: 6 }, value: { in: 1 / 16, mm: 2 } },
		{ below: { in: 5 / 16, mm: 8 }, value: { in: 3 / 32, mm: 2.5 } }
	],
	otherwise: { in: 1 / 8, mm: 3 }
};

const perWps = (reading: string) =>
	({
		type: 'range',
		min: {
			open: `D1.1 sets ${reading} tolerances against the joint detail on the WPS or drawing.`
		},
		max: { open: `D1.1 sets ${reading} tolerances against the joint detail on the WPS or drawing.` }
	}) as const;

const fitupDetail = (reading: string): Limit => ({
	rule: perWps(reading),
	clause: 'Fig. 5.1 (prequalified CJP details)',
	confidence: '1',
	note: 'As-fit-up tolerances are relative to the detail, e.g. TC-U4b: R +1/16/−1/8 in, α +10°/−5°. A project set or the WPS joint design fixes the numbers.'
});

/** CJP groove welds in butt joints transverse to the computed tensile stress (butt joints taken as CJP). */
const cjpTransverse = (inCjp: Expr, otherwise: Expr): Expr => ({
	when: { kindIn: ['butt'] },
	then: { when: { stress: 'transverse' }, then: inCjp, otherwise },
	otherwise
});

const GAP_OVER: Limit['appliesOver'] = {
	reading: 'rootOpening',
	value: { in: 1 / 16, mm: 2 }
};

const sharedLimits = {
	'fillet.gap': {
		rule: {
			type: 'max',
			max: { in: 3 / 16, mm: 5 },
			judgeUpTo: {
				by: 'thickness',
				steps: [{ below: { in: 3, mm: 75 }, value: { in: 3 / 16, mm: 5 } }],
				otherwise: { in: 5 / 16, mm: 8 }
			}
		},
		clause: '7.21.1',
		confidence: '2+',
		note: 'Parts brought into as close contact as practicable: root opening at most 3/16 in [5 mm]. Shapes or plates 3 in [75 mm] and thicker that cannot be closed after straightening may open to 5/16 in [8 mm] with suitable backing: for the inspector. Over 1/16 in [2 mm], the fillet leg is increased by the opening.'
	},
	'fillet.gapLeg': {
		rule: {
			type: 'min',
			min: {
				sumOf: [
					{ of: 'requiredSize', times: 1 },
					{ of: 'rootOpening', times: 1 }
				]
			},
			judgeAbove: 0
		},
		clause: '7.21.1',
		confidence: '2+',
		note: 'Root opening over 1/16 in [2 mm]: the leg is increased by the amount of the opening, or the contractor demonstrates that the required effective throat is obtained, so a shorter leg is for the inspector. The root opening is the one gauged at fit-up.',
		appliesOver: GAP_OVER
	},
	'rootOpening.range': fitupDetail('root opening'),
	'bevelAngle.range': fitupDetail('groove angle'),
	'rootFace.range': fitupDetail('root face'),
	'misalignment.max': {
		rule: {
			type: 'max',
			max: {
				lesserOf: [
					{ of: 'thickness', times: 0.1 },
					{ in: 1 / 8, mm: 3 }
				]
			}
		},
		clause: '7.21.3',
		confidence: '1',
		note: 'Parts restrained against bending: offset at most 10 % of the thinner part, never over 1/8 in [3 mm].'
	},
	crack: { rule: { type: 'absent' }, clause: 'Table 8.1 (1) crack prohibition', confidence: '2+' },
	fusion: {
		rule: { type: 'absent' },
		clause: 'Table 8.1 (2) weld/base-metal fusion',
		confidence: '2+'
	},
	crater: {
		rule: { type: 'absent' },
		clause: 'Table 8.1 (3) crater cross section',
		confidence: '2+',
		note: 'Craters filled to the specified weld size, except the ends of intermittent fillets outside their effective length.'
	},
	overlap: { rule: { type: 'absent' }, clause: '7.23 (weld profiles)', confidence: '2+' },
	'reinforcement.max': {
		rule: { type: 'max', max: { in: 1 / 8, mm: 3 } },
		clause: '7.23, Table 7.8 (weld profiles)',
		confidence: 'mem',
		note: '1/8 in [3 mm], as in the older Fig. 5.4. The profile schedules of 2010 and later may grade it by thickness (3/16 in over 1 in, 1/4 in over 2 in).',
		kinds: ['butt']
	},
	'fillet.convexity': {
		rule: {
			type: 'max',
			max: {
				by: 'faceWidth',
				steps: [
					{ upTo: { in: 5 / 16, mm: 8 }, value: { in: 1 / 16, mm: 2 } },
					{ below: { in: 1, mm: 25 }, value: { in: 1 / 8, mm: 3 } }
				],
				otherwise: { in: 3 / 16, mm: 5 }
			}
		},
		clause: '7.23, Fig. 7.4, Table 7.8',
		confidence: '1',
		note: 'Face-width steps of the pre-2010 Fig. 5.4 note, still quoted for 2020; the 3/16 in [5 mm] step for W ≥ 1 in and the 2020 schedule tables are unconfirmed. Outside corner joints are excepted.'
	},
	'fillet.undersize': {
		rule: {
			type: 'banded',
			max: 0,
			band: { upTo: undersizeAllowance, length: { max: { of: 'weldLength', times: 0.1 } } }
		},
		clause: 'Table 8.1 (6) undersized welds',
		confidence: '2+',
		note: 'A continuous fillet may be under the specified size L by at most U without correction, the undersize portion at most 10 % of the weld length; girder web-to-flange welds allow no underrun within twice the flange width of each end.'
	}
} satisfies Partial<CriteriaSet['limits']>;

export const awsD11Static: CriteriaSet = {
	id: 'aws-d1.1-static',
	name: 'AWS D1.1 statically loaded nontubular',
	standard: 'AWS D1.1/D1.1M',
	edition: EDITION,
	version: 1,
	scope: 'Visual acceptance and fit-up of nontubular connections, statically loaded.',
	limits: {
		...sharedLimits,
		'undercut.depth': {
			rule: {
				type: 'banded',
				max: {
					by: 'thickness',
					steps: [{ below: { in: 1, mm: 25 }, value: { in: 1 / 32, mm: 1 } }],
					otherwise: { in: 1 / 16, mm: 2 }
				},
				band: {
					upTo: { in: 1 / 16, mm: 2 },
					length: { max: { in: 2, mm: 50 }, per: { in: 12, mm: 300 } }
				}
			},
			clause: 'Table 8.1 (7)(A) undercut, statically loaded',
			confidence: '2+',
			note: 'Under 1 in [25 mm]: 1/32 in [1 mm] at any length, up to 1/16 in [2 mm] for an accumulated 2 in [50 mm] in any 12 in [300 mm]. 1 in and over: 1/16 in [2 mm] at any length.'
		},
		'porosity.max': {
			rule: { type: 'max', max: cjpTransverse(0, { in: 3 / 8, mm: 10 }) },
			clause: 'Table 8.1 (8)(A) piping porosity, statically loaded',
			confidence: '2+',
			note: 'Sum of the diameters of visible piping pores of 1/32 in [1 mm] and over in any linear inch; none in CJP groove welds of butt joints transverse to the computed tensile stress.'
		},
		'porosity.total': {
			rule: { type: 'max', max: cjpTransverse(0, { in: 3 / 4, mm: 20 }) },
			clause: 'Table 8.1 (8)(A) piping porosity, statically loaded',
			confidence: '2+',
			note: 'Sum of the diameters of visible piping pores of 1/32 in [1 mm] and over in any 12 in [300 mm] of weld.'
		}
	}
};

export const awsD11Cyclic: CriteriaSet = {
	id: 'aws-d1.1-cyclic',
	name: 'AWS D1.1 cyclically loaded nontubular',
	standard: 'AWS D1.1/D1.1M',
	edition: EDITION,
	version: 1,
	scope: 'Visual acceptance and fit-up of nontubular connections, cyclically loaded.',
	limits: {
		...sharedLimits,
		'undercut.depth': {
			rule: {
				type: 'banded',
				max: {
					when: { member: 'primary' },
					then: {
						when: { stress: 'transverse' },
						then: { in: 0.01, mm: 0.25 },
						otherwise: { in: 1 / 32, mm: 1 }
					},
					otherwise: { in: 1 / 32, mm: 1 }
				}
			},
			clause: 'Table 8.1 (7)(B) undercut, cyclically loaded',
			confidence: '1',
			note: '0.01 in [0.25 mm] in primary members where the weld is transverse to tensile stress under any design loading; 1/32 in [1 mm] in all other cases.'
		},
		'pore.largest': {
			rule: { type: 'max', max: cjpTransverse(0, { in: 3 / 32, mm: 2.5 }) },
			clause: 'Table 8.1 (8)(B), (8)(C) piping porosity, cyclically loaded',
			confidence: '1',
			note: 'Fillet welds and groove welds other than CJP butt joints transverse to tensile stress: no pore over 3/32 in [2.5 mm]; in those CJP butt joints, none. Fillets joining stiffeners to webs take the static sums instead (3/8 in in any inch, 3/4 in in any 12 in).'
		},
		'pore.count': {
			rule: { type: 'max', max: cjpTransverse(0, 1) },
			clause: 'Table 8.1 (8)(B), (8)(C) piping porosity, cyclically loaded',
			confidence: '1',
			note: 'Frequency of piping porosity at most one in each 4 in [100 mm] of weld length; none in CJP groove welds of butt joints transverse to tensile stress.'
		}
	}
};
