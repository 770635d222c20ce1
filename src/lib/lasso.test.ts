import { describe, expect, it } from 'vitest';
import { insideLasso } from './lasso';

// Point in polygon by the even-odd (crossing number) rule: Shimrat, "Algorithm 112: Position
// of point relative to polygon", Communications of the ACM 5(8), 1962.
describe('what a lasso encloses', () => {
	const square = [
		[0, 0],
		[10, 0],
		[10, 10],
		[0, 10]
	] as const;
	it('takes points inside and leaves those outside', () => {
		expect(insideLasso(square, [5, 5])).toBe(true);
		expect(insideLasso(square, [15, 5])).toBe(false);
		expect(insideLasso(square, [5, -1])).toBe(false);
	});
	it('follows a concave outline: the notch of a U is outside', () => {
		const u = [
			[0, 0],
			[30, 0],
			[30, 30],
			[20, 30],
			[20, 10],
			[10, 10],
			[10, 30],
			[0, 30]
		] as const;
		expect(insideLasso(u, [15, 20])).toBe(false);
		expect(insideLasso(u, [5, 20])).toBe(true);
		expect(insideLasso(u, [25, 25])).toBe(true);
	});
	it('encloses nothing with fewer than three corners', () => {
		expect(
			insideLasso(
				[
					[0, 0],
					[10, 10]
				],
				[5, 5]
			)
		).toBe(false);
	});
});
