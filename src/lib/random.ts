/**
 * Seeded randomness: the same seed always gives the same numbers, on the server, in the
 * browser and in tests. Used for the demo job and its drawings, and for NDE sample
 * selection, where a stored seed lets anyone draw the same selection again from the same
 * candidates. mulberry32: a small 32-bit generator, fast and even enough for sampling; it is
 * not for secrets (a fresh seed comes from the platform's cryptographic generator).
 */
export interface Rng {
	/** Uniform in [0, 1). */
	next(): number;
	/** Integer in [lo, hi], both ends included. */
	int(lo: number, hi: number): number;
	range(lo: number, hi: number): number;
	chance(p: number): boolean;
	pick<T>(items: readonly T[]): T;
	/** A new stream from this seed and a salt, so one use never shifts another's numbers. */
	fork(salt: number | string): Rng;
}

/** The largest seed: seeds are whole numbers from 0 to 2³² − 1. */
export const MAX_SEED = 0xffffffff;

/** A seed and a salt mixed into a new seed (a murmur3-style finaliser). */
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

/** The bare generator: each call returns the next number in [0, 1). */
export function mulberry32(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

export function createRng(seed: number): Rng {
	const next = mulberry32(seed);
	return {
		next,
		int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)),
		range: (lo, hi) => lo + next() * (hi - lo),
		chance: (p) => next() < p,
		pick: (items) => items[Math.floor(next() * items.length)],
		fork: (salt) => createRng(mixSeed(seed, salt))
	};
}

/** A copy of the items in a random order (Fisher–Yates), the same order for the same seed. */
export function shuffled<T>(items: readonly T[], seed: number): T[] {
	const next = mulberry32(seed);
	const out = [...items];
	for (let i = out.length - 1; i > 0; i--) {
		const k = Math.floor(next() * (i + 1));
		[out[i], out[k]] = [out[k], out[i]];
	}
	return out;
}

/** A fresh seed from the platform's cryptographic generator. */
export function newSeed(): number {
	return crypto.getRandomValues(new Uint32Array(1))[0];
}

/** Is this a seed: a whole number from 0 to 2³² − 1? */
export function isSeed(value: unknown): value is number {
	return typeof value === 'number' && Number.isInteger(value) && value >= 0 && value <= MAX_SEED;
}
