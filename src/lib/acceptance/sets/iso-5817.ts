/**
 * ISO 5817:2014 Welding — fusion-welded joints in steel — quality levels for imperfections.
 * Level B is stringent, C intermediate, D moderate. Imperfections are named by their ISO 6520-1
 * reference number. Symbols: t thickness, b width of the weld face, a nominal throat
 * (0.7071 × the required fillet size, which Tacksheet records as the leg), h height of the
 * imperfection; all mm. EN 25817 (1992) used other undercut and throat rows; the 2023 edition
 * was not checked.
 */
import type { CheckId, Confidence, CriteriaSet, Expr, Limit } from '../types';

type Level = 'B' | 'C' | 'D';

interface LevelValues {
	undercut: { factor: number; cap: number; thin: 'none' | 'short'; confidence: Confidence };
	excessWeldMetal: { factor: number; cap: number; confidence: Confidence };
	convexity: { factor: number; cap: number };
	excessThroat?: { factor: number; cap: number; confidence: Confidence };
	insufficientThroatCap?: number;
	misalignment: { plate: number; plateCap: number; circumferentialCap: number };
	asymmetry: { plus: number; factor: number };
	pore?: { factor: number; cap: number };
	/** overlap and end craters are tolerated by height at this level, so the inspector judges */
	toleratesOverlap: boolean;
	toleratesCrater: boolean;
}

const levels: Record<Level, LevelValues> = {
	B: {
		undercut: { factor: 0.05, cap: 0.5, thin: 'none', confidence: '1' },
		excessWeldMetal: { factor: 0.1, cap: 5, confidence: '2+' },
		convexity: { factor: 0.1, cap: 3 },
		excessThroat: { factor: 0.15, cap: 3, confidence: '2+' },
		misalignment: { plate: 0.1, plateCap: 3, circumferentialCap: 2 },
		asymmetry: { plus: 1.5, factor: 0.15 },
		toleratesOverlap: false,
		toleratesCrater: false
	},
	C: {
		undercut: { factor: 0.1, cap: 0.5, thin: 'short', confidence: '1' },
		excessWeldMetal: { factor: 0.15, cap: 7, confidence: '2+' },
		convexity: { factor: 0.15, cap: 4 },
		excessThroat: { factor: 0.2, cap: 4, confidence: '1' },
		insufficientThroatCap: 1,
		misalignment: { plate: 0.15, plateCap: 4, circumferentialCap: 3 },
		asymmetry: { plus: 2, factor: 0.15 },
		pore: { factor: 0.2, cap: 2 },
		toleratesOverlap: false,
		toleratesCrater: true
	},
	D: {
		undercut: { factor: 0.2, cap: 1, thin: 'short', confidence: 'mem' },
		excessWeldMetal: { factor: 0.25, cap: 10, confidence: 'mem' },
		convexity: { factor: 0.25, cap: 5 },
		insufficientThroatCap: 2,
		misalignment: { plate: 0.25, plateCap: 5, circumferentialCap: 4 },
		asymmetry: { plus: 2, factor: 0.2 },
		pore: { factor: 0.3, cap: 3 },
		toleratesOverlap: true,
		toleratesCrater: true
	}
};

/** t 0.5–3 mm and t > 3 mm rows. */
const byThinWall = (thin: Expr, thick: Expr): Expr => ({
	by: 'thickness',
	steps: [{ upTo: 3, value: thin }],
	otherwise: thick
});

const capped = (
	of: 'thickness' | 'faceWidth' | 'nominalThroat',
	factor: number,
	cap: number,
	plus = 0
): Expr => ({
	lesserOf: [{ of, times: factor, plus }, cap]
});

const CONFIDENCE_NOTE: Partial<Record<Confidence, string>> = {
	'1': 'Values from one source.',
	mem: 'Values from memory.'
};

function limitsFor(level: Level): CriteriaSet['limits'] {
	const v = levels[level];
	const undercutDepth = capped('thickness', v.undercut.factor, v.undercut.cap);
	const limits: Partial<Record<CheckId, Limit>> = {
		'misalignment.max': {
			rule: {
				type: 'max',
				max: {
					either: [
						byThinWall(
							{ of: 'thickness', times: v.misalignment.plate, plus: 0.2 },
							capped('thickness', v.misalignment.plate, v.misalignment.plateCap)
						),
						capped('thickness', 0.5, v.misalignment.circumferentialCap)
					],
					because:
						'Plates (507) and circumferential welds (5072) have different limits; the joint does not say which this is.'
				}
			},
			clause: 'Table 1, 507 / 5072 (linear misalignment)',
			confidence: 'mem',
			note: 'Values from memory.',
			stages: ['fitup', 'visual']
		},
		crack: {
			rule: { type: 'absent' },
			clause: 'Table 1, 100 (crack)',
			confidence: '1',
			note: 'Not permitted at any level.'
		},
		fusion: {
			rule: { type: 'absent' },
			clause: 'Table 1, 401 (lack of fusion)',
			confidence: '1',
			note: 'Not permitted at any level.'
		},
		overlap: {
			rule: v.toleratesOverlap ? { type: 'absent', beyond: 'judge' } : { type: 'absent' },
			clause: 'Table 1, 506 (overlap)',
			confidence: 'mem',
			note: v.toleratesOverlap
				? 'From memory: level D allows overlap up to h ≤ 0.2b; the inspector measures it.'
				: 'From memory: not permitted at this level.'
		},
		crater: {
			rule: v.toleratesCrater ? { type: 'absent', beyond: 'judge' } : { type: 'absent' },
			clause: 'Table 1, 2025 (end crater pipe)',
			confidence: 'mem',
			note: v.toleratesCrater
				? `From memory: allowed as a short imperfection up to h ≤ ${level === 'C' ? '0.1t, max 1' : '0.2t, max 2'} mm; the inspector measures it.`
				: 'From memory: not permitted at this level.'
		},
		'undercut.depth': {
			rule:
				v.undercut.thin === 'none'
					? { type: 'banded', max: byThinWall(0, undercutDepth) }
					: {
							type: 'banded',
							max: byThinWall(0, undercutDepth),
							band: { upTo: undercutDepth, length: { short: true } }
						},
			clause: 'Table 1, 5011 / 5012 (undercut)',
			confidence: v.undercut.confidence,
			note: `t > 3 mm: h ≤ ${v.undercut.factor}t, max ${v.undercut.cap} mm, with a smooth transition. t ≤ 3 mm: ${v.undercut.thin === 'none' ? 'not permitted' : `short imperfections only, h ≤ ${v.undercut.factor}t`}. ${CONFIDENCE_NOTE[v.undercut.confidence] ?? ''} The short-imperfection rule (25 mm in any 100 mm) is from memory.`
		},
		'reinforcement.max': {
			rule: {
				type: 'max',
				max: capped('faceWidth', v.excessWeldMetal.factor, v.excessWeldMetal.cap, 1)
			},
			clause: 'Table 1, 502 (excess weld metal)',
			confidence: v.excessWeldMetal.confidence,
			note: `h ≤ 1 + ${v.excessWeldMetal.factor}b, max ${v.excessWeldMetal.cap} mm. ${CONFIDENCE_NOTE[v.excessWeldMetal.confidence] ?? ''}`.trim()
		},
		'fillet.convexity': {
			rule: { type: 'max', max: capped('faceWidth', v.convexity.factor, v.convexity.cap, 1) },
			clause: 'Table 1, 503 (excessive convexity)',
			confidence: '2+',
			note: `h ≤ 1 + ${v.convexity.factor}b, max ${v.convexity.cap} mm.`
		},
		'fillet.throat.min': {
			rule: byThinWallThroat(v.insufficientThroatCap),
			clause: 'Table 1, 5213 (insufficient throat thickness)',
			confidence: '1',
			note: `${v.insufficientThroatCap === undefined ? 'Not permitted' : `Short imperfections only, h ≤ 0.3 + 0.1a, max ${v.insufficientThroatCap} mm`} (t > 3 mm). From EN 25817; that ISO 5817:2014 keeps it is from memory.`
		},
		'fillet.asymmetry': {
			rule: {
				type: 'max',
				max: { of: 'nominalThroat', times: v.asymmetry.factor, plus: v.asymmetry.plus }
			},
			clause: 'Table 1, 512 (excessive asymmetry of fillet weld)',
			confidence: '2+',
			note: `h ≤ ${v.asymmetry.plus} + ${v.asymmetry.factor}a, where an asymmetric fillet is not prescribed.`
		},
		'porosity.max': v.pore
			? {
					rule: {
						type: 'max',
						max: {
							when: { kindIn: ['fillet', 'socket'] },
							then: capped('nominalThroat', v.pore.factor, v.pore.cap),
							otherwise: capped('thickness', v.pore.factor, v.pore.cap)
						},
						beyond: 'judge'
					},
					clause: 'Table 1, 2017 (surface pore)',
					confidence: 'mem',
					note: `From memory: a single pore d ≤ ${v.pore.factor}s (butt) or ${v.pore.factor}a (fillet), max ${v.pore.cap} mm. Within that even the sum passes; above it the pores are for the inspector to size.`
				}
			: {
					rule: { type: 'absent' },
					clause: 'Table 1, 2017 (surface pore)',
					confidence: 'mem',
					note: 'From memory: not permitted at this level.'
				}
	};
	if (v.excessThroat) {
		limits['fillet.throat.max'] = {
			rule: {
				type: 'max',
				max: capped('nominalThroat', v.excessThroat.factor, v.excessThroat.cap, 1)
			},
			clause: 'Table 1, 5214 (excessive throat thickness)',
			confidence: v.excessThroat.confidence,
			note: `h ≤ 1 + ${v.excessThroat.factor}a, max ${v.excessThroat.cap} mm; measured from the gauged throat, or the throat of the legs. ${CONFIDENCE_NOTE[v.excessThroat.confidence] ?? ''}`.trim()
		};
	}
	return limits;
}

function byThinWallThroat(cap: number | undefined): Limit['rule'] {
	const thin = { open: 'Insufficient throat on walls of 3 mm and less was not checked.' };
	if (cap === undefined) return { type: 'banded', max: byThinWall(thin, 0) };
	const shortfall = capped('nominalThroat', 0.1, cap, 0.3);
	return {
		type: 'banded',
		max: byThinWall(thin, 0),
		band: { upTo: byThinWall(thin, shortfall), length: { short: true } }
	};
}

const names: Record<Level, string> = { B: 'stringent', C: 'intermediate', D: 'moderate' };

function isoLevel(level: Level): CriteriaSet {
	return {
		id: `iso-5817-${level.toLowerCase()}`,
		name: `ISO 5817 quality level ${level} (${names[level]})`,
		standard: 'ISO 5817',
		edition: '2014',
		version: 1,
		scope: `Surface imperfections of arc-welded steel joints at quality level ${level}; level D sets no excessive-throat limit.`,
		limits: limitsFor(level)
	};
}

export const iso5817B = isoLevel('B');
export const iso5817C = isoLevel('C');
export const iso5817D = isoLevel('D');
