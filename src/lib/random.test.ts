import { describe, expect, it } from 'vitest';
import { createRng, isSeed, mixSeed, mulberry32, newSeed, shuffled } from './random';

describe('seeded randomness', () => {
	it('gives the same numbers for the same seed, and others for another', () => {
		const a = mulberry32(20260);
		const b = mulberry32(20260);
		const c = mulberry32(20261);
		const first = Array.from({ length: 5 }, () => a());
		expect(Array.from({ length: 5 }, () => b())).toEqual(first);
		expect(Array.from({ length: 5 }, () => c())).not.toEqual(first);
		// createRng's stream is the bare generator's: the demo drawings keep their shapes.
		const rng = createRng(20260);
		expect(Array.from({ length: 5 }, () => rng.next())).toEqual(first);
	});

	it('spreads evenly over [0, 1) (chi-square over 10 bins, 9 degrees of freedom)', () => {
		const next = mulberry32(7);
		const bins = new Array(10).fill(0);
		const n = 100_000;
		for (let i = 0; i < n; i++) {
			const x = next();
			expect(x >= 0 && x < 1).toBe(true);
			bins[Math.floor(x * 10)]++;
		}
		const expected = n / 10;
		const chi = bins.reduce((sum, o) => sum + (o - expected) ** 2 / expected, 0);
		// 27.88 is the 0.1 % critical value of chi-square with 9 degrees of freedom
		// (NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.4).
		expect(chi).toBeLessThan(27.88);
	});

	it('shuffles into a permutation of the items, the same one for the same seed (Fisher–Yates)', () => {
		const items = Array.from({ length: 50 }, (_, i) => i);
		const once = shuffled(items, 42);
		expect([...once].sort((x, y) => x - y)).toEqual(items);
		expect(shuffled(items, 42)).toEqual(once);
		expect(shuffled(items, 43)).not.toEqual(once);
		expect(items[0]).toBe(0);
	});

	it('puts every item first about equally often (uniform shuffle, common practice)', () => {
		const counts = [0, 0, 0, 0];
		for (let seed = 0; seed < 8000; seed++) counts[shuffled([0, 1, 2, 3], seed)[0]]++;
		for (const n of counts) expect(Math.abs(n - 2000)).toBeLessThan(200);
	});

	it('mixes a salt into a seed, so forks differ and repeat', () => {
		expect(mixSeed(1, 'tracer')).toBe(mixSeed(1, 'tracer'));
		expect(mixSeed(1, 'tracer')).not.toBe(mixSeed(1, 'random'));
		expect(isSeed(mixSeed(99, 7))).toBe(true);
	});

	it('draws fresh seeds in range and tells a seed from other values', () => {
		for (let i = 0; i < 20; i++) expect(isSeed(newSeed())).toBe(true);
		expect(isSeed(0)).toBe(true);
		expect(isSeed(4294967295)).toBe(true);
		expect(isSeed(4294967296)).toBe(false);
		expect(isSeed(-1)).toBe(false);
		expect(isSeed(1.5)).toBe(false);
		expect(isSeed('12')).toBe(false);
	});
});
