/**
 * ISO 5817:2014 quality levels B, C and D. Sources are those of reference/standards.md §5;
 * tags per row as there. All values in mm.
 */
import { describe, expect, it } from 'vitest';
import { checker, evaluated, finding } from '../testing';
import type { JointInput } from '../types';

const B = 'iso-5817-b';
const C = 'iso-5817-c';
const D = 'iso-5817-d';
const metric = { units: 'metric' } as const;
const butt = (thickness: number): JointInput => ({ kind: 'butt', thickness });
/** A fillet whose nominal throat a is exactly `a` mm (required leg a / 0.7071). */
const filletWithThroat = (a: number, more: Partial<JointInput> = {}): JointInput => ({
	kind: 'fillet',
	thickness: 10,
	requiredSize: a / Math.SQRT1_2,
	weldLength: 200,
	...more
});

describe('undercut 5011/5012', () => {
	const at = (level: string) => checker(level, 'undercut.depth', 'visual', metric);

	// Reference check, t = 10 mm: D 1.0, C 0.5, B 0.5 mm (t > 3: C, B [2+]; D [1]).
	it.each([
		[B, 0.5],
		[C, 0.5],
		[D, 1.0]
	])('on a 10 mm wall, %s allows %f mm', (level, limit) => {
		expect(at(level)(butt(10), { undercutDepth: limit })).toBe('within');
		expect(at(level)(butt(10), { undercutDepth: limit + 0.01 })).toBe('outside');
	});

	// t = 4 mm: B 0.05t = 0.2, C 0.1t = 0.4, D 0.2t = 0.8.
	it.each([
		[B, 0.2],
		[C, 0.4],
		[D, 0.8]
	])('on a 4 mm wall, %s allows %f mm', (level, limit) => {
		expect(at(level)(butt(4), { undercutDepth: limit })).toBe('within');
		expect(at(level)(butt(4), { undercutDepth: limit + 0.01 })).toBe('outside');
	});

	// t 0.5–3: B not permitted, C short h ≤ 0.1t [1]; short imperfection rule unconfirmed.
	it('on a 2 mm wall, allows none at B and short undercut at C', () => {
		expect(at(B)(butt(2), { undercutDepth: 0.05 })).toBe('outside');
		const length = checker(C, 'undercut.length', 'visual', metric);
		expect(at(C)(butt(2), { undercutDepth: 0.2, undercutLength: 20 })).toBe('within');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 25 })).toBe('within');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 40 })).toBe('judge');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 80 })).toBe('outside');
		expect(at(C)(butt(2), { undercutDepth: 0.25, undercutLength: 10 })).toBe('outside');
		// D: 0.2t (unconfirmed).
		expect(at(D)(butt(2), { undercutDepth: 0.4, undercutLength: 10 })).toBe('within');
	});

	it('judges in mm whatever the project unit system', () => {
		const imperial = checker(C, 'undercut.depth', 'visual');
		expect(imperial({ kind: 'butt', thickness: '3/8 in' }, { undercutDepth: '0.5 mm' })).toBe(
			'within'
		);
		expect(imperial({ kind: 'butt', thickness: '3/8 in' }, { undercutDepth: '1/32' })).toBe(
			'outside'
		);
	});
});

describe('excess weld metal 502 — h ≤ 1 + k·b, capped (C, B [2+]; D unconfirmed)', () => {
	const at = (level: string) => checker(level, 'reinforcement.max', 'visual', metric);

	// Reference check, b = 20 mm: D 6, C 4, B 3 mm.
	it.each([
		[B, 3],
		[C, 4],
		[D, 6]
	])('with a 20 mm face, %s allows %f mm', (level, limit) => {
		expect(at(level)(butt(10), { reinforcement: limit, faceWidth: 20 })).toBe('within');
		expect(at(level)(butt(10), { reinforcement: limit + 0.01, faceWidth: 20 })).toBe('outside');
	});

	// b = 60 mm: 1 + k·b passes every cap (B 5, C 7, D 10).
	it.each([
		[B, 5],
		[C, 7],
		[D, 10]
	])('with a 60 mm face, %s is capped at %f mm', (level, cap) => {
		expect(at(level)(butt(25), { reinforcement: cap, faceWidth: 60 })).toBe('within');
		expect(at(level)(butt(25), { reinforcement: cap + 0.01, faceWidth: 60 })).toBe('outside');
	});

	it('asks for the face width when the height is over 1 mm', () => {
		expect(at(B)(butt(10), { reinforcement: 1 })).toBe('within');
		const result = evaluated(B, butt(10), 'visual', { reinforcement: 2 }, metric);
		expect(result.findings.find((f) => f.check === 'reinforcement.max')?.outcome).toBe('judge');
		expect(result.missing).toContain('faceWidth');
	});
});

describe('excessive convexity 503 — h ≤ 1 + k·b, capped [2+]', () => {
	const at = (level: string) => checker(level, 'fillet.convexity', 'visual', metric);

	it.each([
		[B, 10, 2],
		[C, 10, 2.5],
		[D, 10, 3.5],
		[B, 30, 3],
		[C, 30, 4],
		[D, 30, 5]
	])('%s with a %f mm face allows %f mm', (level, face, limit) => {
		expect(at(level)(filletWithThroat(5), { convexity: limit, faceWidth: face })).toBe('within');
		expect(at(level)(filletWithThroat(5), { convexity: limit + 0.01, faceWidth: face })).toBe(
			'outside'
		);
	});
});

describe('fillet throat 5213 / 5214', () => {
	// 5214 excessive throat: B h ≤ 1 + 0.15a max 3 [2+]; C 1 + 0.2a max 4 [1]; D unlimited.
	it('limits excess throat at B and C, not at D', () => {
		const excess = (level: string) => checker(level, 'fillet.throat.max', 'visual', metric);
		expect(excess(B)(filletWithThroat(5), { throat: 6.75 })).toBe('within');
		expect(excess(B)(filletWithThroat(5), { throat: 6.76 })).toBe('outside');
		expect(excess(C)(filletWithThroat(5), { throat: 7 })).toBe('within');
		expect(excess(C)(filletWithThroat(5), { throat: 7.01 })).toBe('outside');
		expect(excess(B)(filletWithThroat(20), { throat: 23 })).toBe('within');
		expect(excess(B)(filletWithThroat(20), { throat: 23.01 })).toBe('outside');
		const atD = evaluated(D, filletWithThroat(5), 'visual', { throat: 9 }, metric);
		expect(atD.findings.some((f) => f.check === 'fillet.throat.max')).toBe(false);
	});

	// 5213 insufficient throat, t > 3 [1: EN 25817; 2014 same unconfirmed]: B none; C, D short h ≤ 0.3 + 0.1a.
	it('allows a short thin throat at C and D only', () => {
		const shortfall = (level: string) => checker(level, 'fillet.throat.min', 'visual', metric);
		const length = (level: string) => checker(level, 'fillet.throat.length', 'visual', metric);
		expect(shortfall(B)(filletWithThroat(5), { throat: 4.9, undersizeLength: 10 })).toBe('outside');
		expect(shortfall(C)(filletWithThroat(5), { throat: 4.2, undersizeLength: 20 })).toBe('within');
		expect(length(C)(filletWithThroat(5), { throat: 4.2, undersizeLength: 20 })).toBe('within');
		expect(length(C)(filletWithThroat(5), { throat: 4.2, undersizeLength: 30 })).toBe('judge');
		expect(length(C)(filletWithThroat(5), { throat: 4.2, undersizeLength: 60 })).toBe('outside');
		expect(shortfall(C)(filletWithThroat(5), { throat: 4.19, undersizeLength: 10 })).toBe(
			'outside'
		);
		// a = 20 mm: 0.3 + 2 is capped at 1 (C) and 2 (D).
		expect(shortfall(C)(filletWithThroat(20), { throat: 19, undersizeLength: 10 })).toBe('within');
		expect(shortfall(C)(filletWithThroat(20), { throat: 18.9, undersizeLength: 10 })).toBe(
			'outside'
		);
		expect(shortfall(D)(filletWithThroat(20), { throat: 18, undersizeLength: 10 })).toBe('within');
		expect(shortfall(D)(filletWithThroat(20), { throat: 17.9, undersizeLength: 10 })).toBe(
			'outside'
		);
	});

	it('uses the throat of the legs when no throat was gauged', () => {
		const found = finding(
			C,
			filletWithThroat(5),
			'visual',
			{ filletLeg1: 7.0710678, filletLeg2: 7.0710678 },
			'fillet.throat.min',
			metric
		);
		expect(found).toMatchObject({ reading: 'filletLeg1', outcome: 'within' });
		expect(found.measured).toBeCloseTo(0, 6);
	});

	// Short imperfection on a weld under 100 mm: 25 % of its length (unconfirmed).
	it('allows a quarter of a short weld', () => {
		const length = checker(C, 'fillet.throat.length', 'visual', metric);
		const short = filletWithThroat(5, { weldLength: 80 });
		expect(length(short, { throat: 4.5, undersizeLength: 20 })).toBe('within');
		expect(length(short, { throat: 4.5, undersizeLength: 21 })).toBe('outside');
	});
});

describe('fillet asymmetry 512 [2+]', () => {
	// a = 5: B 1.5 + 0.75 = 2.25; C 2 + 0.75 = 2.75; D 2 + 1.0 = 3.0.
	it.each([
		[B, 2.25],
		[C, 2.75],
		[D, 3.0]
	])('%s allows %f mm between the legs', (level, limit) => {
		const asymmetry = checker(level, 'fillet.asymmetry', 'visual', metric);
		expect(asymmetry(filletWithThroat(5), { filletLeg1: 7, filletLeg2: 7 + limit })).toBe('within');
		expect(asymmetry(filletWithThroat(5), { filletLeg1: 7, filletLeg2: 7 + limit + 0.01 })).toBe(
			'outside'
		);
	});
});

describe('linear misalignment 507 / 5072 (unconfirmed)', () => {
	const at = (level: string) => checker(level, 'misalignment.max', 'fitup', metric);

	// t = 10: plates B 1.0, C 1.5, D 2.5; circumferential 0.5t capped B 2, C 3, D 4.
	it.each([
		[B, 1.0, 2.0],
		[C, 1.5, 3.0],
		[D, 2.5, 4.0]
	])(
		'%s on 10 mm: within to %f (plate), judged to %f (pipe), outside above',
		(level, plate, pipe) => {
			expect(at(level)(butt(10), { misalignment: plate })).toBe('within');
			expect(at(level)(butt(10), { misalignment: plate + 0.01 })).toBe('judge');
			expect(at(level)(butt(10), { misalignment: pipe })).toBe('judge');
			expect(at(level)(butt(10), { misalignment: pipe + 0.01 })).toBe('outside');
		}
	);

	it('uses the thin-plate row up to 3 mm and is checked at visual too', () => {
		expect(at(B)(butt(2), { misalignment: 0.4 })).toBe('within');
		expect(
			finding(B, butt(10), 'visual', { misalignment: 1 }, 'misalignment.max', metric).outcome
		).toBe('within');
	});
});

describe('cracks, fusion, overlap, craters, pores', () => {
	// Not permitted at any level [1].
	it('rejects cracks and lack of fusion at every level', () => {
		for (const level of [B, C, D]) {
			expect(finding(level, butt(10), 'visual', { crack: true }, 'crack', metric).outcome).toBe(
				'outside'
			);
			expect(
				finding(level, butt(10), 'visual', { incompleteFusion: true }, 'fusion', metric).outcome
			).toBe('outside');
		}
	});

	// Unconfirmed: overlap 506 only at D (h ≤ 0.2b); end crater 2025 at C and D by height.
	it('leaves overlap at D and craters at C and D to the inspector (unconfirmed)', () => {
		expect(finding(B, butt(10), 'visual', { overlap: true }, 'overlap', metric).outcome).toBe(
			'outside'
		);
		expect(finding(C, butt(10), 'visual', { overlap: true }, 'overlap', metric).outcome).toBe(
			'outside'
		);
		expect(finding(D, butt(10), 'visual', { overlap: true }, 'overlap', metric).outcome).toBe(
			'judge'
		);
		expect(finding(B, butt(10), 'visual', { craterUnfilled: true }, 'crater', metric).outcome).toBe(
			'outside'
		);
		expect(finding(C, butt(10), 'visual', { craterUnfilled: true }, 'crater', metric).outcome).toBe(
			'judge'
		);
	});

	// 2017 surface pore [C: 2+ (2014 copy, level C table); D: 1 (2014 copy)]: the largest single
	// pore. t > 3: B none; C d ≤ 0.2s (0.2a), max 2 mm; D 0.3s (0.3a), max 3 mm. t 0.5–3: only D,
	// d ≤ 0.3s (0.3a).
	it('judges the largest pore by the wall or the throat', () => {
		const pore = (level: string, joint: JointInput, poreLargest: number) =>
			finding(level, joint, 'visual', { poreLargest }, 'pore.largest', metric).outcome;
		expect(pore(B, butt(10), 0.1)).toBe('outside');
		expect(pore(C, butt(10), 2)).toBe('within');
		expect(pore(C, butt(10), 2.1)).toBe('outside');
		expect(pore(C, butt(6), 1.2)).toBe('within');
		expect(pore(C, butt(6), 1.3)).toBe('outside');
		expect(pore(D, butt(10), 3)).toBe('within');
		expect(pore(D, butt(10), 3.1)).toBe('outside');
		expect(pore(C, filletWithThroat(5), 1)).toBe('within');
		expect(pore(C, filletWithThroat(5), 1.1)).toBe('outside');
		// Thin walls: C not permitted, D 0.3s without a cap.
		expect(pore(C, butt(2), 0.1)).toBe('outside');
		expect(pore(D, butt(2), 0.6)).toBe('within');
		expect(pore(D, butt(2), 0.7)).toBe('outside');
	});
});

describe('thin-wall rows and root imperfections — Table 1', () => {
	// 2025 end crater pipe [1: 2014 copy; level C table]: C t > 3 h ≤ 0.1t max 1, t ≤ 3 none;
	// D h ≤ 0.2t (max 2 mm over 3 mm); B none.
	it('grades a crater by its depth', () => {
		const crater = (level: string, t: number, craterDepth: number) =>
			finding(level, butt(t), 'visual', { craterDepth }, 'crater.depth', metric).outcome;
		expect(crater(C, 8, 0.8)).toBe('within');
		expect(crater(C, 8, 0.9)).toBe('outside');
		expect(crater(C, 20, 1)).toBe('within');
		expect(crater(C, 20, 1.1)).toBe('outside');
		expect(crater(C, 2, 0.1)).toBe('outside');
		expect(crater(D, 2, 0.4)).toBe('within');
		expect(crater(D, 2, 0.5)).toBe('outside');
		expect(crater(D, 20, 2)).toBe('within');
		expect(crater(D, 20, 2.1)).toBe('outside');
		expect(crater(B, 20, 0.1)).toBe('outside');
	});

	// 504 excess penetration [C: 2+ (2007 copy, level C table); B, D: 1]: t ≤ 3 h ≤ 1 + k·b;
	// t > 3 h ≤ 1 + k·b capped. b = 4 mm: C thin 2.2, thick 3.4; D thick min(5, 5) = 5; B thick 1.8.
	it('limits excess penetration by the root bead width, thin and thick rows', () => {
		const protrusion = (level: string, t: number, rootProtrusion: number) =>
			finding(
				level,
				butt(t),
				'visual',
				{ rootProtrusion, rootWidth: 4 },
				'rootProtrusion.max',
				metric
			).outcome;
		expect(protrusion(C, 2, 2.2)).toBe('within');
		expect(protrusion(C, 2, 2.3)).toBe('outside');
		expect(protrusion(C, 10, 3.4)).toBe('within');
		expect(protrusion(C, 10, 3.5)).toBe('outside');
		expect(protrusion(D, 10, 5)).toBe('within');
		expect(protrusion(D, 10, 5.1)).toBe('outside');
		expect(protrusion(B, 10, 1.8)).toBe('within');
		expect(protrusion(B, 10, 1.9)).toBe('outside');
		// A 10 mm root bead: C caps at 4 mm.
		expect(
			finding(
				C,
				butt(10),
				'visual',
				{ rootProtrusion: 4, rootWidth: 10 },
				'rootProtrusion.max',
				metric
			).outcome
		).toBe('within');
	});

	it('asks for the root bead width when the protrusion is over 1 mm', () => {
		const result = evaluated(C, butt(10), 'visual', { rootProtrusion: 2 }, metric);
		expect(result.findings.find((f) => f.check === 'rootProtrusion.max')?.outcome).toBe('judge');
		expect(result.missing).toContain('rootWidth');
	});

	// 515 root concavity [C: 1 (level C table); B, D unconfirmed]: C t ≤ 3 h ≤ 0.1t at any length;
	// t > 3 short imperfections h ≤ 0.1t, max 1 mm.
	it('allows root concavity at C by the thin row, and as a short imperfection above 3 mm', () => {
		const depth = (t: number, readings: Record<string, number>) =>
			finding(C, butt(t), 'visual', readings, 'rootConcavity.depth', metric).outcome;
		expect(depth(2, { rootConcavity: 0.2 })).toBe('within');
		expect(depth(2, { rootConcavity: 0.3 })).toBe('outside');
		expect(depth(8, { rootConcavity: 0.8 })).toBe('judge');
		expect(depth(8, { rootConcavity: 0.8, rootConcavityLength: 20 })).toBe('within');
		expect(depth(8, { rootConcavity: 0.9, rootConcavityLength: 20 })).toBe('outside');
		const length = checker(C, 'rootConcavity.length', 'visual', metric);
		expect(length(butt(8), { rootConcavity: 0.5, rootConcavityLength: 25 })).toBe('within');
		expect(length(butt(8), { rootConcavity: 0.5, rootConcavityLength: 80 })).toBe('outside');
	});

	// 4021 incomplete root penetration [C, B: 2+; D: 1]: C and B none; D short h ≤ 0.2t, max 2 mm.
	it('allows incomplete root penetration at D only, as a short imperfection', () => {
		const length = (level: string, incompletePenetrationLength: number) =>
			finding(
				level,
				butt(10),
				'visual',
				{ incompletePenetrationLength },
				'penetration.length',
				metric
			).outcome;
		expect(length(C, 0)).toBe('within');
		expect(length(C, 1)).toBe('outside');
		expect(length(B, 1)).toBe('outside');
		expect(length(D, 25)).toBe('within');
		expect(length(D, 80)).toBe('outside');
		const depth = checker(D, 'penetration.depth', 'visual', metric);
		expect(
			depth(butt(10), { incompletePenetrationLength: 10, incompletePenetrationDepth: 2 })
		).toBe('within');
		expect(
			depth(butt(10), { incompletePenetrationLength: 10, incompletePenetrationDepth: 2.1 })
		).toBe('outside');
	});

	// 511 incompletely filled groove [C: 1 (level C table)]: short imperfections only,
	// C h ≤ 0.1t, max 1 mm: within that the length is for the inspector, above it outside.
	it('leaves a shallow incompletely filled groove to the inspector', () => {
		const concavity = checker(C, 'concavity.max', 'visual', metric);
		expect(concavity(butt(8), { concavity: 0 })).toBe('within');
		expect(concavity(butt(8), { concavity: 0.8 })).toBe('judge');
		expect(concavity(butt(8), { concavity: 0.9 })).toBe('outside');
		expect(concavity(butt(20), { concavity: 1.1 })).toBe('outside');
	});

	// 506 overlap at D (unconfirmed): h ≤ 0.2b.
	it('sizes overlap at level D by the face width', () => {
		const overlap = checker(D, 'overlap.size', 'visual', metric);
		expect(overlap(butt(10), { overlap: true, overlapSize: 2, faceWidth: 10 })).toBe('within');
		expect(overlap(butt(10), { overlap: true, overlapSize: 2.1, faceWidth: 10 })).toBe('outside');
		expect(evaluated(D, butt(10), 'visual', { overlap: true }, metric).missing).toContain(
			'overlapSize'
		);
	});
});

describe('the hi-lo limit shown depends on the joint, never on the reading', () => {
	// Level C, t = 7.3 mm: plates 0.15t = 1.095 mm; circumferential 0.5t capped at 3 mm (unconfirmed).
	it('shows both limits for a joint that does not say plate or pipe, whatever is typed', () => {
		const joint = butt(7.3);
		const hiLo = (misalignment: number, more: Partial<JointInput> = {}) =>
			finding(C, { ...joint, ...more }, 'fitup', { misalignment }, 'misalignment.max', metric);
		const outcomes = [0.8, 2.5, 3.2].map((value) => {
			const found = hiLo(value);
			expect(found.limit).toBeNull();
			expect(found.bounds?.min).toBeCloseTo(1.095, 9);
			expect(found.bounds?.max).toBe(3);
			return found.outcome;
		});
		expect(outcomes).toEqual(['within', 'judge', 'outside']);
	});

	it('gives one limit once the joint says plate or circumferential', () => {
		const plate = finding(
			C,
			{ ...butt(7.3), seam: 'longitudinal' },
			'fitup',
			{ misalignment: 2.5 },
			'misalignment.max',
			metric
		);
		expect(plate).toMatchObject({ outcome: 'outside' });
		expect(plate.limit).toBeCloseTo(1.095, 9);
		const pipe = finding(
			C,
			{ ...butt(7.3), seam: 'circumferential' },
			'fitup',
			{ misalignment: 2.5 },
			'misalignment.max',
			metric
		);
		expect(pipe).toMatchObject({ outcome: 'within', limit: 3 });
		// A butt joint with an outside diameter is a girth weld round the pipe.
		const girth = finding(
			C,
			{ ...butt(7.3), diameter: 168.3 },
			'fitup',
			{ misalignment: 3.2 },
			'misalignment.max',
			metric
		);
		expect(girth).toMatchObject({ outcome: 'outside', limit: 3 });
	});
});
