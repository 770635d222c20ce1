/**
 * ASME B31.3-2018 Process Piping, Table 341.3.2 (acceptance criteria for welds, visual and
 * radiographic examination), the fillet and branch details of 328.5, and the fit-up of 328.4.
 * SI values lead in B31.3, with US customary in parentheses. Tw is the nominal wall of the
 * thinner component, taken as the joint thickness (for a branch, the branch wall).
 */
import type {
	CriteriaSet,
	Expr,
	IndicationLimit,
	Limit,
	MethodCriteria,
	Quantity,
	VolumetricCriteria
} from '../types';

type Column = 'normal' | 'severe-cyclic' | 'category-d';

const TABLE = 'Table 341.3.2';

/** Criterion L: height of reinforcement or internal protrusion by Tw; M (Category D) is twice L. */
function reinforcementHeight(factor: 1 | 2): Expr {
	const step = (inches: number, mm: number) => ({ in: inches * factor, mm: mm * factor });
	return {
		by: 'thickness',
		steps: [
			{ upTo: { in: 1 / 4, mm: 6 }, value: step(1 / 16, 1.5) },
			{ upTo: { in: 1 / 2, mm: 13 }, value: step(1 / 8, 3) },
			{ upTo: { in: 1, mm: 25 }, value: step(5 / 32, 4) }
		],
		otherwise: step(3 / 16, 5)
	};
}

const Tw = (times: number): Expr => ({ of: 'thickness', times });

/** Criterion H: undercut ≤ 1 mm (1/32 in) and ≤ Tw/4; "and" means the lesser governs (note 6). */
const criterionH: Expr = { lesserOf: [{ in: 1 / 32, mm: 1 }, Tw(0.25)] };

/** Criterion I: ≤ 1.5 mm (1/16 in) and ≤ [Tw/4 or 1 mm (1/32 in)]; "or" means the larger governs. */
const criterionI: Expr = {
	lesserOf: [{ in: 1 / 16, mm: 1.5 }, { greaterOf: [Tw(0.25), { in: 1 / 32, mm: 1 }] }]
};

/** Criterion B depth: ≤ 1 mm (1/32 in) and ≤ 0.2Tw. Criterion C depth: ≤ 0.2Tw. */
const depthB: Expr = { lesserOf: [{ in: 1 / 32, mm: 1 }, Tw(0.2)] };
const depthC: Expr = Tw(0.2);
/** Criteria B and C: cumulative length ≤ 38 mm (1.5 in) in any 150 mm (6 in) of weld. */
const SIX_INCHES: Quantity = { in: 6, mm: 150 };
const LENGTH_BC: Quantity = { in: 1.5, mm: 38 };

/** Longitudinal groove welds, where the joint records one; otherwise girth and branch. */
const longitudinal = (then: Expr, otherwise: Expr): Expr =>
	then === otherwise ? then : { when: { seam: 'longitudinal', unknown: 'no' }, then, otherwise };

/** Criterion letters for incomplete penetration by column: girth and branch, then longitudinal A. */
const penetration: Record<Column, { girth: 'A' | 'B' | 'C'; branch: 'A' | 'B' | 'C' }> = {
	normal: { girth: 'B', branch: 'B' },
	'severe-cyclic': { girth: 'A', branch: 'A' },
	'category-d': { girth: 'C', branch: 'B' }
};

function penetrationDepth(column: Column): Expr {
	const { girth, branch } = penetration[column];
	const depth = (criterion: 'A' | 'B' | 'C'): Expr =>
		criterion === 'A' ? 0 : criterion === 'B' ? depthB : depthC;
	return {
		when: { kindIn: ['branch'] },
		then: depth(branch),
		otherwise: longitudinal(0, depth(girth))
	};
}

function penetrationLength(column: Column): Expr {
	const { girth, branch } = penetration[column];
	const length = (criterion: 'A' | 'B' | 'C'): Expr => (criterion === 'A' ? 0 : LENGTH_BC);
	// B and C allow the same length; only A (none) sets a branch apart from a girth weld.
	if ((girth === 'A') === (branch === 'A')) return longitudinal(0, length(girth));
	return {
		when: { kindIn: ['branch'] },
		then: length(branch),
		otherwise: longitudinal(0, length(girth))
	};
}

const penetrationWords: Record<Column, string> = {
	normal: 'criterion B (girth, branch), A (longitudinal)',
	'severe-cyclic': 'criterion A',
	'category-d': 'criterion C (girth), B (branch), A (longitudinal)'
};

const undercut: Record<Column, Limit> = {
	normal: {
		rule: { type: 'banded', max: longitudinal(0, criterionH) },
		clause: `${TABLE}, undercut, criterion H`,
		confidence: '2+',
		note: 'Girth, branch and fillet welds; longitudinal groove welds allow none (criterion A).'
	},
	'severe-cyclic': {
		rule: { type: 'banded', max: 0 },
		clause: `${TABLE}, undercut, criterion A`,
		confidence: '2+'
	},
	'category-d': {
		rule: {
			type: 'banded',
			max: {
				when: { kindIn: ['butt'] },
				then: longitudinal(0, criterionI),
				otherwise: criterionH
			}
		},
		clause: `${TABLE}, undercut, criterion I (girth) / H (fillet, branch)`,
		confidence: '2+',
		note: 'Longitudinal groove welds allow none (criterion A).'
	}
};

const reinforcement = (column: Column): Expr =>
	reinforcementHeight(column === 'category-d' ? 2 : 1);
const criterionLabel = (column: Column) =>
	column === 'category-d' ? 'criterion M' : 'criterion L';

const perWps = (what: string): Limit => ({
	rule: { type: 'range', min: { open: what }, max: { open: what } },
	clause: '328.4.2',
	confidence: 'practice',
	note: 'B31.3 leaves joint preparation to the WPS; ends prepared to ASME B16.25 are acceptable (see that set).'
});

/** Criterion J: surface roughness ≤ 500 µin Ra (12.5 µm in SI). Roughness limits are µm: the
 * inch column's value times 25.4 must give µm, so 500 µin is entered as 0.5. */
const CRITERION_J: Quantity = { in: 0.5, mm: 12.5 };

const fusionLimit = (column: Column): Limit =>
	column === 'category-d'
		? {
				// A yes/no reading: none is within; on girth welds any is for the inspector to gauge.
				rule: {
					type: 'max',
					max: 0,
					judgeUpTo: {
						when: { kindIn: ['branch'] },
						then: 0,
						otherwise: longitudinal(0, {
							open: 'Criterion C: lack of fusion and incomplete penetration at most 0.2Tw deep and 38 mm (1.5 in) in any 150 mm (6 in).'
						})
					}
				},
				clause: `${TABLE}, lack of fusion, criterion C (girth) / A (longitudinal, branch)`,
				confidence: '2+',
				note: 'Fillet welds: no criterion (N/A).',
				kinds: ['butt', 'branch']
			}
		: {
				rule: { type: 'absent' },
				clause: `${TABLE}, lack of fusion, criterion A`,
				confidence: '2+'
			};

function limitsFor(column: Column): CriteriaSet['limits'] {
	return {
		'rootOpening.range': perWps('Root opening as the WPS specifies.'),
		'bevelAngle.range': perWps('Bevel angle as the WPS specifies.'),
		'rootFace.range': perWps('Root face as the WPS specifies.'),
		'socket.gap': {
			rule: { type: 'min', min: { in: 1 / 16, mm: 1.5 }, judgeAbove: 0 },
			clause: 'Fig. 328.5.2C',
			confidence: '2+',
			note: 'Approximately 1.5 mm (1/16 in) gap before welding; a pipe bottomed in the socket (no gap) is rejected by common practice, a smaller gap is for the inspector.'
		},
		'misalignment.max': {
			rule: {
				type: 'max',
				max: {
					open: 'B31.3 gives no number: inside surfaces aligned within the WPS and engineering design limits.'
				}
			},
			clause: '328.4.3',
			confidence: '2+',
			note: 'Unlike B31.1 (1/16 in) and API 1104 (1/8 in).'
		},
		crack: {
			rule: { type: 'absent' },
			clause: `${TABLE}, crack, criterion A`,
			confidence: '2+'
		},
		fusion: fusionLimit(column),
		overlap: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: TABLE,
			confidence: 'mem',
			note: 'Table 341.3.2 has no overlap row; overlap at the toe may hide lack of fusion, so the inspector judges.'
		},
		crater: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: `${TABLE}, criterion K`,
			confidence: 'mem',
			note: 'Table 341.3.2 has no crater row: the joint thickness at the crater must still be at least Tw; a crater crack is a crack.'
		},
		'undercut.depth': undercut[column],
		'porosity.max': {
			rule: {
				type: 'max',
				max: {
					by: 'thickness',
					steps: [{ upTo: { in: 3 / 16, mm: 5 }, value: 0 }],
					otherwise: {
						open: 'Note (5): surface porosity is evaluated only for welds of 5 mm (3/16 in) nominal thickness and less.'
					}
				}
			},
			clause: `${TABLE}, surface porosity or exposed slag inclusion, criterion A, note (5)`,
			confidence: '2+'
		},
		'penetration.length': {
			rule: {
				type: 'length',
				allowance: { max: penetrationLength(column), per: SIX_INCHES }
			},
			clause: `${TABLE}, incomplete penetration, ${penetrationWords[column]}`,
			confidence: '2+',
			note: 'Cumulative length at most 38 mm (1.5 in) in any 150 mm (6 in) of weld where the criterion allows any (the 2020 edition adds: or 25 % of the total weld length, whichever is less).'
		},
		'penetration.depth': {
			rule: { type: 'max', max: penetrationDepth(column) },
			clause: `${TABLE}, incomplete penetration, ${penetrationWords[column]}`,
			confidence: '2+',
			note: 'Criterion B: at most 1 mm (1/32 in) and 0.2Tw deep, the lesser governing; criterion C: 0.2Tw.'
		},
		'reinforcement.max': {
			rule: { type: 'max', max: reinforcement(column) },
			clause: `${TABLE}, weld reinforcement, ${criterionLabel(column)}`,
			confidence: '2+',
			note: 'Groove welds: the lesser of the heights from the two adjacent surfaces.'
		},
		'rootProtrusion.max': {
			rule: { type: 'max', max: reinforcement(column) },
			clause: `${TABLE}, internal protrusion, ${criterionLabel(column)}`,
			confidence: '2+',
			note: 'Internal protrusion takes the same height limit as reinforcement; aluminium is held tighter (note 9), not applied here.'
		},
		'jointThickness.min': {
			rule: { type: 'min', min: Tw(1) },
			clause: `${TABLE}, concave surface, concave root or burn-through, criterion K`,
			confidence: '2+',
			note: 'Total joint thickness, reinforcement included, at least Tw wherever the surface or the root is concave.'
		},
		'fillet.convexity': {
			rule: { type: 'max', max: reinforcement(column) },
			clause: `${TABLE}, weld reinforcement, ${criterionLabel(column)}, note (8)`,
			confidence: '2+',
			note: 'Fillet height measured from the theoretical throat (Fig. 328.5.2A); the convexity reading is taken as that height.'
		},
		'fillet.undersize': {
			rule: {
				type: 'max',
				max: {
					open: 'Table 341.3.2 has no undersize row: the fillet size is as designed (Fig. 328.5.2A).'
				}
			},
			clause: 'Fig. 328.5.2A',
			confidence: '2+',
			kinds: ['fillet']
		},
		'socket.filletSize': {
			rule: {
				type: 'min',
				min: {
					when: { given: 'socketWall' },
					then: { lesserOf: [Tw(1.09), { of: 'socketWall', times: 1 }] },
					otherwise: Tw(1.09)
				}
			},
			clause: 'Fig. 328.5.2C',
			confidence: '2+',
			note: 'Cx min: 1.09 × the nominal pipe wall. Where the socket wall is recorded and thinner, it governs: that alternative is unconfirmed — check the figure.'
		},
		'flange.filletSize': {
			rule: {
				type: 'min',
				min: {
					when: { given: 'socketWall' },
					then: { lesserOf: [Tw(1.4), { of: 'socketWall', times: 1 }] },
					otherwise: Tw(1.4)
				}
			},
			clause: 'Fig. 328.5.2B',
			confidence: '1',
			note: 'Slip-on and socket-welding flanges: x min is the lesser of 1.4T (nominal pipe wall) and the thickness of the hub; without the hub recorded, 1.4T.'
		},
		'branch.coverFillet': {
			rule: { type: 'min', min: { lesserOf: [Tw(0.7), { in: 1 / 4, mm: 6 }] } },
			clause: '328.5.4(d), Fig. 328.5.4D',
			confidence: '1',
			note: 'Cover fillet throat at least tc, the lesser of 0.7Tb and 6 mm (1/4 in); Tb is the branch wall, taken as the joint thickness.'
		},
		...(column === 'severe-cyclic'
			? {
					'surfaceFinish.max': {
						rule: { type: 'max', max: CRITERION_J },
						clause: `${TABLE}, surface finish, criterion J`,
						confidence: '2+',
						note: 'Surface roughness at most 500 µin Ra (12.5 µm) per ASME B46.1, on girth, longitudinal and fillet welds alike.'
					} satisfies Limit
				}
			: {})
	};
}

// ---- Radiography: the same table's radiography column ----------------------------------------

const linear = (individual: Expr, width: Expr, cumulative: Expr, per: Expr) => ({
	length: individual,
	width,
	aggregate: [{ max: cumulative, per }]
});

function radiography(column: Column): MethodCriteria {
	const rounded: IndicationLimit =
		column === 'category-d'
			? {
					clause: `${TABLE}, rounded indications (N/A)`,
					confidence: '2+',
					open: 'Category D sets no criterion for rounded indications.'
				}
			: {
					clause: `${TABLE}, rounded indications, criterion ${column === 'normal' ? 'E' : 'D'}`,
					confidence: '2+',
					open:
						column === 'normal'
							? 'Size and distribution against the charts of BPV Code Section VIII, Division 1, Appendix 4; for Tw over 6 mm (1/4 in) the limit is 1.5 × those.'
							: 'Size and distribution against the charts of BPV Code Section VIII, Division 1, Appendix 4.'
				};
	const slag: IndicationLimit =
		column === 'category-d'
			? {
					clause: `${TABLE}, linear indications (N/A)`,
					confidence: '2+',
					open: 'Category D sets no criterion for slag or elongated indications.'
				}
			: column === 'normal'
				? {
						clause: `${TABLE}, slag, tungsten or elongated indication, criterion G`,
						confidence: '2+',
						note: 'Individual length at most 2Tw; width at most 3 mm (1/8 in) and Tw/2; cumulative length at most 4Tw in any 150 mm (6 in).',
						...linear(Tw(2), { lesserOf: [{ in: 1 / 8, mm: 3 }, Tw(0.5)] }, Tw(4), SIX_INCHES)
					}
				: {
						clause: `${TABLE}, slag, tungsten or elongated indication, criterion F`,
						confidence: '2+',
						note: 'Individual length at most Tw/3; width at most 2.5 mm (3/32 in) and Tw/3; cumulative length at most Tw in any 12Tw of weld.',
						...linear(Tw(1 / 3), { lesserOf: [{ in: 3 / 32, mm: 2.5 }, Tw(1 / 3)] }, Tw(1), Tw(12))
					};
	const penetrationLimit: IndicationLimit = {
		clause: `${TABLE}, incomplete penetration, ${penetrationWords[column]}`,
		confidence: '2+',
		note: 'Radiography does not show depth: give it where another method measured it.',
		depth: penetrationDepth(column),
		aggregate: [{ max: penetrationLength(column), per: SIX_INCHES }]
	};
	return {
		clause: `${TABLE}, radiography`,
		limits: {
			crack: { clause: `${TABLE}, crack, criterion A`, confidence: '2+', absent: true },
			craterCrack: { clause: `${TABLE}, crack, criterion A`, confidence: '2+', absent: true },
			lackOfFusion:
				column === 'category-d'
					? {
							clause: `${TABLE}, lack of fusion, criterion C (girth), A (longitudinal, branch)`,
							confidence: '2+',
							depth: {
								when: { kindIn: ['branch'] },
								then: 0,
								otherwise: longitudinal(0, depthC)
							},
							aggregate: [
								{
									max: {
										when: { kindIn: ['branch'] },
										then: 0,
										otherwise: longitudinal(0, LENGTH_BC)
									},
									per: SIX_INCHES
								}
							]
						}
					: { clause: `${TABLE}, lack of fusion, criterion A`, confidence: '2+', absent: true },
			coldLap: { clause: `${TABLE}, lack of fusion, criterion A`, confidence: '2+', absent: true },
			incompletePenetration: penetrationLimit,
			hiLoPenetration: penetrationLimit,
			crossPenetration: penetrationLimit,
			internalConcavity: {
				clause: `${TABLE}, concave root or burn-through, criterion K`,
				confidence: '2+',
				open: 'Total joint thickness at least Tw: where the image is darker than the parent metal, gauge it.'
			},
			burnThrough: {
				clause: `${TABLE}, concave root or burn-through, criterion K`,
				confidence: '2+',
				open: 'Total joint thickness at least Tw at the burn-through: gauge it.'
			},
			elongatedSlag: slag,
			isolatedSlag: slag,
			tungsten: slag,
			porosity: rounded,
			clusterPorosity: rounded,
			hollowBead: slag,
			undercut: {
				clause: undercut[column].clause,
				confidence: '2+',
				note: 'Radiography does not show depth: give it where it was gauged.',
				depth: undercut[column].rule.type === 'banded' ? undercut[column].rule.max : 0
			}
		}
	};
}

function volumetric(column: Column): VolumetricCriteria {
	return {
		RT: radiography(column),
		UT: {
			clause: '344.6.2',
			limits: {},
			notBuiltIn:
				'Ultrasonic indications are judged by 344.6.2 (amplitude and length against the reference level), which is not built in: for the examiner and the inspector.'
		}
	};
}

const sharedScope =
	'Visual examination of girth, branch, fillet and socket welds, fit-up (Table 341.3.2, 328), and radiographic indications.';

export const asmeB313Normal: CriteriaSet = {
	id: 'asme-b31.3-normal',
	name: 'ASME B31.3 normal fluid service',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Normal and Category M fluid service. ${sharedScope}`,
	limits: limitsFor('normal'),
	volumetric: volumetric('normal')
};

export const asmeB313SevereCyclic: CriteriaSet = {
	id: 'asme-b31.3-severe-cyclic',
	name: 'ASME B31.3 severe cyclic conditions',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Severe cyclic conditions, surface finish (criterion J) included. ${sharedScope}`,
	limits: limitsFor('severe-cyclic'),
	volumetric: volumetric('severe-cyclic')
};

export const asmeB313CategoryD: CriteriaSet = {
	id: 'asme-b31.3-category-d',
	name: 'ASME B31.3 Category D fluid service',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Category D fluid service. ${sharedScope}`,
	limits: limitsFor('category-d'),
	volumetric: volumetric('category-d')
};
