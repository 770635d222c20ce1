/**
 * API Standard 1104, Welding of Pipelines and Related Facilities, 21st edition (2013).
 * Clause numbers of the 20th/21st editions; the values were the same from the 19th to the 22nd
 * as far as the sources show. The wall thickness is that of the thinner pipe.
 */
import type { CriteriaSet, Limit } from '../types';

const perWps = (what: string): Limit => ({
	rule: { type: 'range', min: { open: what }, max: { open: what } },
	clause: '5.4 (procedure specification, joint design)',
	confidence: 'mem',
	note: 'Joint design is an item of the qualified procedure; the clause number is from memory.'
});

export const api1104: CriteriaSet = {
	id: 'api-1104',
	name: 'API 1104 pipeline girth welds',
	standard: 'API Std 1104',
	edition: '21st edition (2013)',
	version: 1,
	scope: 'Visual acceptance and fit-up of pipeline girth and fillet welds.',
	limits: {
		'rootOpening.range': perWps('Root opening as the qualified procedure specifies.'),
		'bevelAngle.range': perWps('Bevel angle as the qualified procedure specifies.'),
		'rootFace.range': perWps('Root face as the qualified procedure specifies.'),
		'misalignment.max': {
			rule: { type: 'max', max: { in: 1 / 8, mm: 3 }, beyond: 'judge' },
			clause: '7.2',
			confidence: '1',
			note: 'Equal nominal walls: the offset should not exceed 1/8 in (3 mm); more is permitted when it comes from pipe-end tolerances and is spread evenly round the circumference, so the inspector judges.'
		},
		crack: {
			rule: { type: 'absent' },
			clause: '9.3 (cracks)',
			confidence: 'mem',
			note: 'From memory: a crack of any size or location is a defect, except shallow crater or star cracks up to 5/32 in (4 mm) long.'
		},
		fusion: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '9.3 (incomplete fusion)',
			confidence: 'mem',
			note: 'From memory: incomplete fusion is limited by length (about 1 in (25 mm) in any 12 in (300 mm)), so the inspector judges.'
		},
		overlap: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '9.7',
			confidence: 'mem',
			note: 'No overlap row that we know of (from memory); for the inspector.'
		},
		crater: {
			rule: { type: 'absent', beyond: 'judge' },
			clause: '7.8.2',
			confidence: 'mem',
			note: 'From memory: an unfilled crater leaves the crown below the pipe surface; for the inspector.'
		},
		'undercut.depth': {
			rule: {
				type: 'banded',
				max: {
					lesserOf: [
						{ in: 1 / 64, mm: 0.4 },
						{ of: 'thickness', times: 0.06 }
					]
				},
				band: {
					upTo: {
						lesserOf: [
							{ in: 1 / 32, mm: 0.8 },
							{ of: 'thickness', times: 0.125 }
						]
					},
					length: {
						max: {
							lesserOf: [
								{ in: 2, mm: 50 },
								{ of: 'weldLength', times: 1 / 6 }
							]
						}
					}
				}
			},
			clause: '9.7 (undercut, visual or mechanical measurement)',
			confidence: '1',
			note: 'Over 1/32 in (0.8 mm) or 12.5 % of the wall, whichever is smaller, is a defect; over 1/64 in (0.4 mm) or 6 % up to that, at most 2 in (50 mm) in any continuous 12 in (300 mm) or 1/6 of the weld length, whichever is smaller. Ceiling and band from one source each; the 6 % is from memory.'
		},
		'porosity.max': {
			rule: {
				type: 'max',
				max: {
					lesserOf: [
						{ in: 1 / 8, mm: 3 },
						{ of: 'thickness', times: 0.25 }
					]
				},
				beyond: 'judge'
			},
			clause: '9.3.9.2',
			confidence: 'mem',
			note: 'From memory: an individual pore over 1/8 in (3 mm) or 25 % of the thinner wall, whichever is smaller, is a defect. Within that even the sum passes; above it the pores are for the inspector to size and count.'
		},
		'reinforcement.max': {
			rule: { type: 'max', max: { in: 1 / 16, mm: 1.6 }, beyond: 'judge' },
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
	}
};
