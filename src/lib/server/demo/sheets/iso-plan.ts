import type { Rng } from '$lib/random';
import { add, mul, pt, segmentDistance, type Pt } from './pen';

/** Plant directions; up and down are elevation. */
export type Dir = 'N' | 'S' | 'E' | 'W' | 'U' | 'D';

const C30 = Math.cos(Math.PI / 6);

/** Isometric projection: north runs up-right at 30°, east down-right, elevation straight up. */
export const AXIS: Record<Dir, Pt> = {
	N: pt(C30, 0.5),
	S: pt(-C30, -0.5),
	E: pt(C30, -0.5),
	W: pt(-C30, 0.5),
	U: pt(0, 1),
	D: pt(0, -1)
};

export const CROSS: Record<Dir, Dir[]> = {
	N: ['E', 'W', 'U', 'D'],
	S: ['E', 'W', 'U', 'D'],
	E: ['N', 'S', 'U', 'D'],
	W: ['N', 'S', 'U', 'D'],
	U: ['N', 'S', 'E', 'W'],
	D: ['N', 'S', 'E', 'W']
};

export const isVertical = (d: Dir): boolean => d === 'U' || d === 'D';

export type EndKind = 'nozzle' | 'continuation' | 'flange' | 'blind' | 'bevel' | 'cap';

export const END_WELDS: Record<EndKind, number> = {
	nozzle: 1,
	continuation: 0,
	flange: 1,
	blind: 1,
	bevel: 0,
	cap: 1
};

export interface Leg {
	dir: Dir;
	a: Pt;
	b: Pt;
	units: number;
	realMm: number;
}

export interface Branch {
	legIndex: number;
	/** Distance from the host leg's start, in plan units. */
	at: number;
	kind: 'tee' | 'olet';
	legs: Leg[];
	end: EndKind;
	/** How many sizes smaller than the run the branch is. */
	sizeStep: number;
}

export interface RunPlan {
	legs: Leg[];
	start: EndKind;
	end: EndKind;
	branches: Branch[];
	/** The branch a revised issue adds; planned for every issue so the rest never moves. */
	addition: Branch | null;
	/** Welds fixed by the plan: elbows, ends and branches (not the addition). */
	committedWelds: number;
}

export function branchWelds(b: Branch): number {
	return (b.kind === 'tee' ? 3 : 2) + 2 * (b.legs.length - 1) + END_WELDS[b.end];
}

export interface PlanOptions {
	target: number;
	start: EndKind;
	end: EndKind;
	shop: boolean;
	/** Real millimetres per plan unit, roughly. */
	mmPerUnit: number;
	imperial: boolean;
}

type Seg = [Pt, Pt];

function realLength(rng: Rng, units: number, o: PlanOptions): number {
	const mm = units * o.mmPerUnit * rng.range(0.75, 1.3);
	return o.imperial ? Math.round(mm / 3.175) * 3.175 : Math.round(mm / 5) * 5;
}

function clearOf(a: Pt, b: Pt, segs: Seg[], min: number): boolean {
	return segs.every(([c, d]) => segmentDistance(a, b, c, d) >= min);
}

function walk(rng: Rng, legCount: number, o: PlanOptions): Leg[] {
	const legs: Leg[] = [];
	let at = pt(0, 0);
	let prev: Dir | null = null;
	for (let i = 0; i < legCount; i++) {
		const options: Dir[] = prev ? [...CROSS[prev]] : ['N', 'E', 'S', 'W'];
		let placed = false;
		for (let tries = 0; tries < 24 && !placed; tries++) {
			let dir = rng.pick(options);
			if (prev && !isVertical(prev) && !isVertical(dir) && rng.chance(0.3))
				dir = rng.pick(['U', 'D'] as const);
			const units = isVertical(dir) ? rng.int(5, 8) / 2 : rng.int(7, 12) / 2;
			const b = add(at, mul(AXIS[dir], units));
			const earlier: Seg[] = legs.slice(0, -1).map((l) => [l.a, l.b]);
			if (!clearOf(at, b, earlier, 2.4)) continue;
			legs.push({ dir, a: at, b, units, realMm: realLength(rng, units, o) });
			at = b;
			prev = dir;
			placed = true;
		}
		if (!placed) break;
	}
	return legs;
}

function tryBranch(
	rng: Rng,
	legs: Leg[],
	taken: Branch[],
	kind: Branch['kind'],
	o: PlanOptions,
	extra: Seg[]
): Branch | null {
	const others: Seg[] = [...extra];
	for (const b of taken) for (const l of b.legs) others.push([l.a, l.b]);
	for (let tries = 0; tries < 30; tries++) {
		const legIndex = rng.int(0, legs.length - 1);
		const host = legs[legIndex];
		const segs: Seg[] = [
			...legs.filter((_, i) => i !== legIndex).map((l): Seg => [l.a, l.b]),
			...others
		];
		if (host.units < 2.5) continue;
		const at = rng.int(2, Math.floor((host.units - 1) * 2)) / 2;
		if (at < 1 || at > host.units - 1) continue;
		if (taken.some((b) => b.legIndex === legIndex && Math.abs(b.at - at) < 1.5)) continue;
		const root = add(host.a, mul(AXIS[host.dir], at));
		const dir = rng.pick(CROSS[host.dir]);
		const units = rng.int(3, 5) / 2;
		const tip = add(root, mul(AXIS[dir], units));
		if (!clearOf(add(root, mul(AXIS[dir], 0.7)), tip, segs, 1.7)) continue;
		const branchLegs: Leg[] = [{ dir, a: root, b: tip, units, realMm: realLength(rng, units, o) }];
		if (kind === 'tee' && rng.chance(0.4)) {
			const dir2 = rng.pick(CROSS[dir].filter((d) => d !== host.dir && d !== opposite(host.dir)));
			const units2 = rng.int(3, 5) / 2;
			const tip2 = add(tip, mul(AXIS[dir2], units2));
			if (clearOf(tip, tip2, [...segs, [host.a, host.b]], 1.7))
				branchLegs.push({
					dir: dir2,
					a: tip,
					b: tip2,
					units: units2,
					realMm: realLength(rng, units2, o)
				});
		}
		const ends: EndKind[] = o.shop
			? ['flange', 'blind']
			: ['flange', 'blind', 'continuation', 'nozzle'];
		return {
			legIndex,
			at,
			kind,
			legs: branchLegs,
			end: rng.pick(ends),
			sizeStep: kind === 'olet' ? rng.int(2, 3) : rng.pick([0, 0, 1, 2])
		};
	}
	return null;
}

export function opposite(d: Dir): Dir {
	return ({ N: 'S', S: 'N', E: 'W', W: 'E', U: 'D', D: 'U' } as const)[d];
}

/**
 * Lays out one sheet's line in plan units: legs joined by elbows, and the branches. Inline
 * fittings (valves, flange breaks, joints) are placed later, once the drawing scale is known.
 */
export function planRun(rng: Rng, o: PlanOptions): RunPlan {
	const endWelds = END_WELDS[o.start] + END_WELDS[o.end];
	let legs: Leg[] = [];
	for (let attempt = 0; attempt < 12; attempt++) {
		const r = rng.fork(`walk-${attempt}`);
		const wanted = Math.max(
			2,
			Math.min(o.shop ? 4 : 7, Math.round((o.target - endWelds) / 4) + r.int(0, 1))
		);
		legs = walk(r, wanted, o);
		while (legs.length > 2 && 2 * (legs.length - 1) + endWelds > o.target) legs.pop();
		if (legs.length >= 2) break;
	}
	let committed = 2 * (legs.length - 1) + endWelds;
	const branches: Branch[] = [];
	const br = rng.fork('branches');
	const maxBranches = o.target >= 18 ? 3 : o.target >= 11 ? 2 : 1;
	for (let i = 0; i < maxBranches; i++) {
		const budget = o.target - committed;
		if (budget < 4 || !br.chance(i === 0 ? 0.85 : 0.55)) continue;
		const b = tryBranch(br, legs, branches, br.chance(0.7) ? 'tee' : 'olet', o, []);
		if (!b) continue;
		if (branchWelds(b) > budget) {
			b.legs = b.legs.slice(0, 1);
			if (branchWelds(b) > budget) b.end = 'continuation';
			if (branchWelds(b) > budget) continue;
		}
		branches.push(b);
		committed += branchWelds(b);
	}
	const addRng = rng.fork('revision');
	const addition = tryBranch(addRng, legs, branches, 'olet', o, []);
	if (addition) {
		addition.legs = addition.legs.slice(0, 1);
		const leg = addition.legs[0];
		const shorter = Math.min(leg.units, 1.5);
		leg.realMm = Math.round((leg.realMm * shorter) / leg.units);
		leg.units = shorter;
		leg.b = add(leg.a, mul(AXIS[leg.dir], leg.units));
		addition.end = addRng.pick(['flange', 'blind'] as const);
	}
	return { legs, start: o.start, end: o.end, branches, addition, committedWelds: committed };
}
