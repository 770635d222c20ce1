/**
 * ASME B31.3-2018, Table 341.3.2 and 328. Sources are those of reference/standards.md §2.
 */
import { describe, expect, it } from 'vitest';
import { evaluate } from '../evaluate';
import { getCriteriaSet } from '../index';
import { checker, evaluated, finding } from '../testing';
import type { JointInput } from '../types';

const NORMAL = 'asme-b31.3-normal';
const SEVERE = 'asme-b31.3-severe-cyclic';
const CATEGORY_D = 'asme-b31.3-category-d';
const girth = (thickness: string | number): JointInput => ({ kind: 'butt', thickness });

describe('undercut — Table 341.3.2, criteria H, I and A [2+]', () => {
	const normal = checker(NORMAL, 'undercut.depth', 'visual');

	// Check value: Tw = 0.280 in → min(1/32, 0.070) = 1/32 in.
	it('allows the lesser of 1/32 in and Tw/4 in normal service (H)', () => {
		expect(normal(girth('0.280 in'), { undercutDepth: '1/32' })).toBe('within');
		expect(normal(girth('0.280 in'), { undercutDepth: '0.032 in' })).toBe('outside');
	});

	// Check value: Tw = 0.100 in → 0.025 in.
	it('lets Tw/4 govern a thin wall (H)', () => {
		expect(normal(girth('0.100 in'), { undercutDepth: '0.025 in' })).toBe('within');
		expect(normal(girth('0.100 in'), { undercutDepth: '0.026 in' })).toBe('outside');
	});

	// SI column: 1 mm; Tw = 3 mm → 0.75 mm.
	it('uses 1 mm in a metric project (H)', () => {
		const metric = checker(NORMAL, 'undercut.depth', 'visual', { units: 'metric' });
		expect(metric(girth(8), { undercutDepth: '1 mm' })).toBe('within');
		expect(metric(girth(8), { undercutDepth: '1.1 mm' })).toBe('outside');
		expect(metric(girth(3), { undercutDepth: '0.75 mm' })).toBe('within');
		expect(metric(girth(3), { undercutDepth: '0.8 mm' })).toBe('outside');
	});

	it('applies H to fillet and branch welds too', () => {
		expect(normal({ kind: 'fillet', thickness: '0.280 in' }, { undercutDepth: '1/32' })).toBe(
			'within'
		);
		expect(normal({ kind: 'branch', thickness: '0.280 in' }, { undercutDepth: '3/64' })).toBe(
			'outside'
		);
	});

	it('allows none under severe cyclic conditions (A)', () => {
		const severe = checker(SEVERE, 'undercut.depth', 'visual');
		expect(severe(girth('0.280 in'), { undercutDepth: 0 })).toBe('within');
		expect(severe(girth('0.280 in'), { undercutDepth: '1/64' })).toBe('outside');
	});

	// Check value: Tw = 0.100 in, Category D = min(1/16, max(0.025, 1/32)) = 1/32 in (I, note 6).
	it('allows the lesser of 1/16 in and the greater of Tw/4 and 1/32 in on Category D girth welds (I)', () => {
		const categoryD = checker(CATEGORY_D, 'undercut.depth', 'visual');
		expect(categoryD(girth('0.100 in'), { undercutDepth: '1/32' })).toBe('within');
		expect(categoryD(girth('0.100 in'), { undercutDepth: '0.032 in' })).toBe('outside');
		expect(categoryD(girth('0.280 in'), { undercutDepth: '1/16' })).toBe('within');
		expect(categoryD(girth('0.280 in'), { undercutDepth: '0.065 in' })).toBe('outside');
		// Category D fillet welds take H.
		expect(categoryD({ kind: 'fillet', thickness: '0.280 in' }, { undercutDepth: '1/32' })).toBe(
			'within'
		);
		expect(categoryD({ kind: 'fillet', thickness: '0.280 in' }, { undercutDepth: '3/64' })).toBe(
			'outside'
		);
	});

	it('judges undercut between zero and 1/32 in when Tw is not given', () => {
		expect(normal({ kind: 'butt' }, { undercutDepth: 0 })).toBe('within');
		const found = finding(
			NORMAL,
			{ kind: 'butt' },
			'visual',
			{ undercutDepth: '1/64' },
			'undercut.depth'
		);
		expect(found).toMatchObject({ outcome: 'judge', limit: null });
		expect(found.note).toMatch(/depends on the thickness/);
		expect(normal({ kind: 'butt' }, { undercutDepth: '3/64' })).toBe('outside');
	});
});

describe('reinforcement — Table 341.3.2, criteria L and M [2+]', () => {
	const normal = checker(NORMAL, 'reinforcement.max', 'visual');
	const categoryD = checker(CATEGORY_D, 'reinforcement.max', 'visual');

	// Reference §8 check: Tw = 8 mm → L ≤ 3.0 mm, Category D M = 6 mm.
	it('allows 3.0 mm on an 8 mm wall, 6 mm in Category D', () => {
		const metric = checker(NORMAL, 'reinforcement.max', 'visual', { units: 'metric' });
		const metricD = checker(CATEGORY_D, 'reinforcement.max', 'visual', { units: 'metric' });
		expect(metric(girth(8), { reinforcement: '3.0 mm' })).toBe('within');
		expect(metric(girth(8), { reinforcement: '3.1 mm' })).toBe('outside');
		expect(metricD(girth(8), { reinforcement: '6 mm' })).toBe('within');
		expect(metricD(girth(8), { reinforcement: '6.1 mm' })).toBe('outside');
	});

	it.each([
		['1/4 in', '1/16', '5/64'],
		['0.280 in', '1/8', '9/64'],
		['1/2 in', '1/8', '9/64'],
		['3/4 in', '5/32', '11/64'],
		['1 in', '5/32', '11/64'],
		['1-1/2 in', '3/16', '13/64']
	])('on a %s wall allows %s in and rejects %s in', (thickness, within, outside) => {
		expect(normal(girth(thickness), { reinforcement: within })).toBe('within');
		expect(normal(girth(thickness), { reinforcement: outside })).toBe('outside');
	});

	it('doubles L for Category D (M)', () => {
		expect(categoryD(girth('1/4 in'), { reinforcement: '1/8' })).toBe('within');
		expect(categoryD(girth('1-1/2 in'), { reinforcement: '3/8' })).toBe('within');
		expect(categoryD(girth('1-1/2 in'), { reinforcement: '25/64' })).toBe('outside');
	});

	// Butt-weld reinforcement gauges read 1/32 to 1/8 in (trade practice); on a 0.280 in wall all pass.
	it.each(['1/32', '1/16', '3/32', '1/8'])(
		'takes a %s in gauge reading on a 0.280 in wall',
		(height) => {
			expect(normal(girth('0.280 in'), { reinforcement: height })).toBe('within');
		}
	);

	// Note (8): fillet height from the theoretical throat, read here as convexity.
	it('limits fillet convexity by L', () => {
		const convexity = checker(NORMAL, 'fillet.convexity', 'visual');
		expect(convexity({ kind: 'fillet', thickness: '0.280 in' }, { convexity: '1/8' })).toBe(
			'within'
		);
		expect(convexity({ kind: 'fillet', thickness: '0.280 in' }, { convexity: '9/64' })).toBe(
			'outside'
		);
	});
});

describe('surface porosity — Table 341.3.2, criterion A and note (5) [2+]', () => {
	const porosity = checker(NORMAL, 'porosity.max', 'visual');

	// Trap 4 of the reference: zero, evaluated only for welds of 3/16 in (5 mm) and less.
	it('allows none on a weld of 3/16 in or less', () => {
		expect(porosity(girth('3/16 in'), { porosity: 0 })).toBe('within');
		expect(porosity(girth('3/16 in'), { porosity: '1/32' })).toBe('outside');
	});

	it('leaves thicker welds to the inspector', () => {
		const found = finding(NORMAL, girth('1/4 in'), 'visual', { porosity: '1/32' }, 'porosity.max');
		expect(found).toMatchObject({ outcome: 'judge', limit: null });
		expect(found.note).toMatch(/note \(5\)/i);
	});
});

describe('fit-up — 328.4.3 and Fig. 328.5.2C [2+]', () => {
	// Trap 3: B31.3 gives no number for internal misalignment.
	it('leaves internal misalignment to the WPS and design', () => {
		const found = finding(
			NORMAL,
			girth('0.280 in'),
			'fitup',
			{ misalignment: '1/16' },
			'misalignment.max'
		);
		expect(found).toMatchObject({ outcome: 'judge', limit: null });
		expect(found.note).toMatch(/no number/);
		expect(
			finding(NORMAL, girth('0.280 in'), 'fitup', { misalignment: 0 }, 'misalignment.max').outcome
		).toBe('within');
	});

	// Approximately 1/16 in (1.5 mm) gap before welding; no gap rejected by common practice.
	it('wants about 1/16 in between pipe and socket', () => {
		const gap = checker(NORMAL, 'socket.gap', 'fitup');
		const socket: JointInput = { kind: 'socket', thickness: '0.133 in' };
		expect(gap(socket, { rootOpening: '1/16' })).toBe('within');
		expect(gap(socket, { rootOpening: '3/32' })).toBe('within');
		expect(gap(socket, { rootOpening: '1/32' })).toBe('judge');
		expect(gap(socket, { rootOpening: 0 })).toBe('outside');
		const metric = checker(NORMAL, 'socket.gap', 'fitup', { units: 'metric' });
		expect(metric(socket, { rootOpening: '1.5 mm' })).toBe('within');
		expect(metric(socket, { rootOpening: '1.4 mm' })).toBe('judge');
	});

	// 328.4.2, common practice: joint preparation is the WPS's.
	it('leaves the groove to the WPS', () => {
		const result = evaluated(NORMAL, girth('0.280 in'), 'fitup', {
			rootOpening: '3/32',
			bevelAngle: '37.5°',
			rootFace: '1/16'
		});
		expect(result.findings.every((f) => f.outcome === 'judge')).toBe(true);
	});
});

describe('fillet size — Figs. 328.5.2A and 328.5.2C [2+]', () => {
	// Cx min = 1.09 × nominal pipe wall; NPS 1 Sch 40 (0.133 in) → 0.145 in.
	it('wants a socket fillet of at least 1.09 × the pipe wall', () => {
		const size = checker(NORMAL, 'socket.filletSize', 'visual');
		const socket: JointInput = { kind: 'socket', thickness: '0.133 in' };
		expect(size(socket, { filletLeg1: '5/32', filletLeg2: '5/32' })).toBe('within');
		expect(size(socket, { filletLeg1: '9/64', filletLeg2: '5/32' })).toBe('outside');
		expect(
			size({ kind: 'socket', thickness: '0.2 in' }, { filletLeg1: '0.218 in', filletLeg2: '1/4' })
		).toBe('within');
		expect(
			size({ kind: 'socket', thickness: '0.2 in' }, { filletLeg1: '0.217 in', filletLeg2: '1/4' })
		).toBe('outside');
	});

	it('has no undersize row: an undersized fillet is for the inspector', () => {
		const undersize = checker(NORMAL, 'fillet.undersize', 'visual');
		const joint: JointInput = { kind: 'fillet', thickness: '1/4 in', requiredSize: '1/4' };
		expect(undersize(joint, { filletLeg1: '1/4', filletLeg2: '5/16' })).toBe('within');
		expect(undersize(joint, { filletLeg1: '3/16', filletLeg2: '1/4' })).toBe('judge');
	});
});

describe('cracks and other items', () => {
	// Criterion A for cracks [2+].
	it('rejects a crack in every column', () => {
		for (const set of [NORMAL, SEVERE, CATEGORY_D]) {
			expect(finding(set, girth('1/4 in'), 'visual', { crack: true }, 'crack').outcome).toBe(
				'outside'
			);
		}
	});

	// No overlap or crater rows (unconfirmed: none in the copies seen); Category D girth welds take
	// criterion C for lack of fusion [2+: 2014 and 2018 copies of the table], branches criterion A.
	it('leaves overlap, craters and Category D girth lack of fusion to the inspector', () => {
		expect(finding(NORMAL, girth('1/4 in'), 'visual', { overlap: true }, 'overlap').outcome).toBe(
			'judge'
		);
		expect(
			finding(NORMAL, girth('1/4 in'), 'visual', { craterUnfilled: true }, 'crater').outcome
		).toBe('judge');
		expect(
			finding(NORMAL, girth('1/4 in'), 'visual', { incompleteFusion: true }, 'fusion').outcome
		).toBe('outside');
		expect(
			finding(CATEGORY_D, girth('1/4 in'), 'visual', { incompleteFusion: true }, 'fusion').outcome
		).toBe('judge');
		const branch: JointInput = { kind: 'branch', thickness: '1/4 in' };
		expect(
			finding(CATEGORY_D, branch, 'visual', { incompleteFusion: true }, 'fusion').outcome
		).toBe('outside');
		expect(
			finding(CATEGORY_D, girth('1/4 in'), 'visual', { incompleteFusion: false }, 'fusion').outcome
		).toBe('within');
	});

	// Criterion K: concavity is fine while the total joint thickness keeps Tw.
	it('judges concavity by the joint thickness under criterion K', () => {
		const thickness = checker(NORMAL, 'jointThickness.min', 'visual');
		expect(thickness(girth('1/4 in'), { concavity: '1/32', jointThickness: '1/4 in' })).toBe(
			'within'
		);
		expect(thickness(girth('1/4 in'), { concavity: '1/32', jointThickness: '15/64 in' })).toBe(
			'outside'
		);
		expect(thickness(girth(6), { rootConcavity: 1, jointThickness: 6 })).toBe('within');
		expect(evaluated(NORMAL, girth('1/4 in'), 'visual', {}).missing).not.toContain(
			'jointThickness'
		);
		const concave = evaluated(NORMAL, girth('1/4 in'), 'visual', { concavity: '1/32' });
		expect(concave.missing).toContain('jointThickness');
		expect(concave.verdict).toBe('judge');
	});
});

describe('incomplete penetration — Table 341.3.2, criteria B, C and A [2+]', () => {
	const depth = (set: string, joint: JointInput, value: string | number) =>
		finding(
			set,
			joint,
			'visual',
			{ incompletePenetrationDepth: value, incompletePenetrationLength: 1 },
			'penetration.depth'
		).outcome;
	const length = (set: string, joint: JointInput, value: string | number, options = {}) =>
		finding(
			set,
			joint,
			'visual',
			{ incompletePenetrationLength: value },
			'penetration.length',
			options
		).outcome;

	// B: depth ≤ 1 mm (1/32 in) and ≤ 0.2Tw. Tw = 0.280 in → 1/32 in; Tw = 0.100 in → 0.020 in.
	it('limits the depth to the lesser of 1/32 in and 0.2Tw in normal service (B)', () => {
		expect(depth(NORMAL, girth('0.280 in'), '1/32')).toBe('within');
		expect(depth(NORMAL, girth('0.280 in'), '0.032 in')).toBe('outside');
		expect(depth(NORMAL, girth('0.100 in'), '0.020 in')).toBe('within');
		expect(depth(NORMAL, girth('0.100 in'), '0.021 in')).toBe('outside');
	});

	// B, C: cumulative length ≤ 38 mm (1.5 in) in any 150 mm (6 in); the reading is the worst 12 in.
	it('allows 1.5 in in any 6 in, judging what a 12 in total cannot tell', () => {
		const pipe = girth('0.280 in');
		expect(length(NORMAL, pipe, '1-1/2 in')).toBe('within');
		expect(length(NORMAL, pipe, '2 in')).toBe('judge');
		expect(length(NORMAL, pipe, '3 in')).toBe('judge');
		expect(length(NORMAL, pipe, '3-1/16 in')).toBe('outside');
		const metric = { units: 'metric' } as const;
		expect(length(NORMAL, girth(8), 38, metric)).toBe('within');
		expect(length(NORMAL, girth(8), 39, metric)).toBe('judge');
	});

	// A girth weld shorter than 6 in is one stretch: NPS 1 (OD 1.315 in) runs 4.13 in round.
	it('judges a small girth weld as one stretch', () => {
		const small: JointInput = { kind: 'butt', thickness: '0.133 in', diameter: '1.315 in' };
		expect(length(NORMAL, small, '1-1/2 in')).toBe('within');
		expect(length(NORMAL, small, '1-9/16 in')).toBe('outside');
	});

	it('allows none in longitudinal seams and under severe cyclic conditions (A)', () => {
		const seam: JointInput = { kind: 'butt', thickness: '0.280 in', seam: 'longitudinal' };
		expect(length(NORMAL, seam, 0)).toBe('within');
		expect(length(NORMAL, seam, '1/16')).toBe('outside');
		expect(length(SEVERE, girth('0.280 in'), '1/16')).toBe('outside');
		expect(depth(SEVERE, girth('0.280 in'), '1/64')).toBe('outside');
	});

	// Category D: C (≤ 0.2Tw) for girth welds, B for branches. Tw = 0.280 in → 0.056 in.
	it('takes 0.2Tw on Category D girth welds and B on branches', () => {
		expect(depth(CATEGORY_D, girth('0.280 in'), '0.056 in')).toBe('within');
		expect(depth(CATEGORY_D, girth('0.280 in'), '0.057 in')).toBe('outside');
		const branch: JointInput = { kind: 'branch', thickness: '0.280 in' };
		expect(depth(CATEGORY_D, branch, '1/32')).toBe('within');
		expect(depth(CATEGORY_D, branch, '0.032 in')).toBe('outside');
	});

	it('wants the depth once a length of incomplete penetration is read', () => {
		const none = evaluated(NORMAL, girth('0.280 in'), 'visual', { incompletePenetrationLength: 0 });
		expect(none.missing).not.toContain('incompletePenetrationDepth');
		const some = evaluated(NORMAL, girth('0.280 in'), 'visual', {
			incompletePenetrationLength: '1'
		});
		expect(some.missing).toContain('incompletePenetrationDepth');
	});
});

describe('root protrusion — Table 341.3.2, criteria L and M [2+]', () => {
	// Reference check: Tw = 8 mm → L ≤ 3.0 mm, M (Category D) 6 mm.
	it('holds internal protrusion to the reinforcement table', () => {
		const metric = { units: 'metric' } as const;
		const normal = checker(NORMAL, 'rootProtrusion.max', 'visual', metric);
		const catD = checker(CATEGORY_D, 'rootProtrusion.max', 'visual', metric);
		expect(normal(girth(8), { rootProtrusion: 3 })).toBe('within');
		expect(normal(girth(8), { rootProtrusion: 3.1 })).toBe('outside');
		expect(catD(girth(8), { rootProtrusion: 6 })).toBe('within');
		expect(catD(girth(8), { rootProtrusion: 6.1 })).toBe('outside');
		const imperial = checker(NORMAL, 'rootProtrusion.max', 'visual');
		expect(imperial(girth('0.280 in'), { rootProtrusion: '1/8' })).toBe('within');
		expect(imperial(girth('0.280 in'), { rootProtrusion: '9/64' })).toBe('outside');
	});
});

describe('surface finish — Table 341.3.2, criterion J [2+]', () => {
	// Severe cyclic conditions: Ra ≤ 500 µin per ASME B46.1 (12.5 µm in the SI column).
	it('limits roughness under severe cyclic conditions only', () => {
		const finish = checker(SEVERE, 'surfaceFinish.max', 'visual');
		expect(finish(girth('0.280 in'), { surfaceRoughness: '500 µin' })).toBe('within');
		expect(finish(girth('0.280 in'), { surfaceRoughness: '510 uin' })).toBe('outside');
		expect(finish(girth('0.280 in'), { surfaceRoughness: '500' })).toBe('within');
		expect(finish(girth('0.280 in'), { surfaceRoughness: '12.7 µm' })).toBe('within');
		const metric = checker(SEVERE, 'surfaceFinish.max', 'visual', { units: 'metric' });
		expect(metric(girth(8), { surfaceRoughness: '12.5' })).toBe('within');
		expect(metric(girth(8), { surfaceRoughness: '12.6 µm' })).toBe('outside');
		expect(metric({ kind: 'fillet', thickness: 8 }, { surfaceRoughness: 13 })).toBe('outside');
		const normal = evaluated(NORMAL, girth('0.280 in'), 'visual', { surfaceRoughness: '600 µin' });
		expect(normal.findings.some((f) => f.check === 'surfaceFinish.max')).toBe(false);
	});

	it('refuses a roughness it cannot read', () => {
		const result = evaluate(getCriteriaSet(SEVERE)!, girth('0.280 in'), 'visual', {
			surfaceRoughness: 'smooth'
		});
		expect(result.ok === false && result.errors[0]).toEqual({
			field: 'readings.surfaceRoughness',
			message: 'Surface roughness (Ra): cannot read "smooth"; type it like 500 µin or 12.5 µm'
		});
	});
});

describe('socket, slip-on and branch fillets — Figs. 328.5.2B, 328.5.2C, 328.5.4D', () => {
	// Fig. 328.5.2C [2+ for 1.09T]: where a thinner socket wall is recorded it governs (unconfirmed).
	it('lets a thinner socket wall govern the socket fillet', () => {
		const size = checker(NORMAL, 'socket.filletSize', 'visual');
		const socket: JointInput = { kind: 'socket', thickness: '0.2 in', socketWall: '0.2 in' };
		expect(size(socket, { filletLeg1: '0.2 in', filletLeg2: '1/4' })).toBe('within');
		expect(size(socket, { filletLeg1: '0.199 in', filletLeg2: '1/4' })).toBe('outside');
	});

	// Fig. 328.5.2B [1: the B31.1 figure's words, same rule]: x min = lesser of 1.4T and the hub.
	// T = 0.280 in → 0.392 in; a 0.350 in hub governs.
	it('wants 1.4T or the hub, the lesser, on a slip-on flange', () => {
		const size = checker(NORMAL, 'flange.filletSize', 'visual');
		const slipOn: JointInput = { kind: 'fillet', thickness: '0.280 in', flange: 'slip-on' };
		expect(size(slipOn, { filletLeg1: '0.392 in', filletLeg2: '1/2' })).toBe('within');
		expect(size(slipOn, { filletLeg1: '0.391 in', filletLeg2: '1/2' })).toBe('outside');
		const hub = { ...slipOn, socketWall: '0.350 in' };
		expect(size(hub, { filletLeg1: '0.350 in', filletLeg2: '1/2' })).toBe('within');
		expect(size(hub, { filletLeg1: '0.349 in', filletLeg2: '1/2' })).toBe('outside');
		const socketFlange: JointInput = {
			kind: 'socket',
			thickness: '0.280 in',
			flange: 'socket-welding'
		};
		const result = evaluated(NORMAL, socketFlange, 'visual', {
			filletLeg1: '0.4 in',
			filletLeg2: '0.4 in'
		});
		expect(result.findings.map((f) => f.check)).toContain('flange.filletSize');
		expect(result.findings.map((f) => f.check)).not.toContain('socket.filletSize');
	});

	// 328.5.4(d) [1: 2012 copy]: cover fillet throat ≥ tc, the lesser of 0.7Tb and 6 mm (1/4 in).
	// Tb = 0.280 in → 0.196 in; Tb = 1/2 in → 1/4 in governs.
	it('wants the cover fillet throat of a branch at least tc', () => {
		const cover = checker(NORMAL, 'branch.coverFillet', 'visual');
		const branch = (thickness: string): JointInput => ({ kind: 'branch', thickness });
		expect(cover(branch('0.280 in'), { throat: '0.196 in' })).toBe('within');
		expect(cover(branch('0.280 in'), { throat: '0.195 in' })).toBe('outside');
		expect(cover(branch('1/2 in'), { throat: '1/4' })).toBe('within');
		expect(cover(branch('1/2 in'), { throat: '15/64' })).toBe('outside');
		// Legs of 5/16 in give a theoretical throat of 0.221 in.
		expect(cover(branch('1/2 in'), { filletLeg1: '5/16', filletLeg2: '5/16' })).toBe('outside');
		expect(cover(branch('1/2 in'), { filletLeg1: '3/8', filletLeg2: '3/8' })).toBe('within');
		const metric = checker(NORMAL, 'branch.coverFillet', 'visual', { units: 'metric' });
		expect(metric(branch('10 mm'), { throat: 6 })).toBe('within');
		expect(metric(branch('10 mm'), { throat: 5.9 })).toBe('outside');
	});
});
