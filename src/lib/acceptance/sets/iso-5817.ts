/**
 * ISO 5817:2014 Welding — fusion-welded joints in steel — quality levels for imperfections.
 * Level B is stringent, C intermediate, D moderate. Imperfections are named by their ISO 6520-1
 * reference number. Symbols: t thickness, b width of the weld face (of the root bead for 504),
 * a nominal throat (0.7071 × the required fillet size, which Tacksheet records as the leg),
 * s nominal butt weld thickness (taken as t), h height of the imperfection; all mm. Most rows
 * have one line for t from 0.5 to 3 mm and one for t over 3 mm. EN 25817 (1992) used other
 * undercut and throat rows; the 2023 edition was not checked.
 */
import type { CheckId, Confidence, CriteriaSet, Expr, Limit } from '../types';

type Level = 'B' | 'C' | 'D';

/** A value of the thin (0.5–3 mm) and thick (over 3 mm) rows; `null`: not permitted. */
interface Rows {
	thin: Expr | null;
	thick: Expr | null;
}

interface LevelValues {
	undercut: { factor: number; cap: number; thin: 'none' | 'short'; confidence: Confidence };
	excessWeldMetal: { factor: number; cap: number; confidence: Confidence };
	convexity: { factor: number; cap: number };
	excessPenetration: { thin: number; thick: number; cap: number; confidence: Confidence };
	excessThroat?: { factor: number; cap: number; confidence: Confidence };
	insufficientThroatCap?: number;
	misalignment: { plate: number; plateCap: number; circumferentialCap: number };
	asymmetry: { plus: number; factor: number };
	/** 2017 surface pore: d ≤ k·s (butt) or k·a (fillet), thin row without a cap */
	pore: { thin?: number; thick?: { factor: number; cap: number }; confidence: Confidence };
	/** 2025 end crater pipe: h ≤ k·t, thin row without a cap */
	crater: { thin?: number; thick?: { factor: number; cap: number }; confidence: Confidence };
	/** 4021 incomplete root penetration: short imperfections up to h ≤ k·t, capped */
	rootPenetration?: { factor: number; cap: number };
	rootPenetrationConfidence: Confidence;
	/** 511 incompletely filled groove: short imperfections only */
	filledGroove: { thin?: number; thick: { factor: number; cap: number }; confidence: Confidence };
	/** 515 root concavity: thin row at any length, thick row short imperfections */
	rootConcavity: {
		thin?: Expr;
		thick: { factor: number; cap: number };
		confidence: Confidence;
	};
	/** 506 overlap: h ≤ k·b at level D only */
	overlap?: number;
}

const levels: Record<Level, LevelValues> = {
	B: {
		undercut: { factor: 0.05, cap: 0.5, thin: 'none', confidence: '2+' },
		excessWeldMetal: { factor: 0.1, cap: 5, confidence: '2+' },
		convexity: { factor: 0.1, cap: 3 },
		excessPenetration: { thin: 0.1, thick: 0.2, cap: 3, confidence: '1' },
		excessThroat: { factor: 0.15, cap: 3, confidence: '2+' },
		misalignment: { plate: 0.1, plateCap: 3, circumferentialCap: 2 },
		asymmetry: { plus: 1.5, factor: 0.15 },
		pore: { confidence: '2+' },
		crater: { confidence: '1' },
		rootPenetrationConfidence: '2+',
		filledGroove: { thick: { factor: 0.05, cap: 0.5 }, confidence: 'mem' },
		rootConcavity: { thick: { factor: 0.05, cap: 0.5 }, confidence: 'mem' }
	},
	C: {
		undercut: { factor: 0.1, cap: 0.5, thin: 'short', confidence: '2+' },
		excessWeldMetal: { factor: 0.15, cap: 7, confidence: '2+' },
		convexity: { factor: 0.15, cap: 4 },
		excessPenetration: { thin: 0.3, thick: 0.6, cap: 4, confidence: '2+' },
		excessThroat: { factor: 0.2, cap: 4, confidence: '1' },
		insufficientThroatCap: 1,
		misalignment: { plate: 0.15, plateCap: 4, circumferentialCap: 3 },
		asymmetry: { plus: 2, factor: 0.15 },
		pore: { thick: { factor: 0.2, cap: 2 }, confidence: '2+' },
		crater: { thick: { factor: 0.1, cap: 1 }, confidence: '1' },
		rootPenetrationConfidence: '2+',
		filledGroove: { thin: 0.1, thick: { factor: 0.1, cap: 1 }, confidence: '1' },
		rootConcavity: {
			thin: { of: 'thickness', times: 0.1 },
			thick: { factor: 0.1, cap: 1 },
			confidence: '1'
		}
	},
	D: {
		undercut: { factor: 0.2, cap: 1, thin: 'short', confidence: '1' },
		excessWeldMetal: { factor: 0.25, cap: 10, confidence: '1' },
		convexity: { factor: 0.25, cap: 5 },
		excessPenetration: { thin: 0.6, thick: 1.0, cap: 5, confidence: '1' },
		insufficientThroatCap: 2,
		misalignment: { plate: 0.25, plateCap: 5, circumferentialCap: 4 },
		asymmetry: { plus: 2, factor: 0.2 },
		pore: { thin: 0.3, thick: { factor: 0.3, cap: 3 }, confidence: '1' },
		crater: { thin: 0.2, thick: { factor: 0.2, cap: 2 }, confidence: '1' },
		rootPenetration: { factor: 0.2, cap: 2 },
		rootPenetrationConfidence: '1',
		filledGroove: { thin: 0.25, thick: { factor: 0.25, cap: 2 }, confidence: 'mem' },
		rootConcavity: {
			thin: { of: 'thickness', times: 0.1, plus: 0.2 },
			thick: { factor: 0.2, cap: 2 },
			confidence: 'mem'
		},
		overlap: 0.2
	}
};

/** t 0.5–3 mm and t > 3 mm rows. */
const byThinWall = (thin: Expr, thick: Expr): Expr => ({
	by: 'thickness',
	steps: [{ upTo: 3, value: thin }],
	otherwise: thick
});

const rows = ({ thin, thick }: Rows): Expr => byThinWall(thin ?? 0, thick ?? 0);

const capped = (
	of: 'thickness' | 'faceWidth' | 'nominalThroat' | 'rootWidth',
	factor: number,
	cap: number,
	plus = 0
): Expr => ({
	lesserOf: [{ of, times: factor, plus }, cap]
});

/** Butt welds are judged by s (taken as t), fillet welds by their nominal throat a. */
const byWeld = (butt: Expr, fillet: Expr): Expr => ({
	when: { kindIn: ['fillet', 'socket'] },
	then: fillet,
	otherwise: butt
});

const UNCONFIRMED = 'Unconfirmed — check the clause.';
const SHORT =
	'A short imperfection: in a weld of 100 mm or more, at most 25 mm in the 100 mm that holds most; in a shorter weld, at most 25 % of its length (clause 3, unconfirmed).';

const words = (value: number | undefined, symbol: string, cap?: number) =>
	value === undefined
		? 'not permitted'
		: `h ≤ ${value}${symbol}${cap === undefined ? '' : `, max ${cap} mm`}`;

function limitsFor(level: Level): CriteriaSet['limits'] {
	const v = levels[level];
	const undercutDepth = capped('thickness', v.undercut.factor, v.undercut.cap);
	const plate = byThinWall(
		{ of: 'thickness', times: v.misalignment.plate, plus: 0.2 },
		capped('thickness', v.misalignment.plate, v.misalignment.plateCap)
	);
	const circumferential = capped('thickness', 0.5, v.misalignment.circumferentialCap);
	const poreRows = (of: 'thickness' | 'nominalThroat'): Expr =>
		rows({
			thin: v.pore.thin === undefined ? null : { of, times: v.pore.thin },
			thick: v.pore.thick ? capped(of, v.pore.thick.factor, v.pore.thick.cap) : null
		});
	const groove = v.filledGroove;
	const root = v.rootConcavity;
	const limits: Partial<Record<CheckId, Limit>> = {
		'misalignment.max': {
			rule: {
				type: 'max',
				max: { when: { seam: 'circumferential' }, then: circumferential, otherwise: plate }
			},
			clause: 'Table 1, 507 (linear misalignment: 5071 plates, 5072 circumferential welds)',
			confidence: 'mem',
			note: `Plates and longitudinal welds: t ≤ 3: h ≤ 0.2 mm + ${v.misalignment.plate}t; t > 3: h ≤ ${v.misalignment.plate}t, max ${v.misalignment.plateCap} mm. Circumferential welds: h ≤ 0.5t, max ${v.misalignment.circumferentialCap} mm. ${UNCONFIRMED}`,
			stages: ['fitup', 'visual']
		},
		crack: {
			rule: { type: 'absent' },
			clause: 'Table 1, 100 (crack)',
			confidence: '2+',
			note: 'Not permitted at any level.'
		},
		fusion: {
			rule: { type: 'absent' },
			clause: 'Table 1, 401 (lack of fusion)',
			confidence: '2+',
			note: 'Not permitted at any level.'
		},
		overlap:
			v.overlap === undefined
				? {
						rule: { type: 'absent' },
						clause: 'Table 1, 506 (overlap)',
						confidence: level === 'C' ? '1' : 'mem',
						note: 'Not permitted at this level.'
					}
				: {
						rule: { type: 'absent', beyond: 'judge' },
						clause: 'Table 1, 506 (overlap)',
						confidence: 'mem',
						note: `Level D allows overlap up to h ≤ ${v.overlap}b: gauge how far it lies over the parent metal.`
					},
		crater: {
			rule: v.crater.thick ? { type: 'absent', beyond: 'judge' } : { type: 'absent' },
			clause: 'Table 1, 2025 (end crater pipe)',
			confidence: v.crater.confidence,
			note: v.crater.thick
				? 'Allowed up to a depth by the wall thickness: gauge it.'
				: 'Not permitted at this level.'
		},
		'crater.depth': {
			rule: {
				type: 'max',
				max: rows({
					thin: v.crater.thin === undefined ? null : { of: 'thickness', times: v.crater.thin },
					thick: v.crater.thick
						? capped('thickness', v.crater.thick.factor, v.crater.thick.cap)
						: null
				})
			},
			clause: 'Table 1, 2025 (end crater pipe)',
			confidence: v.crater.confidence,
			note: `t ≤ 3: ${words(v.crater.thin, 't')}; t > 3: ${words(v.crater.thick?.factor, 't', v.crater.thick?.cap)}. A crater at a weld end is short by nature.`
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
			note: `t > 3 mm: h ≤ ${v.undercut.factor}t, max ${v.undercut.cap} mm, with a smooth transition. t ≤ 3 mm: ${v.undercut.thin === 'none' ? 'not permitted' : `short imperfections only, h ≤ ${v.undercut.factor}t`}. ${SHORT}`
		},
		'concavity.max': {
			rule: {
				type: 'max',
				max: 0,
				judgeUpTo: rows({
					thin: groove.thin === undefined ? null : { of: 'thickness', times: groove.thin },
					thick: capped('thickness', groove.thick.factor, groove.thick.cap)
				})
			},
			clause: 'Table 1, 511 (incompletely filled groove)',
			confidence: groove.confidence,
			note: `Short imperfections only: t ≤ 3: ${words(groove.thin, 't')}; t > 3: h ≤ ${groove.thick.factor}t, max ${groove.thick.cap} mm. Within that the inspector checks the length. ${SHORT}`,
			kinds: ['butt']
		},
		'reinforcement.max': {
			rule: {
				type: 'max',
				max: capped('faceWidth', v.excessWeldMetal.factor, v.excessWeldMetal.cap, 1)
			},
			clause: 'Table 1, 502 (excess weld metal)',
			confidence: v.excessWeldMetal.confidence,
			note: `h ≤ 1 mm + ${v.excessWeldMetal.factor}b, max ${v.excessWeldMetal.cap} mm, with a smooth transition.`
		},
		'rootProtrusion.max': {
			rule: {
				type: 'max',
				max: byThinWall(
					{ of: 'rootWidth', times: v.excessPenetration.thin, plus: 1 },
					capped('rootWidth', v.excessPenetration.thick, v.excessPenetration.cap, 1)
				)
			},
			clause: 'Table 1, 504 (excess penetration)',
			confidence: v.excessPenetration.confidence,
			note: `t ≤ 3: h ≤ 1 mm + ${v.excessPenetration.thin}b; t > 3: h ≤ 1 mm + ${v.excessPenetration.thick}b, max ${v.excessPenetration.cap} mm; b is the width of the root bead.`
		},
		'rootConcavity.depth': {
			rule: {
				type: 'banded',
				max: byThinWall(root.thin ?? 0, 0),
				band: {
					upTo: byThinWall(root.thin ?? 0, capped('thickness', root.thick.factor, root.thick.cap)),
					length: { short: true }
				}
			},
			clause: 'Table 1, 515 (root concavity)',
			confidence: root.confidence,
			note: `t ≤ 3: ${root.thin === undefined ? 'not permitted' : level === 'D' ? 'h ≤ 0.2 mm + 0.1t' : 'h ≤ 0.1t'}; t > 3: short imperfections only, h ≤ ${root.thick.factor}t, max ${root.thick.cap} mm. ${SHORT}`,
			kinds: ['butt']
		},
		'penetration.depth': {
			rule: {
				type: 'max',
				max: v.rootPenetration
					? capped('thickness', v.rootPenetration.factor, v.rootPenetration.cap)
					: 0
			},
			clause: 'Table 1, 4021 (incomplete root penetration)',
			confidence: v.rootPenetrationConfidence,
			note: v.rootPenetration
				? `Single-side butt welds: short imperfections only, h ≤ ${v.rootPenetration.factor}t, max ${v.rootPenetration.cap} mm.`
				: 'Not permitted at this level.',
			kinds: ['butt']
		},
		'penetration.length': {
			rule: v.rootPenetration
				? { type: 'length', allowance: { short: true } }
				: { type: 'length', allowance: { max: 0 } },
			clause: 'Table 1, 4021 (incomplete root penetration)',
			confidence: v.rootPenetrationConfidence,
			note: v.rootPenetration ? SHORT : 'Not permitted at this level.',
			kinds: ['butt']
		},
		'fillet.convexity': {
			rule: { type: 'max', max: capped('faceWidth', v.convexity.factor, v.convexity.cap, 1) },
			clause: 'Table 1, 503 (excessive convexity)',
			confidence: '2+',
			note: `h ≤ 1 mm + ${v.convexity.factor}b, max ${v.convexity.cap} mm.`
		},
		'fillet.throat.min': {
			rule: byThinWallThroat(v.insufficientThroatCap),
			clause: 'Table 1, 5213 (insufficient throat thickness)',
			confidence: '1',
			note: `${v.insufficientThroatCap === undefined ? 'Not permitted' : `Short imperfections only, h ≤ 0.3 mm + 0.1a, max ${v.insufficientThroatCap} mm`} (t > 3 mm). From EN 25817; the 2014 row is unconfirmed.`
		},
		'fillet.asymmetry': {
			rule: {
				type: 'max',
				max: { of: 'nominalThroat', times: v.asymmetry.factor, plus: v.asymmetry.plus }
			},
			clause: 'Table 1, 512 (excessive asymmetry of fillet weld)',
			confidence: '2+',
			note: `h ≤ ${v.asymmetry.plus} mm + ${v.asymmetry.factor}a, where an asymmetric fillet is not prescribed.`
		},
		'pore.largest': {
			rule: { type: 'max', max: byWeld(poreRows('thickness'), poreRows('nominalThroat')) },
			clause: 'Table 1, 2017 (surface pore)',
			confidence: v.pore.confidence,
			note: `Largest single pore: t ≤ 3: ${v.pore.thin === undefined ? 'not permitted' : `d ≤ ${v.pore.thin}s (butt) or ${v.pore.thin}a (fillet)`}; t > 3: ${v.pore.thick ? `d ≤ ${v.pore.thick.factor}s or ${v.pore.thick.factor}a, max ${v.pore.thick.cap} mm` : 'not permitted'}.`
		}
	};
	if (v.overlap !== undefined) {
		limits['overlap.size'] = {
			rule: { type: 'max', max: { of: 'faceWidth', times: v.overlap } },
			clause: 'Table 1, 506 (overlap)',
			confidence: 'mem',
			note: `h ≤ ${v.overlap}b, b the width of the weld face. ${UNCONFIRMED}`
		};
	}
	if (v.excessThroat) {
		limits['fillet.throat.max'] = {
			rule: {
				type: 'max',
				max: capped('nominalThroat', v.excessThroat.factor, v.excessThroat.cap, 1)
			},
			clause: 'Table 1, 5214 (excessive throat thickness)',
			confidence: v.excessThroat.confidence,
			note: `h ≤ 1 mm + ${v.excessThroat.factor}a, max ${v.excessThroat.cap} mm; measured from the gauged throat, or the throat of the legs.`
		};
	}
	return limits;
}

function byThinWallThroat(cap: number | undefined): Limit['rule'] {
	const thin = { open: 'Insufficient throat on walls of 3 mm and less is not built in.' };
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
		scope: `Surface and root imperfections of arc-welded steel joints at quality level ${level}, judged visually; level D sets no excessive-throat limit.`,
		limits: limitsFor(level)
	};
}

export const iso5817B = isoLevel('B');
export const iso5817C = isoLevel('C');
export const iso5817D = isoLevel('D');
