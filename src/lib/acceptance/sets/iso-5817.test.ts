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

	// t 0.5–3: B not permitted, C short h ≤ 0.1t [1]; short imperfection rule from memory.
	it('on a 2 mm wall, allows none at B and short undercut at C', () => {
		expect(at(B)(butt(2), { undercutDepth: 0.05 })).toBe('outside');
		const length = checker(C, 'undercut.length', 'visual', metric);
		expect(at(C)(butt(2), { undercutDepth: 0.2, undercutLength: 20 })).toBe('within');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 25 })).toBe('within');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 40 })).toBe('judge');
		expect(length(butt(2), { undercutDepth: 0.2, undercutLength: 80 })).toBe('outside');
		expect(at(C)(butt(2), { undercutDepth: 0.25, undercutLength: 10 })).toBe('outside');
		// D: 0.2t (from memory).
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

describe('excess weld metal 502 — h ≤ 1 + k·b, capped (C, B [2+]; D from memory)', () => {
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

	// 5213 insufficient throat, t > 3 [1: EN 25817; 2014 same from memory]: B none; C, D short h ≤ 0.3 + 0.1a.
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

	// Short imperfection on a weld under 100 mm: 25 % of its length (from memory).
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

describe('linear misalignment 507 / 5072 (from memory)', () => {
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

	// From memory: overlap 506 only at D (h ≤ 0.2b); end crater 2025 at C and D by height.
	it('leaves overlap at D and craters at C and D to the inspector (from memory)', () => {
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

	// From memory: surface pore 2017, B none; C d ≤ 0.2s max 2; D 0.3s max 3.
	it('passes pores whose sum is under the single-pore limit (from memory)', () => {
		expect(finding(B, butt(10), 'visual', { porosity: 0.5 }, 'porosity.max', metric).outcome).toBe(
			'outside'
		);
		expect(finding(C, butt(10), 'visual', { porosity: 2 }, 'porosity.max', metric).outcome).toBe(
			'within'
		);
		expect(finding(C, butt(10), 'visual', { porosity: 2.5 }, 'porosity.max', metric).outcome).toBe(
			'judge'
		);
		expect(finding(D, butt(10), 'visual', { porosity: 3 }, 'porosity.max', metric).outcome).toBe(
			'within'
		);
		expect(
			finding(C, filletWithThroat(5), 'visual', { porosity: 1 }, 'porosity.max', metric).outcome
		).toBe('within');
		expect(
			finding(C, filletWithThroat(5), 'visual', { porosity: 1.1 }, 'porosity.max', metric).outcome
		).toBe('judge');
	});
});
