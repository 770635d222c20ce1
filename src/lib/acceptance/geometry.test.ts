import { describe, expect, it } from 'vitest';
import {
	EQUAL_LEG_THROAT_FACTOR,
	filletSize,
	filletSizeFromThroat,
	filletUndersize,
	legAsymmetry,
	nominalThroat,
	offsetShareOfThickness,
	theoreticalThroat
} from './geometry';
import { inches } from './testing';

const toInches = (mm: number) => mm / 25.4;

describe('theoretical throat', () => {
	// AWS A3.0 / D1.1 design clauses: equal legs give 0.707 × leg (sin 45°) [2+].
	it('is 0.7071 × leg for equal legs', () => {
		expect(EQUAL_LEG_THROAT_FACTOR).toBeCloseTo(0.70711, 5);
		expect(theoreticalThroat(10)).toBeCloseTo(7.0711, 4);
	});

	// Worked check values, reference standards.md §8: 1/4 in → 0.177 in [2+]; the rest computed.
	it.each([
		[1 / 4, 0.177],
		[3 / 8, 0.2652],
		[3 / 16, 0.133],
		[5 / 16, 0.221],
		[1 / 2, 0.354]
	])('of a %f in equal-leg fillet is %f in', (leg, throat) => {
		expect(toInches(theoreticalThroat(inches(leg)))).toBeCloseTo(throat, 3);
	});

	// a·b/√(a²+b²) for unequal legs: geometry of the inscribed right triangle (unconfirmed, derived).
	it('of unequal legs is a·b/√(a²+b²)', () => {
		expect(toInches(theoreticalThroat(inches(1 / 4), inches(3 / 8)))).toBeCloseTo(0.208, 3);
		expect(theoreticalThroat(6, 8)).toBeCloseTo(4.8, 9);
		expect(theoreticalThroat(8, 6)).toBeCloseTo(4.8, 9);
	});

	// §8, computed: nominal shear per inch of a 1/4 in E70 fillet, 0.6 × 70 ksi × throat.
	it('gives 7.42 kip/in for a 1/4 in E70 fillet (5.57 with φ = 0.75)', () => {
		const perInch = 0.6 * 70 * toInches(theoreticalThroat(inches(1 / 4)));
		expect(perInch).toBeCloseTo(7.42, 2);
		expect(0.75 * perInch).toBeCloseTo(5.57, 2);
	});

	// §8 [1] (Haque examples): 3/4 in E70 fillet, 8 in long, LRFD → 133.6 kip parallel to its axis.
	it('gives 133.6 kip for an 8 in long 3/4 in E70 fillet (LRFD)', () => {
		const strength = 0.75 * 0.6 * 70 * toInches(theoreticalThroat(inches(3 / 4))) * 8;
		expect(strength).toBeCloseTo(133.6, 1);
		expect(strength * 1.5).toBeCloseTo(200.4, 0);
	});
});

describe('fillet size', () => {
	// AWS A3.0: a concave fillet's size is its gauged throat / 0.707 [2+].
	it('of a concave fillet comes from its throat', () => {
		expect(toInches(filletSizeFromThroat(inches(0.177)))).toBeCloseTo(0.25, 3);
		expect(filletSizeFromThroat(theoreticalThroat(8))).toBeCloseTo(8, 9);
	});

	// AWS A3.0: size is the legs of the largest inscribed right triangle; the shorter leg governs.
	it('is the shorter leg, or less where the throat shows a concave face', () => {
		expect(filletSize({ leg1Mm: inches(1 / 4), leg2Mm: inches(5 / 16) })).toBeCloseTo(
			inches(1 / 4),
			9
		);
		expect(
			filletSize({ leg1Mm: inches(5 / 16), leg2Mm: inches(5 / 16), throatMm: inches(0.15) })
		).toBeCloseTo(inches(0.15 / Math.SQRT1_2), 9);
		expect(filletSize({ leg1Mm: 6, throatMm: 5 })).toBe(6);
		expect(filletSize({})).toBeUndefined();
	});

	// Table 8.1 of D1.1:2020 reads undersize as specified size less actual size (reference §8 check).
	it('falls short of the required size by the difference, never by less than zero', () => {
		expect(toInches(filletUndersize(inches(5 / 16), inches(3 / 16)))).toBeCloseTo(1 / 8, 9);
		expect(filletUndersize(8, 9)).toBe(0);
		expect(filletUndersize(8, 8)).toBe(0);
	});

	// ISO 5817 uses the nominal throat a of the specified fillet (0.7071 × leg).
	it('has a nominal throat of 0.7071 × the required size', () => {
		expect(nominalThroat(5 / Math.SQRT1_2)).toBeCloseTo(5, 9);
	});

	it('has a leg asymmetry that is the difference of the legs', () => {
		expect(legAsymmetry(8, 10.25)).toBeCloseTo(2.25, 9);
		expect(legAsymmetry(10.25, 8)).toBeCloseTo(2.25, 9);
	});
});

describe('butt offset', () => {
	// D1.1 alignment check values [1]: t = 1/2 in → 0.05 in is 10 %.
	it('is a share of the thickness', () => {
		expect(offsetShareOfThickness(inches(0.05), inches(1 / 2))).toBeCloseTo(0.1, 9);
		expect(offsetShareOfThickness(3, 12)).toBe(0.25);
	});
});
