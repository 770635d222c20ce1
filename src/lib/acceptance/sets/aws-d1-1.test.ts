/**
 * AWS D1.1/D1.1M:2020, nontubular. Sources are those of reference/standards.md §1; each case
 * names its clause and how sure the sources are ([2+], [1], unconfirmed).
 */
import { describe, expect, it } from 'vitest';
import { evaluate } from '../evaluate';
import { getCriteriaSet } from '../index';
import { checker, evaluated, finding, inches } from '../testing';
import type { JointInput } from '../types';

const STATIC = 'aws-d1.1-static';
const CYCLIC = 'aws-d1.1-cyclic';
const noDefects = { crack: false, overlap: false, craterUnfilled: false, incompleteFusion: false };
const fillet = (requiredSize: string, more: Partial<JointInput> = {}): JointInput => ({
	kind: 'fillet',
	thickness: '3/4',
	requiredSize,
	weldLength: '24 in',
	...more
});

describe('undersized fillet welds — Table 8.1 (undersized welds) [2+]', () => {
	const undersize = checker(STATIC, 'fillet.undersize', 'visual');
	const legs = (leg: string, length = '2 in') => ({
		filletLeg1: leg,
		filletLeg2: leg,
		undersizeLength: length
	});

	// Reference §8 check: L = 5/16 in, a 3/16 in fillet (U = 1/8 in) is accepted for ≤ 10 % of length.
	it('takes a 3/16 in fillet on a 5/16 in callout, exactly 1/8 in under', () => {
		expect(undersize(fillet('5/16'), legs('3/16'))).toBe('within');
		expect(undersize(fillet('5/16'), legs('13/64'))).toBe('within');
		expect(undersize(fillet('5/16'), legs('11/64'))).toBe('outside');
	});

	// L = 1/4 in → U ≤ 3/32 in.
	it('allows 3/32 in under a 1/4 in fillet', () => {
		expect(undersize(fillet('1/4'), legs('5/32'))).toBe('within');
		expect(undersize(fillet('1/4'), legs('9/64'))).toBe('outside');
	});

	// L ≤ 3/16 in → U ≤ 1/16 in; the smallest fillet gauge blade is 1/8 in (trade practice).
	it('allows 1/16 in under a 3/16 in or 1/8 in fillet', () => {
		expect(undersize(fillet('3/16'), legs('1/8'))).toBe('within');
		expect(undersize(fillet('3/16'), legs('7/64'))).toBe('outside');
		expect(undersize(fillet('1/8'), legs('1/16'))).toBe('within');
		expect(undersize(fillet('1/8'), legs('3/64'))).toBe('outside');
	});

	// L ≥ 5/16 in → U ≤ 1/8 in, up to the largest fillet gauge blade of 1 in (trade practice).
	it('allows 1/8 in under a 1 in fillet', () => {
		expect(undersize(fillet('1'), legs('7/8'))).toBe('within');
		expect(undersize(fillet('1'), legs('55/64'))).toBe('outside');
	});

	// Sizes between the table's rows take the smaller allowance (a conservative reading).
	it('gives a 7/32 in callout the 1/16 in allowance of the row below', () => {
		expect(undersize(fillet('7/32'), legs('5/32'))).toBe('within');
		expect(undersize(fillet('7/32'), legs('9/64'))).toBe('outside');
	});

	// SI column: L ≤ 5 mm → 2 mm; 6 mm → 2.5 mm; ≥ 8 mm → 3 mm.
	it('uses the SI column in a metric project', () => {
		const metric = checker(STATIC, 'fillet.undersize', 'visual', { units: 'metric' });
		const mm = (leg: number) => ({ filletLeg1: leg, filletLeg2: leg, undersizeLength: 50 });
		const joint = (size: number) => ({
			kind: 'fillet' as const,
			requiredSize: size,
			weldLength: 600
		});
		expect(metric(joint(8), mm(5))).toBe('within');
		expect(metric(joint(8), mm(4.9))).toBe('outside');
		expect(metric(joint(6), mm(3.5))).toBe('within');
		expect(metric(joint(6), mm(3.4))).toBe('outside');
		expect(metric(joint(5), mm(3))).toBe('within');
		expect(metric(joint(5), mm(2.9))).toBe('outside');
	});

	it('needs no length for a full-size fillet', () => {
		const result = evaluated(STATIC, fillet('5/16'), 'visual', {
			filletLeg1: '5/16',
			filletLeg2: '3/8'
		});
		expect(result.findings.find((f) => f.check === 'fillet.undersize')).toMatchObject({
			measured: 0,
			outcome: 'within'
		});
		expect(result.missing).not.toContain('undersizeLength');
	});

	// Undersize within U may run for at most 10 % of the weld length.
	it('limits the undersized length to 10 % of the weld', () => {
		const length = checker(STATIC, 'fillet.undersizeLength', 'visual');
		expect(length(fillet('5/16'), legs('3/16', '2.4 in'))).toBe('within');
		expect(length(fillet('5/16'), legs('3/16', '2-1/2 in'))).toBe('outside');
		const f = finding(
			STATIC,
			fillet('5/16'),
			'visual',
			legs('3/16', '2.4'),
			'fillet.undersizeLength'
		);
		expect(f.limit).toBeCloseTo(inches(2.4), 9);
	});

	it('asks for the undersized length, and for the weld length it is judged against', () => {
		const noLength = evaluated(STATIC, fillet('5/16'), 'visual', {
			...noDefects,
			filletLeg1: '1/4',
			filletLeg2: '1/4'
		});
		expect(noLength.missing).toContain('undersizeLength');
		expect(noLength.verdict).toBe('judge');
		const noWeld = evaluated(
			STATIC,
			fillet('5/16', { weldLength: undefined }),
			'visual',
			legs('1/4', '1')
		);
		expect(noWeld.findings.find((f) => f.check === 'fillet.undersizeLength')?.outcome).toBe(
			'judge'
		);
		expect(noWeld.missingJoint).toContain('weldLength');
	});

	// AWS A3.0: a concave fillet is sized from its throat (size = throat / 0.707).
	it('sizes a concave fillet by its throat', () => {
		const f = finding(
			STATIC,
			fillet('5/16'),
			'visual',
			{ throat: '0.133 in', undersizeLength: '1' },
			'fillet.undersize'
		);
		expect(f.reading).toBe('throat');
		expect(f.measured / 25.4).toBeCloseTo(5 / 16 - 0.133 / Math.SQRT1_2, 9);
		expect(f.outcome).toBe('within');
	});

	it('cannot judge undersize without the required size', () => {
		const result = evaluated(STATIC, { kind: 'fillet' }, 'visual', {
			filletLeg1: '1/4',
			filletLeg2: '1/4'
		});
		expect(result.findings.some((f) => f.check === 'fillet.undersize')).toBe(false);
		expect(result.missingJoint).toContain('requiredSize');
	});
});

describe('undercut, statically loaded — Table 8.1 (undercut) [2+]', () => {
	const depth = checker(STATIC, 'undercut.depth', 'visual');
	const length = checker(STATIC, 'undercut.length', 'visual');
	const plate = (thickness: string): JointInput => ({ kind: 'butt', thickness });

	it('allows 1/32 in at any length under 1 in of material', () => {
		expect(depth(plate('3/4'), { undercutDepth: '1/32' })).toBe('within');
		const result = evaluated(STATIC, plate('3/4'), 'visual', { undercutDepth: '1/32' });
		expect(result.missing).not.toContain('undercutLength');
	});

	// Up to 1/16 in for an accumulated 2 in in any 12 in; forum case: 3/64 in over > 2 in, t < 1 in → reject.
	it('allows up to 1/16 in over an accumulated 2 in in any 12 in', () => {
		expect(length(plate('3/4'), { undercutDepth: '3/64', undercutLength: '2 in' })).toBe('within');
		expect(length(plate('3/4'), { undercutDepth: '3/64', undercutLength: '2-1/8 in' })).toBe(
			'outside'
		);
		expect(depth(plate('3/4'), { undercutDepth: '1/16', undercutLength: '1' })).toBe('within');
		expect(length(plate('3/4'), { undercutDepth: '1/16', undercutLength: '1' })).toBe('within');
		expect(depth(plate('3/4'), { undercutDepth: '5/64', undercutLength: '1' })).toBe('outside');
	});

	it('asks for the length of undercut deeper than 1/32 in', () => {
		const result = evaluated(STATIC, plate('3/4'), 'visual', {
			...noDefects,
			undercutDepth: '3/64',
			porosity: 0,
			reinforcement: '1/16'
		});
		expect(result.missing).toEqual(['undercutLength']);
		expect(result.verdict).toBe('judge');
	});

	it('allows 1/16 in at any length from 1 in of material', () => {
		expect(depth(plate('1 in'), { undercutDepth: '1/16' })).toBe('within');
		expect(
			evaluated(STATIC, plate('1 in'), 'visual', { undercutDepth: '1/16' }).missing
		).not.toContain('undercutLength');
		expect(depth(plate('1-1/2 in'), { undercutDepth: '5/64' })).toBe('outside');
	});

	// SI column: 1 mm at any length, 2 mm for 50 mm in any 300 mm, under 25 mm of material.
	it('uses the SI column in a metric project', () => {
		const metric = checker(STATIC, 'undercut.depth', 'visual', { units: 'metric' });
		const metricLength = checker(STATIC, 'undercut.length', 'visual', { units: 'metric' });
		expect(metric(plate('20 mm'), { undercutDepth: '1 mm' })).toBe('within');
		expect(metricLength(plate('20 mm'), { undercutDepth: '1.5 mm', undercutLength: '50 mm' })).toBe(
			'within'
		);
		expect(metricLength(plate('20 mm'), { undercutDepth: '1.5 mm', undercutLength: '55 mm' })).toBe(
			'outside'
		);
		expect(metric(plate('20 mm'), { undercutDepth: '2.1 mm', undercutLength: '10 mm' })).toBe(
			'outside'
		);
	});

	it('judges what depends on a thickness not given', () => {
		expect(depth({ kind: 'butt' }, { undercutDepth: '1/32' })).toBe('within');
		expect(length({ kind: 'butt' }, { undercutDepth: '3/64', undercutLength: '3 in' })).toBe(
			'judge'
		);
		expect(length({ kind: 'butt' }, { undercutDepth: '3/64', undercutLength: '1 in' })).toBe(
			'within'
		);
		expect(depth({ kind: 'butt' }, { undercutDepth: '5/64' })).toBe('outside');
	});
});

describe('piping porosity, statically loaded — Table 8.1 (piping porosity) [2+]', () => {
	const porosity = checker(STATIC, 'porosity.max', 'visual');

	// Sum ≤ 3/8 in in any linear inch for fillets; exam item [1]: 1/2 in in an inch of a 4 in fillet → reject.
	it('allows 3/8 in of pores in any inch of a fillet', () => {
		expect(porosity(fillet('1/4'), { porosity: '3/8' })).toBe('within');
		expect(porosity(fillet('1/4'), { porosity: '1/2' })).toBe('outside');
	});

	it('allows none in a CJP butt joint transverse to tensile stress', () => {
		expect(porosity({ kind: 'butt', stress: 'transverse' }, { porosity: 0 })).toBe('within');
		expect(porosity({ kind: 'butt', stress: 'transverse' }, { porosity: '1/32' })).toBe('outside');
		expect(porosity({ kind: 'butt', stress: 'parallel' }, { porosity: '3/8' })).toBe('within');
	});

	it('judges a butt joint whose stress direction is not given', () => {
		expect(porosity({ kind: 'butt' }, { porosity: '1/4' })).toBe('judge');
		expect(
			evaluated(STATIC, { kind: 'butt' }, 'visual', { porosity: '1/4' }).missingJoint
		).toContain('stress');
	});
});

describe('fillet convexity — 7.23, Fig. 7.4 (older Fig. 5.4 steps) [1; 3/16 in step unconfirmed]', () => {
	const convexity = checker(STATIC, 'fillet.convexity', 'visual');
	const joint = fillet('1/4');

	it('allows 1/16 in on a face up to 5/16 in wide', () => {
		expect(convexity(joint, { convexity: '1/16', faceWidth: '5/16' })).toBe('within');
		expect(convexity(joint, { convexity: '5/64', faceWidth: '5/16' })).toBe('outside');
	});

	it('allows 1/8 in on a face over 5/16 in and under 1 in', () => {
		expect(convexity(joint, { convexity: '1/8', faceWidth: '1/2' })).toBe('within');
		expect(convexity(joint, { convexity: '9/64', faceWidth: '63/64' })).toBe('outside');
	});

	// Unconfirmed: the 3/16 in step for W ≥ 1 in.
	it('allows 3/16 in on a face 1 in wide and over (unconfirmed)', () => {
		expect(convexity(joint, { convexity: '3/16', faceWidth: '1' })).toBe('within');
		expect(convexity(joint, { convexity: '13/64', faceWidth: '1-1/4' })).toBe('outside');
	});

	it('asks for the face width when the convexity is over the smallest step', () => {
		expect(convexity(joint, { convexity: '1/16' })).toBe('within');
		const result = evaluated(STATIC, joint, 'visual', { convexity: '1/8' });
		expect(result.findings.find((f) => f.check === 'fillet.convexity')?.outcome).toBe('judge');
		expect(result.missing).toContain('faceWidth');
	});
});

describe('butt reinforcement — 7.23, Table 7.8 (unconfirmed: 1/8 in)', () => {
	const reinforcement = checker(STATIC, 'reinforcement.max', 'visual');

	// Butt-weld reinforcement gauges read from 1/32 to 1/8 in (trade practice): the whole gauge is within.
	it.each(['1/32', '1/16', '3/32', '1/8'])('takes %s in', (height) => {
		expect(reinforcement({ kind: 'butt', thickness: '1/2' }, { reinforcement: height })).toBe(
			'within'
		);
	});

	it('rejects more than 1/8 in (unconfirmed)', () => {
		expect(reinforcement({ kind: 'butt', thickness: '1/2' }, { reinforcement: '9/64' })).toBe(
			'outside'
		);
	});
});

describe('butt alignment — 7.21.3 [1; clause number unconfirmed]', () => {
	const misalignment = checker(STATIC, 'misalignment.max', 'fitup');

	// Check values: t = 1/2 in → 0.05 in; t = 2 in → 1/8 in governs.
	it('allows 10 % of the thinner part', () => {
		expect(misalignment({ kind: 'butt', thickness: '1/2' }, { misalignment: '0.05 in' })).toBe(
			'within'
		);
		expect(misalignment({ kind: 'butt', thickness: '1/2' }, { misalignment: '0.06 in' })).toBe(
			'outside'
		);
	});

	it('never more than 1/8 in', () => {
		expect(misalignment({ kind: 'butt', thickness: '2 in' }, { misalignment: '1/8' })).toBe(
			'within'
		);
		expect(misalignment({ kind: 'butt', thickness: '2 in' }, { misalignment: '9/64' })).toBe(
			'outside'
		);
	});

	it('reports the offset as a share of the thickness', () => {
		const result = evaluated(STATIC, { kind: 'butt', thickness: '1/2' }, 'fitup', {
			misalignment: '0.05'
		});
		expect(result.derived.misalignmentShareOfThickness).toBeCloseTo(0.1, 9);
	});
});

describe('fit-up', () => {
	// 7.21.1 [2+: two copies of the clause text]: fillet root opening at most 3/16 in; parts 3 in
	// and thicker that cannot be closed may open to 5/16 in with suitable backing.
	it('limits the root opening of a fillet joint', () => {
		const gap = checker(STATIC, 'fillet.gap', 'fitup');
		expect(gap({ kind: 'fillet', thickness: '1/2' }, { rootOpening: '1/16' })).toBe('within');
		expect(gap({ kind: 'fillet', thickness: '1/2' }, { rootOpening: '3/16' })).toBe('within');
		expect(gap({ kind: 'fillet', thickness: '1/2' }, { rootOpening: '13/64' })).toBe('outside');
		expect(gap({ kind: 'fillet', thickness: '3 in' }, { rootOpening: '3/16' })).toBe('within');
		expect(gap({ kind: 'fillet', thickness: '3 in' }, { rootOpening: '1/4' })).toBe('judge');
		expect(gap({ kind: 'fillet', thickness: '3 in' }, { rootOpening: '5/16' })).toBe('judge');
		expect(gap({ kind: 'fillet', thickness: '3 in' }, { rootOpening: '21/64' })).toBe('outside');
		const metric = checker(STATIC, 'fillet.gap', 'fitup', { units: 'metric' });
		expect(metric({ kind: 'fillet', thickness: 12 }, { rootOpening: 5 })).toBe('within');
		expect(metric({ kind: 'fillet', thickness: 12 }, { rootOpening: 5.1 })).toBe('outside');
		expect(metric({ kind: 'fillet', thickness: 75 }, { rootOpening: 8 })).toBe('judge');
		expect(metric({ kind: 'fillet', thickness: 75 }, { rootOpening: 8.1 })).toBe('outside');
	});

	// Fig. 5.1 [1]: groove tolerances are relative to the detail on the WPS, which the joint does not carry.
	it('leaves groove root opening, bevel and root face to the inspector against the detail', () => {
		const result = evaluated(STATIC, { kind: 'butt', thickness: '1/2' }, 'fitup', {
			rootOpening: '3/32',
			bevelAngle: '45°',
			rootFace: '1/16',
			misalignment: 0
		});
		for (const check of ['rootOpening.range', 'bevelAngle.range', 'rootFace.range']) {
			expect(result.findings.find((f) => f.check === check)).toMatchObject({
				outcome: 'judge',
				limit: null
			});
		}
		expect(result.verdict).toBe('judge');
	});
});

describe('always-apply items — Table 8.1 and 7.23 [2+]', () => {
	it.each([
		['crack', 'crack'],
		['incompleteFusion', 'fusion'],
		['craterUnfilled', 'crater'],
		['overlap', 'overlap']
	] as const)('rejects %s', (reading, check) => {
		for (const set of [STATIC, CYCLIC]) {
			const found = finding(set, fillet('1/4'), 'visual', { ...noDefects, [reading]: true }, check);
			expect(found).toMatchObject({ measured: 1, limit: 0, unit: 'flag', outcome: 'outside' });
			expect(finding(set, fillet('1/4'), 'visual', noDefects, check).outcome).toBe('within');
		}
	});
});

describe('cyclically loaded — Table 8.1 (cyclic column)', () => {
	const depth = checker(CYCLIC, 'undercut.depth', 'visual');
	const primaryTransverse: JointInput = {
		kind: 'butt',
		thickness: '1/2 in',
		member: 'primary',
		stress: 'transverse'
	};

	// 0.01 in in primary members, weld transverse to tensile stress [2+].
	it('allows 0.01 in of undercut in primary members transverse to stress', () => {
		expect(depth(primaryTransverse, { undercutDepth: '0.01 in' })).toBe('within');
		expect(depth(primaryTransverse, { undercutDepth: '0.011 in' })).toBe('outside');
		const metric = checker(CYCLIC, 'undercut.depth', 'visual', { units: 'metric' });
		expect(metric(primaryTransverse, { undercutDepth: '0.25 mm' })).toBe('within');
		expect(metric(primaryTransverse, { undercutDepth: '0.3 mm' })).toBe('outside');
	});

	// Trap 1 of the reference: 1/32 in in all other cases [1: one code-page copy].
	it('allows 1/32 in in all other cases', () => {
		expect(depth({ ...primaryTransverse, stress: 'parallel' }, { undercutDepth: '1/32' })).toBe(
			'within'
		);
		expect(depth({ ...primaryTransverse, stress: 'parallel' }, { undercutDepth: '3/64' })).toBe(
			'outside'
		);
		expect(depth({ ...primaryTransverse, member: 'secondary' }, { undercutDepth: '1/32' })).toBe(
			'within'
		);
	});

	it('judges undercut between the two when member or stress is not given', () => {
		expect(depth({ kind: 'butt' }, { undercutDepth: '0.01 in' })).toBe('within');
		expect(depth({ kind: 'butt' }, { undercutDepth: '1/32' })).toBe('judge');
		expect(depth({ kind: 'butt', member: 'primary' }, { undercutDepth: '3/64' })).toBe('outside');
		const result = evaluated(CYCLIC, { kind: 'butt', member: 'primary' }, 'visual', {
			undercutDepth: '1/32'
		});
		expect(result.missingJoint).toEqual(['stress']);
	});

	// Table 8.1 (8)(B), (8)(C) [1: one code-page copy of the 2000 Table 6.1, one source for 3/32 in]:
	// fillets and non-CJP groove welds, at most one pore in any 4 in and none over 3/32 in;
	// CJP butt joints transverse to tensile stress, none.
	it('limits the largest pore to 3/32 in and the count to one in 4 in', () => {
		const largest = checker(CYCLIC, 'pore.largest', 'visual');
		const count = checker(CYCLIC, 'pore.count', 'visual');
		expect(largest(fillet('1/4'), { poreLargest: '3/32', poreCount: 1 })).toBe('within');
		expect(largest(fillet('1/4'), { poreLargest: '7/64', poreCount: 1 })).toBe('outside');
		expect(count(fillet('1/4'), { poreLargest: '1/16', poreCount: 1 })).toBe('within');
		expect(count(fillet('1/4'), { poreLargest: '1/16', poreCount: 2 })).toBe('outside');
		expect(largest(primaryTransverse, { poreLargest: '1/32', poreCount: 1 })).toBe('outside');
		expect(count(primaryTransverse, { poreLargest: 0, poreCount: 0 })).toBe('within');
		const metric = checker(CYCLIC, 'pore.largest', 'visual', { units: 'metric' });
		const metricFillet: JointInput = { kind: 'fillet', thickness: 20, requiredSize: 6 };
		expect(metric(metricFillet, { poreLargest: 2.5 })).toBe('within');
		expect(metric(metricFillet, { poreLargest: 2.6 })).toBe('outside');
	});

	it('asks for the largest pore and the count once porosity is seen, not before', () => {
		expect(evaluated(CYCLIC, fillet('1/4'), 'visual', { porosity: 0 }).missing).not.toContain(
			'poreCount'
		);
		const seen = evaluated(CYCLIC, fillet('1/4'), 'visual', { porosity: '1/16' });
		expect(seen.missing).toEqual(expect.arrayContaining(['poreLargest', 'poreCount']));
		expect(seen.verdict).toBe('judge');
	});

	it('refuses a count that is no whole number', () => {
		const result = evaluate(getCriteriaSet(CYCLIC)!, fillet('1/4'), 'visual', { poreCount: '1.5' });
		expect(result.ok === false && result.errors).toEqual([
			{
				field: 'readings.poreCount',
				message: 'Pores — number in any 4 in (100 mm): give a whole number, such as 0, 1 or 3'
			}
		]);
	});

	it('keeps the static undersize rule', () => {
		const undersize = checker(CYCLIC, 'fillet.undersize', 'visual');
		expect(
			undersize(fillet('5/16'), { filletLeg1: '3/16', filletLeg2: '3/16', undersizeLength: '2' })
		).toBe('within');
		expect(
			undersize(fillet('5/16'), { filletLeg1: '11/64', filletLeg2: '3/16', undersizeLength: '2' })
		).toBe('outside');
	});
});

describe('limits shown for a joint, whatever the reading — Table 8.1 (7)(A) [2+]', () => {
	const plate: JointInput = { kind: 'butt', thickness: '3/4' };
	const depthFinding = (undercutDepth: string, more = {}) =>
		finding(STATIC, plate, 'visual', { undercutDepth, ...more }, 'undercut.depth');

	it('shows 1/32 in at any length and 1/16 in over a limited length, for any depth', () => {
		for (const depth of ['1/64', '1/32', '3/64', '1/16', '5/64']) {
			expect(depthFinding(depth)).toMatchObject({
				limit: inches(1 / 32),
				band: { upTo: inches(1 / 16) }
			});
		}
	});

	// A depth in the band is allowed only over 2 in in any 12 in: without the length it is not within.
	it('does not call a depth in the band within until its length is read', () => {
		expect(depthFinding('3/64').outcome).toBe('judge');
		expect(depthFinding('3/64').note).toMatch(/Read its length/);
		expect(depthFinding('3/64', { undercutLength: '2 in' }).outcome).toBe('within');
		expect(depthFinding('1/32').outcome).toBe('within');
		expect(depthFinding('5/64').outcome).toBe('outside');
	});
});

describe('piping porosity in any 12 in, statically loaded — Table 8.1 (8)(A) [2+]', () => {
	const total = checker(STATIC, 'porosity.total', 'visual');

	// The sum of pore diameters is at most 3/4 in [20 mm] in any 12 in [300 mm] of weld.
	it('allows 3/4 in of pores in any 12 in', () => {
		expect(total(fillet('1/4'), { porosity: '1/4', porosityTotal: '3/4' })).toBe('within');
		expect(total(fillet('1/4'), { porosity: '1/4', porosityTotal: '49/64' })).toBe('outside');
		const metric = checker(STATIC, 'porosity.total', 'visual', { units: 'metric' });
		const joint: JointInput = { kind: 'fillet', requiredSize: 6 };
		expect(metric(joint, { porosity: 5, porosityTotal: 20 })).toBe('within');
		expect(metric(joint, { porosity: 5, porosityTotal: 20.5 })).toBe('outside');
	});

	it('allows none in CJP butt joints transverse to tensile stress', () => {
		const transverse: JointInput = { kind: 'butt', thickness: '1/2', stress: 'transverse' };
		expect(total(transverse, { porosity: 0, porosityTotal: 0 })).toBe('within');
		expect(total(transverse, { porosity: '1/32', porosityTotal: '1/32' })).toBe('outside');
	});

	it('asks for the 12 in sum only once an inch shows pores', () => {
		expect(evaluated(STATIC, fillet('1/4'), 'visual', { porosity: 0 }).missing).not.toContain(
			'porosityTotal'
		);
		expect(evaluated(STATIC, fillet('1/4'), 'visual', { porosity: '1/8' }).missing).toContain(
			'porosityTotal'
		);
	});
});

describe('fillet over a root opening — 7.21.1 [2+: two copies of the clause text]', () => {
	const gapLeg = checker(STATIC, 'fillet.gapLeg', 'visual');
	const legs = (leg: string, rootOpening: string) => ({
		filletLeg1: leg,
		filletLeg2: leg,
		rootOpening
	});

	// Over 1/16 in, the leg is increased by the root opening: 1/4 in + 1/8 in = 3/8 in.
	it('wants the leg increased by a root opening over 1/16 in', () => {
		expect(gapLeg(fillet('1/4'), legs('3/8', '1/8'))).toBe('within');
		expect(gapLeg(fillet('1/4'), legs('23/64', '1/8'))).toBe('judge');
		const f = finding(STATIC, fillet('1/4'), 'visual', legs('5/16', '3/32'), 'fillet.gapLeg');
		expect(f.limit).toBeCloseTo(inches(1 / 4 + 3 / 32), 9);
		expect(f.outcome).toBe('judge');
		expect(f.note).toMatch(/effective throat/);
	});

	it('makes no such check at 1/16 in [2 mm] and under', () => {
		for (const [gap, options] of [
			['1/16', undefined],
			['2 mm', { units: 'metric' as const }]
		] as const) {
			const joint = fillet('1/4 in', { thickness: '3/4 in', weldLength: '24 in' });
			const result = evaluated(STATIC, joint, 'visual', legs('1/4 in', gap), options);
			expect(result.findings.some((f) => f.check === 'fillet.gapLeg')).toBe(false);
		}
		const metric = evaluated(
			STATIC,
			{ kind: 'fillet', requiredSize: 6 },
			'visual',
			{ filletLeg1: 8.5, filletLeg2: 8.5, rootOpening: 2.5 },
			{ units: 'metric' }
		);
		expect(metric.findings.find((f) => f.check === 'fillet.gapLeg')).toMatchObject({
			limit: 8.5,
			outcome: 'within'
		});
	});
});

describe('a whole visual inspection', () => {
	it('is within when every check is within and nothing is missing', () => {
		const result = evaluated(STATIC, fillet('5/16'), 'visual', {
			...noDefects,
			filletLeg1: '5/16',
			filletLeg2: '3/8',
			convexity: '1/16',
			faceWidth: '1/2',
			undercutDepth: '1/32',
			porosity: 0
		});
		expect(result.missing).toEqual([]);
		expect(result.verdict).toBe('within');
		expect(result.criteria).toEqual({
			id: STATIC,
			name: 'AWS D1.1 statically loaded nontubular',
			standard: 'AWS D1.1/D1.1M',
			edition: '2020',
			version: 1
		});
	});
});
