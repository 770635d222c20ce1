/**
 * Plane geometry for reading sheets: points, segments, polygons, and a grid that finds what
 * lies near a point without scanning the whole page. Pure.
 */

export type Pt = [number, number];

export const sub = (a: Pt, b: Pt): Pt => [a[0] - b[0], a[1] - b[1]];
export const add = (a: Pt, b: Pt): Pt => [a[0] + b[0], a[1] + b[1]];
export const mul = (a: Pt, k: number): Pt => [a[0] * k, a[1] * k];
export const dot = (a: Pt, b: Pt): number => a[0] * b[0] + a[1] * b[1];
export const cross = (a: Pt, b: Pt): number => a[0] * b[1] - a[1] * b[0];
export const dist = (a: Pt, b: Pt): number => Math.hypot(a[0] - b[0], a[1] - b[1]);

export interface Box {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
}

export function boxOfPoints(points: readonly Pt[], pad = 0): Box {
	let x0 = Infinity;
	let y0 = Infinity;
	let x1 = -Infinity;
	let y1 = -Infinity;
	for (const [x, y] of points) {
		if (x < x0) x0 = x;
		if (y < y0) y0 = y;
		if (x > x1) x1 = x;
		if (y > y1) y1 = y;
	}
	return { x0: x0 - pad, y0: y0 - pad, x1: x1 + pad, y1: y1 + pad };
}

export function pointSegmentDistance(p: Pt, a: Pt, b: Pt): number {
	const d = sub(b, a);
	const l2 = dot(d, d);
	const t = l2 ? Math.max(0, Math.min(1, dot(sub(p, a), d) / l2)) : 0;
	return dist(p, add(a, mul(d, t)));
}

/** Whether two segments cross (touching ends do not count). */
export function segmentsCross(a: Pt, b: Pt, c: Pt, d: Pt): boolean {
	const d1 = cross(sub(b, a), sub(c, a));
	const d2 = cross(sub(b, a), sub(d, a));
	const d3 = cross(sub(d, c), sub(a, c));
	const d4 = cross(sub(d, c), sub(b, c));
	return d1 * d2 < 0 && d3 * d4 < 0;
}

/** Ray casting on a closed polygon given as a flat x y list. */
export function polygonContains(pts: readonly number[], p: Pt): boolean {
	let inside = false;
	const n = pts.length / 2;
	for (let i = 0, j = n - 1; i < n; j = i++) {
		const xi = pts[2 * i];
		const yi = pts[2 * i + 1];
		const xj = pts[2 * j];
		const yj = pts[2 * j + 1];
		if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi)
			inside = !inside;
	}
	return inside;
}

/** Shortest distance from a point to a closed polygon's outline. */
export function polygonOutlineDistance(pts: readonly number[], p: Pt): number {
	const n = pts.length / 2;
	let best = Infinity;
	for (let i = 0, j = n - 1; i < n; j = i++) {
		const d = pointSegmentDistance(p, [pts[2 * j], pts[2 * j + 1]], [pts[2 * i], pts[2 * i + 1]]);
		if (d < best) best = d;
	}
	return best;
}

export function polygonArea(pts: readonly number[]): number {
	const n = pts.length / 2;
	let sum = 0;
	for (let i = 0, j = n - 1; i < n; j = i++)
		sum += pts[2 * j] * pts[2 * i + 1] - pts[2 * i] * pts[2 * j + 1];
	return Math.abs(sum) / 2;
}

/** Things filed by the grid cells their boxes cover, found again by a box around a point. */
export class Grid<T> {
	#cells = new Map<number, T[]>();

	constructor(readonly cell: number) {}

	#key(i: number, j: number): number {
		return (i + 32768) * 65536 + (j + 32768);
	}

	insert(item: T, box: Box): void {
		const c = this.cell;
		const i0 = Math.floor(box.x0 / c);
		const i1 = Math.floor(box.x1 / c);
		const j0 = Math.floor(box.y0 / c);
		const j1 = Math.floor(box.y1 / c);
		// A thing spanning very many cells (a border line) is filed in each, which stays cheap
		// because such things are few.
		for (let i = i0; i <= i1; i++)
			for (let j = j0; j <= j1; j++) {
				const key = this.#key(i, j);
				const list = this.#cells.get(key);
				if (list) list.push(item);
				else this.#cells.set(key, [item]);
			}
	}

	/** Every thing filed in a cell the box touches, each once. */
	query(box: Box): T[] {
		const c = this.cell;
		const seen = new Set<T>();
		const out: T[] = [];
		for (let i = Math.floor(box.x0 / c); i <= Math.floor(box.x1 / c); i++)
			for (let j = Math.floor(box.y0 / c); j <= Math.floor(box.y1 / c); j++)
				for (const item of this.#cells.get(this.#key(i, j)) ?? [])
					if (!seen.has(item)) {
						seen.add(item);
						out.push(item);
					}
		return out;
	}
}
