/**
 * ASME B31.3-2018 Process Piping, Table 341.3.2 (acceptance criteria, visual examination) and the
 * fit-up clauses of 328. SI values lead in B31.3, with US customary in parentheses.
 * Tw is the nominal wall of the thinner component; the joint thickness is taken as Tw.
 */
import type { CriteriaSet, Expr, Limit } from '../types';

type Column = 'normal' | 'severe-cyclic' | 'category-d';

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

/** Criterion H: undercut ≤ 1 mm (1/32 in) and ≤ Tw/4; "and" means the lesser governs (note 6). */
const criterionH: Expr = {
	lesserOf: [
		{ in: 1 / 32, mm: 1 },
		{ of: 'thickness', times: 0.25 }
	]
};

/** Criterion I: ≤ 1.5 mm (1/16 in) and ≤ [Tw/4 or 1 mm (1/32 in)]; "or" means the larger governs. */
const criterionI: Expr = {
	lesserOf: [
		{ in: 1 / 16, mm: 1.5 },
		{
			greaterOf: [
				{ of: 'thickness', times: 0.25 },
				{ in: 1 / 32, mm: 1 }
			]
		}
	]
};

const undercut: Record<Column, Limit> = {
	normal: {
		rule: { type: 'banded', max: criterionH },
		clause: 'Table 341.3.2, undercut, criterion H',
		confidence: '2+',
		note: 'Girth, branch and fillet welds; longitudinal groove welds allow none (criterion A).'
	},
	'severe-cyclic': {
		rule: { type: 'banded', max: 0 },
		clause: 'Table 341.3.2, undercut, criterion A',
		confidence: '2+'
	},
	'category-d': {
		rule: {
			type: 'banded',
			max: { when: { kindIn: ['butt'] }, then: criterionI, otherwise: criterionH }
		},
		clause: 'Table 341.3.2, undercut, criterion I (girth) / H (fillet, branch)',
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
			clause: 'Table 341.3.2, crack, criterion A',
			confidence: '2+'
		},
		fusion:
			column === 'category-d'
				? {
						rule: { type: 'absent', beyond: 'judge' },
						clause: 'Table 341.3.2, lack of fusion',
						confidence: 'mem',
						note: 'From memory: Category D may accept limited lack of fusion by depth and length; for the inspector.'
					}
				: {
						rule: { type: 'absent' },
						clause: 'Table 341.3.2, lack of fusion, criterion A',
						confidence: 'mem',
						note: 'From memory: the lack-of-fusion row was not in the copies seen.'
					},
		overlap: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: 'Table 341.3.2',
			confidence: 'mem',
			note: 'No overlap row that we know of (from memory); overlap at the toe may hide lack of fusion, so the inspector judges.'
		},
		crater: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: 'Table 341.3.2, criterion K',
			confidence: 'mem',
			note: 'No crater row that we know of (from memory): the joint thickness at the crater must still be at least Tw; a crater crack is a crack.'
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
			clause: 'Table 341.3.2, surface porosity, criterion A, note (5)',
			confidence: '2+'
		},
		'reinforcement.max': {
			rule: { type: 'max', max: reinforcement(column) },
			clause: `Table 341.3.2, reinforcement, ${criterionLabel(column)}`,
			confidence: '2+',
			note: 'Groove welds: the lesser of the heights from the two adjacent surfaces.'
		},
		'concavity.max': {
			rule: {
				type: 'max',
				max: {
					open: 'Criterion K: the total joint thickness, reinforcement included, must not be less than Tw.'
				}
			},
			clause: 'Table 341.3.2, root/surface concavity, criterion K',
			confidence: '2+'
		},
		'fillet.convexity': {
			rule: { type: 'max', max: reinforcement(column) },
			clause: `Table 341.3.2, reinforcement, ${criterionLabel(column)}, note (8)`,
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
			rule: { type: 'min', min: { of: 'thickness', times: 1.09 } },
			clause: 'Fig. 328.5.2C',
			confidence: '2+',
			note: 'Cx min = 1.09 × the nominal pipe wall; "or the socket wall, whichever is smaller" is from memory and not applied.'
		}
	};
}

const sharedScope =
	'Visual examination of girth, branch, fillet and socket welds, and fit-up (Table 341.3.2, 328).';

export const asmeB313Normal: CriteriaSet = {
	id: 'asme-b31.3-normal',
	name: 'ASME B31.3 normal fluid service',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Normal and Category M fluid service. ${sharedScope}`,
	limits: limitsFor('normal')
};

export const asmeB313SevereCyclic: CriteriaSet = {
	id: 'asme-b31.3-severe-cyclic',
	name: 'ASME B31.3 severe cyclic conditions',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Severe cyclic conditions; surface finish (500 µin Ra, criterion J) is not gauged here. ${sharedScope}`,
	limits: limitsFor('severe-cyclic')
};

export const asmeB313CategoryD: CriteriaSet = {
	id: 'asme-b31.3-category-d',
	name: 'ASME B31.3 Category D fluid service',
	standard: 'ASME B31.3',
	edition: '2018',
	version: 1,
	scope: `Category D fluid service. ${sharedScope}`,
	limits: limitsFor('category-d')
};
