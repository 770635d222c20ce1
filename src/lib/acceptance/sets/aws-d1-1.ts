/**
 * AWS D1.1/D1.1M:2020 Structural Welding Code — Steel, nontubular connections.
 * Clause numbers of the 2020 edition (the 2025 edition keeps them); 2015 and earlier used
 * Table 6.1 and clause 5. Inch and SI values are separate columns, as the code states.
 */
import type { CriteriaSet, Expr, Limit } from '../types';

const EDITION = '2020';

/** Table 8.1 (undersized welds): allowed shortfall U by specified size L. */
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
	note: "As-fit-up tolerances are relative to the detail, e.g. TC-U4b: R +1/16/−1/8 in, α +10°/−5° (one copy of the 2020 figure). A project set can fix the detail's limits."
});

const sharedLimits = {
	'fillet.gap': {
		rule: {
			type: 'max',
			max: {
				by: 'thickness',
				steps: [{ below: { in: 3, mm: 75 }, value: { in: 3 / 16, mm: 5 } }],
				otherwise: { in: 5 / 16, mm: 8 }
			}
		},
		clause: '7.21.1',
		confidence: 'mem',
		note: 'From memory: root opening of fillet-welded parts at most 3/16 in [5 mm], 5/16 in [8 mm] for parts 3 in [75 mm] and thicker; from 1/16 in [2 mm] the fillet leg must be increased by the opening.'
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
		note: 'Parts restrained against bending: offset at most 10 % of the thinner part, never over 1/8 in [3 mm]. Values from one source; the clause number is from memory.'
	},
	crack: { rule: { type: 'absent' }, clause: 'Table 8.1 (crack prohibition)', confidence: '2+' },
	fusion: {
		rule: { type: 'absent' },
		clause: 'Table 8.1 (weld/base-metal fusion)',
		confidence: '2+'
	},
	crater: {
		rule: { type: 'absent' },
		clause: 'Table 8.1 (crater cross section)',
		confidence: '2+',
		note: 'Except the ends of intermittent fillets outside their effective length.'
	},
	overlap: { rule: { type: 'absent' }, clause: '7.23 (weld profiles)', confidence: '2+' },
	'reinforcement.max': {
		rule: { type: 'max', max: { in: 1 / 8, mm: 3 } },
		clause: '7.23, Table 7.8 (weld profiles)',
		confidence: 'mem',
		note: 'From memory: 1/8 in [3 mm], as in the older Fig. 5.4. The profile schedules of 2010 and later may grade it by thickness (3/16 in over 1 in, 1/4 in over 2 in); check a licensed copy.',
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
		note: 'Face-width steps of the pre-2010 Fig. 5.4 note, still quoted for 2020 (one source); the 3/16 in [5 mm] step for W ≥ 1 in is from memory, and the 2020 schedule tables were not checked. Outside corner joints are excepted.'
	},
	'fillet.undersize': {
		rule: {
			type: 'banded',
			max: 0,
			band: { upTo: undersizeAllowance, length: { max: { of: 'weldLength', times: 0.1 } } }
		},
		clause: 'Table 8.1 (undersized welds)',
		confidence: '2+',
		note: 'Undersize within U needs no correction over at most 10 % of the weld length; girder web-to-flange welds allow none within twice the flange width of each end.'
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
				band: { upTo: { in: 1 / 16, mm: 2 }, length: { max: { in: 2, mm: 50 } } }
			},
			clause: 'Table 8.1 (undercut), statically loaded',
			confidence: '2+',
			note: 'Under 1 in [25 mm]: 1/32 in [1 mm] at any length, up to 1/16 in [2 mm] for an accumulated 2 in [50 mm] in any 12 in [300 mm]. 1 in and over: 1/16 in [2 mm] at any length.'
		},
		'porosity.max': {
			rule: {
				type: 'max',
				max: {
					when: { kindIn: ['butt'] },
					then: { when: { stress: 'transverse' }, then: 0, otherwise: { in: 3 / 8, mm: 10 } },
					otherwise: { in: 3 / 8, mm: 10 }
				}
			},
			clause: 'Table 8.1 (piping porosity), statically loaded',
			confidence: '2+',
			note: 'Sum of visible piping pores of 1/32 in [1 mm] and over in any inch; none in CJP groove welds of butt joints transverse to tensile stress (butt joints are taken as CJP). The 3/4 in [20 mm] sum in any 12 in [300 mm] is for the inspector.'
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
			clause: 'Table 8.1 (undercut), cyclically loaded',
			confidence: '1',
			note: '0.01 in [0.25 mm] in primary members where the weld is transverse to tensile stress (several sources); 1/32 in [1 mm] in all other cases (one code-page copy).'
		},
		'porosity.max': {
			rule: {
				type: 'max',
				max: 0,
				judgeUpTo: {
					when: { kindIn: ['butt'] },
					then: { when: { stress: 'transverse' }, then: 0, otherwise: { in: 3 / 32, mm: 2.5 } },
					otherwise: { in: 3 / 32, mm: 2.5 }
				}
			},
			clause: 'Table 8.1 (piping porosity), cyclically loaded',
			confidence: '1',
			note: 'At most one pore in 4 in [100 mm] and none over 3/32 in [2.5 mm] (the diameter from one source, the frequency from memory). A sum in one inch cannot show the frequency, so up to 3/32 in the inspector judges; more means a pore too large or too close. None in CJP butt joints transverse to tensile stress (from memory).'
		}
	}
};
