/**
 * Seeded randomness for the demo drawings. Every choice a generator makes comes from one of
 * these streams, so a spec always yields the same drawing; separate streams (`fork`) keep one
 * part of a drawing from shifting when another part asks for more numbers.
 */
export interface Rng {
	/** Uniform in [0, 1). */
	next(): number;
	/** Integer in [lo, hi], both ends included. */
	int(lo: number, hi: number): number;
	range(lo: number, hi: number): number;
	chance(p: number): boolean;
	pick<T>(items: readonly T[]): T;
	fork(salt: number | string): Rng;
}

export function mixSeed(seed: number, salt: number | string): number {
	let h = (seed ^ 0x9e3779b9) >>> 0;
	const text = String(salt);
	for (let i = 0; i < text.length; i++) {
		h = Math.imul(h ^ text.charCodeAt(i), 0x85ebca6b) >>> 0;
		h = (h ^ (h >>> 13)) >>> 0;
	}
	h = Math.imul(h ^ (h >>> 16), 0xc2b2ae35) >>> 0;
	return (h ^ (h >>> 16)) >>> 0;
}

export function createRng(seed: number): Rng {
	let state = seed >>> 0;
	const next = (): number => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	return {
		next,
		int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
		range: (lo, hi) => lo + next() * (hi - lo),
		chance: (p) => next() < p,
		pick: (items) => items[Math.floor(next() * items.length)],
		fork: (salt) => createRng(mixSeed(seed, salt))
	};
}
