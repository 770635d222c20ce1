/**
 * API 1104, 21st edition. Sources are those of reference/standards.md §3.
 */
import { describe, expect, it } from 'vitest';
import { checker, evaluated, finding } from '../testing';
import type { JointInput } from '../types';

const API = 'api-1104';
const girth = (thickness: string | number, weldLength: string | number = '60 in'): JointInput => ({
	kind: 'butt',
	thickness,
	weldLength
});

describe('undercut — 9.7 (visual or mechanical measurement)', () => {
	const depth = checker(API, 'undercut.depth', 'visual');
	const length = checker(API, 'undercut.length', 'visual');

	// [1: forum, welder-test clause] over 1/32 in or 12.5 % of the wall, whichever is smaller → reject.
	// On a 1/4 in wall 12.5 % is exactly 1/32 in.
	it('rejects over 1/32 in or 12.5 % of the wall', () => {
		expect(depth(girth('1/4 in'), { undercutDepth: '1/32', undercutLength: '1' })).toBe('within');
		expect(depth(girth('1/4 in'), { undercutDepth: '0.032 in', undercutLength: '1' })).toBe(
			'outside'
		);
		expect(depth(girth('0.200 in'), { undercutDepth: '0.025 in', undercutLength: '1' })).toBe(
			'within'
		);
		expect(depth(girth('0.200 in'), { undercutDepth: '0.026 in', undercutLength: '1' })).toBe(
			'outside'
		);
	});

	// 6 % of the wall is unconfirmed; 1/64 in at any length [1: PHMSA interpretation].
	it('accepts 1/64 in or 6 % of the wall at any length (6 % unconfirmed)', () => {
		expect(depth(girth('1/2 in'), { undercutDepth: '1/64' })).toBe('within');
		expect(
			evaluated(API, girth('1/2 in'), 'visual', { undercutDepth: '1/64' }).missing
		).not.toContain('undercutLength');
		// 6 % of 1/4 in is 0.015 in, under 1/64 in (0.0156 in).
		expect(depth(girth('1/4 in'), { undercutDepth: '0.015 in' })).toBe('within');
		expect(evaluated(API, girth('1/4 in'), 'visual', { undercutDepth: '1/64' }).missing).toContain(
			'undercutLength'
		);
	});

	// [1: PHMSA] between the bands: at most 2 in in any 12 in, or 1/6 of the weld, whichever is smaller.
	it('allows the band for 2 in in any 12 in', () => {
		expect(length(girth('1/2 in'), { undercutDepth: '1/32', undercutLength: '2 in' })).toBe(
			'within'
		);
		expect(length(girth('1/2 in'), { undercutDepth: '1/32', undercutLength: '2.1 in' })).toBe(
			'outside'
		);
	});

	it('or 1/6 of a shorter weld', () => {
		expect(
			length(girth('1/2 in', '9 in'), { undercutDepth: '1/32', undercutLength: '1.5 in' })
		).toBe('within');
		expect(
			length(girth('1/2 in', '9 in'), { undercutDepth: '1/32', undercutLength: '1.6 in' })
		).toBe('outside');
	});

	// 9.3.11 check value [2+]: NPS 6 (circumference ≈ 528 mm), 60 mm of undercut in 300 mm → reject.
	it('rejects 60 mm of undercut within 300 mm of an NPS 6 girth weld', () => {
		const metric = checker(API, 'undercut.length', 'visual', { units: 'metric' });
		const nps6 = girth('7.11 mm', '528 mm');
		expect(metric(nps6, { undercutDepth: '0.6 mm', undercutLength: '60 mm' })).toBe('outside');
		expect(metric(nps6, { undercutDepth: '0.6 mm', undercutLength: '50 mm' })).toBe('within');
		expect(
			finding(
				API,
				nps6,
				'visual',
				{ undercutDepth: '0.6 mm', undercutLength: 50 },
				'undercut.length',
				{ units: 'metric' }
			).limit
		).toBe(50);
	});

	it('judges the band length when the weld length is not given', () => {
		const result = evaluated(API, { kind: 'butt', thickness: '1/2 in' }, 'visual', {
			undercutDepth: '1/32',
			undercutLength: '1 in'
		});
		expect(result.findings.find((f) => f.check === 'undercut.length')?.outcome).toBe('judge');
		expect(result.missingJoint).toContain('weldLength');
	});
});

describe('hi-lo — 7.2 [1; 1/8 in also unconfirmed]', () => {
	const hiLo = checker(API, 'misalignment.max', 'fitup');

	it('should not exceed 1/8 in (3 mm); more is for the inspector', () => {
		expect(hiLo(girth('1/2 in'), { misalignment: '1/16' })).toBe('within');
		expect(hiLo(girth('1/2 in'), { misalignment: '1/8' })).toBe('within');
		expect(hiLo(girth('1/2 in'), { misalignment: '9/64' })).toBe('judge');
		const metric = checker(API, 'misalignment.max', 'fitup', { units: 'metric' });
		expect(metric(girth(12), { misalignment: '3 mm' })).toBe('within');
		expect(metric(girth(12), { misalignment: '3.2 mm' })).toBe('judge');
	});
});

describe('cap — 7.8.2 [1]', () => {
	// Trap 5: the 1/16 in height is a "should".
	it('should not stand over 1/16 in (1.6 mm) above the pipe', () => {
		const cap = checker(API, 'reinforcement.max', 'visual');
		expect(cap(girth('1/2 in'), { reinforcement: '1/32' })).toBe('within');
		expect(cap(girth('1/2 in'), { reinforcement: '1/16' })).toBe('within');
		expect(cap(girth('1/2 in'), { reinforcement: '3/32' })).toBe('judge');
	});

	// "Shall": the crown is never below the outside surface.
	it('shall not be below the pipe surface', () => {
		const crown = checker(API, 'concavity.max', 'visual');
		expect(crown(girth('1/2 in'), { concavity: 0 })).toBe('within');
		expect(crown(girth('1/2 in'), { concavity: '1/64' })).toBe('outside');
	});
});

describe('other items', () => {
	// 9.3.9.2 (unconfirmed): no individual pore over 1/8 in or 25 % of the thinner wall.
	it('limits the largest pore to 1/8 in or a quarter of the wall', () => {
		const pore = checker(API, 'pore.largest', 'visual');
		expect(pore(girth('1/4 in'), { poreLargest: '1/16' })).toBe('within');
		expect(pore(girth('1/4 in'), { poreLargest: '5/64' })).toBe('outside');
		expect(pore(girth('1 in'), { poreLargest: '1/8' })).toBe('within');
		expect(pore(girth('1 in'), { poreLargest: '9/64' })).toBe('outside');
	});

	it('rejects a crack and leaves incomplete fusion, overlap and craters to the inspector', () => {
		expect(finding(API, girth('1/2 in'), 'visual', { crack: true }, 'crack').outcome).toBe(
			'outside'
		);
		expect(
			finding(API, girth('1/2 in'), 'visual', { incompleteFusion: true }, 'fusion').outcome
		).toBe('judge');
		expect(finding(API, girth('1/2 in'), 'visual', { overlap: true }, 'overlap').outcome).toBe(
			'judge'
		);
		expect(
			finding(API, girth('1/2 in'), 'visual', { craterUnfilled: true }, 'crater').outcome
		).toBe('judge');
	});

	// Joint design is the qualified procedure's (clause number unconfirmed).
	it('leaves the groove to the procedure', () => {
		expect(
			finding(API, girth('1/2 in'), 'fitup', { rootOpening: '1/16' }, 'rootOpening.range')
		).toMatchObject({
			outcome: 'judge',
			limit: null
		});
	});
});

describe('inadequate penetration seen from the root — 9.3.1 [2+]', () => {
	const length = checker(API, 'penetration.length', 'visual');

	// At most 1 in (25 mm) in any 12 in (300 mm) of weld.
	it('allows 1 in in any 12 in of a long weld', () => {
		expect(length(girth('1/2 in'), { incompletePenetrationLength: '1 in' })).toBe('within');
		expect(length(girth('1/2 in'), { incompletePenetrationLength: '1-1/16 in' })).toBe('outside');
		const metric = checker(API, 'penetration.length', 'visual', { units: 'metric' });
		expect(metric(girth(12, 1000), { incompletePenetrationLength: 25 })).toBe('within');
		expect(metric(girth(12, 1000), { incompletePenetrationLength: 26 })).toBe('outside');
	});

	// Welds under 12 in: at most 8 % of the weld length. NPS 2 (OD 2.375 in) runs 7.461 in round:
	// 8 % is 0.597 in.
	it('allows 8 % of a weld under 12 in, its length from the pipe diameter', () => {
		const small: JointInput = { kind: 'butt', thickness: '0.154 in', diameter: '2.375 in' };
		expect(length(small, { incompletePenetrationLength: '0.596 in' })).toBe('within');
		expect(length(small, { incompletePenetrationLength: '0.6 in' })).toBe('outside');
		expect(evaluated(API, small, 'visual', {}).derived.girthLengthMm).toBeCloseTo(
			Math.PI * 2.375 * 25.4,
			9
		);
	});

	it('judges a length over 8 % of 12 in where the weld length is not known', () => {
		expect(
			length({ kind: 'butt', thickness: '1/4 in' }, { incompletePenetrationLength: '1/2' })
		).toBe('judge');
		expect(length({ kind: 'butt', thickness: '1/4 in' }, { incompletePenetrationLength: 0 })).toBe(
			'within'
		);
	});
});

describe('internal concavity — 9.3.6 [1]', () => {
	// Any length is acceptable while the joint is no thinner than the thinnest parent metal.
	it('judges root concavity by the joint thickness', () => {
		const thickness = checker(API, 'jointThickness.min', 'visual');
		expect(
			thickness(girth('0.250 in'), { rootConcavity: '1/32', jointThickness: '0.250 in' })
		).toBe('within');
		expect(
			thickness(girth('0.250 in'), { rootConcavity: '1/32', jointThickness: '0.249 in' })
		).toBe('outside');
	});
});

describe('undercut length with the weld length from the pipe — 9.7 [1]', () => {
	// NPS 6 (OD 6.625 in): 1/6 of 20.8 in is 3.47 in, so 2 in in any 12 in governs.
	it('allows 2 in of undercut deeper than 1/64 in on an NPS 6 girth weld', () => {
		const nps6: JointInput = { kind: 'butt', thickness: '0.280 in', diameter: '6.625 in' };
		const length = checker(API, 'undercut.length', 'visual');
		expect(length(nps6, { undercutDepth: '1/32', undercutLength: '2 in' })).toBe('within');
		expect(length(nps6, { undercutDepth: '1/32', undercutLength: '2-1/16 in' })).toBe('outside');
	});
});
