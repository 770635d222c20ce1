/**
 * Pins on a crowded sheet, laid out for the screen at the current zoom. Pure: positions in,
 * marks out, so the weld map, its tests and anything else can share it.
 *
 * `layoutPins(pins, sizes)` takes each pin's screen position (CSS pixels at the current zoom)
 * and its label, and returns marks:
 * - `{ kind: 'pin' }`: a pin drawn on its own, with `label` placed where it overlaps no other
 *   label and no other mark (around the pin, nearest first);
 * - `{ kind: 'cluster' }`: pins closer together than a touch target, gathered into one mark
 *   at their middle with their count. A pin whose label finds no room anywhere around it is
 *   gathered with its nearest neighbour too, so labels never overlap.
 * Pins for which `alone` says so (the selected one, the one being dragged) are never gathered.
 *
 * `pickAt(marks, x, y)` is the mark a tap at (x, y) means: the nearest pin or cluster within
 * reach of the touch point, or the pin whose label was tapped; never whatever happens to be
 * drawn on top.
 */

export interface PinSpot<T> {
	item: T;
	x: number;
	y: number;
	label: string;
}

export interface Sizes {
	/** Touch target, px: pins closer than this gather into a cluster. */
	target: number;
	/** The drawn glyph, px. */
	glyph: number;
	/** A cluster mark's radius, px. */
	clusterRadius: number;
	/** Label height, px, and the width of one of its characters. */
	labelHeight: number;
	charWidth: number;
}

export const PIN_SIZES: Sizes = {
	target: 46,
	glyph: 24,
	clusterRadius: 17,
	labelHeight: 18,
	charWidth: 9.2
};

export interface LabelBox {
	/** Left end of the text's baseline, relative to the pin, px. */
	dx: number;
	dy: number;
	width: number;
	height: number;
}

export type PinMark<T> =
	| { kind: 'pin'; item: T; x: number; y: number; label: LabelBox }
	| { kind: 'cluster'; items: T[]; x: number; y: number };

interface Box {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
}

const overlaps = (a: Box, b: Box) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

/** Where a label may go around its pin, nearest and most usual first (right and up). */
function labelSpots(width: number, sizes: Sizes): LabelBox[] {
	const g = sizes.glyph;
	const h = sizes.labelHeight;
	const gap = 3;
	const right = g * 0.5 + gap;
	const left = -g * 0.5 - gap - width;
	const middle = h * 0.35;
	return [
		{ dx: right, dy: -g * 0.42, width, height: h },
		{ dx: right, dy: middle, width, height: h },
		{ dx: left, dy: -g * 0.42, width, height: h },
		{ dx: left, dy: middle, width, height: h },
		{ dx: -width / 2, dy: -g * 0.5 - gap - h * 0.25, width, height: h },
		{ dx: -width / 2, dy: g * 0.5 + gap + h * 0.75, width, height: h },
		{ dx: right, dy: g * 0.42 + h * 0.7, width, height: h },
		{ dx: left, dy: g * 0.42 + h * 0.7, width, height: h }
	];
}

/** The box a label takes on screen; its baseline sits 0.75 of its height below the top. */
function labelBox(x: number, y: number, l: LabelBox): Box {
	return {
		x0: x + l.dx - 2,
		y0: y + l.dy - l.height * 0.75,
		x1: x + l.dx + l.width + 2,
		y1: y + l.dy + l.height * 0.25
	};
}

class Buckets<V> {
	#cells = new Map<string, V[]>();
	constructor(readonly size: number) {}
	#key(i: number, j: number) {
		return `${i},${j}`;
	}
	add(box: Box, v: V) {
		for (let i = Math.floor(box.x0 / this.size); i <= Math.floor(box.x1 / this.size); i++)
			for (let j = Math.floor(box.y0 / this.size); j <= Math.floor(box.y1 / this.size); j++) {
				const k = this.#key(i, j);
				const list = this.#cells.get(k);
				if (list) list.push(v);
				else this.#cells.set(k, [v]);
			}
	}
	near(box: Box): V[] {
		const out = new Set<V>();
		for (let i = Math.floor(box.x0 / this.size); i <= Math.floor(box.x1 / this.size); i++)
			for (let j = Math.floor(box.y0 / this.size); j <= Math.floor(box.y1 / this.size); j++)
				for (const v of this.#cells.get(this.#key(i, j)) ?? []) out.add(v);
		return [...out];
	}
}

/** Groups of pins chained closer than `reach` to each other (single linkage). */
function groupsOf<T>(spots: PinSpot<T>[], reach: number, alone: (item: T) => boolean): number[][] {
	const parent = spots.map((_, i) => i);
	const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
	const buckets = new Buckets<number>(reach);
	spots.forEach((s, i) => buckets.add({ x0: s.x, y0: s.y, x1: s.x, y1: s.y }, i));
	spots.forEach((s, i) => {
		if (alone(s.item)) return;
		for (const j of buckets.near({
			x0: s.x - reach,
			y0: s.y - reach,
			x1: s.x + reach,
			y1: s.y + reach
		})) {
			if (j === i || alone(spots[j].item)) continue;
			if (Math.hypot(spots[j].x - s.x, spots[j].y - s.y) < reach) parent[find(i)] = find(j);
		}
	});
	const groups = new Map<number, number[]>();
	spots.forEach((_, i) => {
		const root = find(i);
		const g = groups.get(root);
		if (g) g.push(i);
		else groups.set(root, [i]);
	});
	return [...groups.values()];
}

export function layoutPins<T>(
	spots: PinSpot<T>[],
	sizes: Sizes = PIN_SIZES,
	alone: (item: T) => boolean = () => false
): PinMark<T>[] {
	// Groups that must stay together, grown as labels fail to find room.
	let groups = groupsOf(spots, sizes.target, alone);
	for (let round = 0; round < 12; round++) {
		const { marks, homeless } = placeLabels(spots, groups, sizes, alone);
		if (!homeless.length) return marks;
		// Each pin without room joins the group of its nearest neighbour.
		const groupOf = new Map<number, number>();
		groups.forEach((g, k) => g.forEach((i) => groupOf.set(i, k)));
		const merged = groups.map((g) => [...g]);
		const gone = new Set<number>();
		for (const i of homeless) {
			let nearest = -1;
			let best = Infinity;
			spots.forEach((s, j) => {
				if (j === i || alone(s.item)) return;
				const d = Math.hypot(s.x - spots[i].x, s.y - spots[i].y);
				if (d < best) {
					best = d;
					nearest = j;
				}
			});
			if (nearest < 0) continue;
			const from = groupOf.get(i)!;
			const to = groupOf.get(nearest)!;
			if (from === to || gone.has(from)) continue;
			merged[to].push(...merged[from]);
			merged[from] = [];
			gone.add(from);
			merged[to].forEach((k) => groupOf.set(k, to));
		}
		const next = merged.filter((g) => g.length);
		if (next.length === groups.length) return marks;
		groups = next;
	}
	return placeLabels(spots, groups, sizes, alone).marks;
}

function placeLabels<T>(
	spots: PinSpot<T>[],
	groups: number[][],
	sizes: Sizes,
	alone: (item: T) => boolean
): { marks: PinMark<T>[]; homeless: number[] } {
	const marks: PinMark<T>[] = [];
	/** Room taken on screen, with the pin it belongs to (-1 for clusters and labels). */
	const taken = new Buckets<{ box: Box; owner: number }>(64);
	const singles: number[] = [];
	// Every glyph and cluster takes its room first; labels go around them.
	for (const g of groups) {
		if (g.length === 1) {
			const s = spots[g[0]];
			const half = sizes.glyph / 2;
			const box = { x0: s.x - half, y0: s.y - half, x1: s.x + half, y1: s.y + half };
			taken.add(box, { box, owner: g[0] });
			singles.push(g[0]);
			continue;
		}
		const x = g.reduce((sum, i) => sum + spots[i].x, 0) / g.length;
		const y = g.reduce((sum, i) => sum + spots[i].y, 0) / g.length;
		const r = sizes.clusterRadius;
		const box = { x0: x - r, y0: y - r, x1: x + r, y1: y + r };
		taken.add(box, { box, owner: -1 });
		marks.push({ kind: 'cluster', items: g.map((i) => spots[i].item), x, y });
	}
	// Labels of the pins that must stay alone first, then top to bottom.
	singles.sort(
		(a, b) =>
			Number(alone(spots[b].item)) - Number(alone(spots[a].item)) ||
			spots[a].y - spots[b].y ||
			spots[a].x - spots[b].x
	);
	const homeless: number[] = [];
	for (const i of singles) {
		const s = spots[i];
		const width = Math.max(1, s.label.length) * sizes.charWidth;
		let placed: LabelBox | null = null;
		for (const spot of labelSpots(width, sizes)) {
			const box = labelBox(s.x, s.y, spot);
			if (taken.near(box).some((o) => o.owner !== i && overlaps(o.box, box))) continue;
			placed = spot;
			taken.add(box, { box, owner: -1 });
			break;
		}
		if (!placed) {
			// The pin that must stay alone keeps its label, over the rest.
			if (alone(s.item)) placed = labelSpots(width, sizes)[0];
			else {
				homeless.push(i);
				continue;
			}
		}
		marks.push({ kind: 'pin', item: s.item, x: s.x, y: s.y, label: placed });
	}
	return { marks, homeless };
}

/**
 * The mark a tap means: the nearest pin (within half a touch target of its centre, a little
 * more for a lone pin) or cluster (within its radius plus a margin), else a pin whose label
 * was tapped; null for a tap on the bare sheet.
 */
export function pickAt<T>(
	marks: PinMark<T>[],
	x: number,
	y: number,
	sizes: Sizes = PIN_SIZES
): PinMark<T> | null {
	let best: PinMark<T> | null = null;
	let bestGap = Infinity;
	for (const m of marks) {
		const d = Math.hypot(m.x - x, m.y - y);
		const reach = m.kind === 'pin' ? sizes.target / 2 : sizes.clusterRadius + 8;
		const gap = d - (m.kind === 'pin' ? 0 : sizes.clusterRadius * 0.5);
		if (d <= reach && gap < bestGap) {
			best = m;
			bestGap = gap;
		}
	}
	if (best) return best;
	for (const m of marks) {
		if (m.kind !== 'pin') continue;
		const box = labelBox(m.x, m.y, m.label);
		if (x >= box.x0 && x <= box.x1 && y >= box.y0 && y <= box.y1) return m;
	}
	return null;
}
