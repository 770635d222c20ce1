import { add, distToSegment, fromAngle, mul, perp, pt, segmentDistance, type Pt } from './pen';

export interface Rect {
	x: number;
	y: number;
	w: number;
	h: number;
}

interface Capsule {
	a: Pt;
	b: Pt;
	r: number;
}

/**
 * What is already drawn in a view, as capsules (a segment with a radius), so labels, weld
 * bubbles and dimension strings can be put where they touch nothing.
 */
export class Clearance {
	private readonly items: Capsule[] = [];

	constructor(readonly bounds: Rect) {}

	segment(a: Pt, b: Pt, r = 0): void {
		this.items.push({ a, b, r });
	}

	circle(c: Pt, r: number): void {
		this.items.push({ a: c, b: c, r });
	}

	box(x: number, y: number, w: number, h: number): void {
		if (w >= h)
			this.items.push({ a: pt(x + h / 2, y + h / 2), b: pt(x + w - h / 2, y + h / 2), r: h / 2 });
		else
			this.items.push({ a: pt(x + w / 2, y + w / 2), b: pt(x + w / 2, y + h - w / 2), r: w / 2 });
	}

	/** A run of text from its baseline origin, as the pen draws it. */
	text(origin: Pt, width: number, size: number, angle: number): void {
		const along = fromAngle(angle);
		const mid = add(origin, mul(perp(along), size * 0.36));
		this.items.push({ a: mid, b: add(mid, mul(along, width)), r: size * 0.5 });
	}

	private outside(p: Pt, r: number): number {
		const b = this.bounds;
		return Math.min(p.x - r - b.x, b.x + b.w - p.x - r, p.y - r - b.y, b.y + b.h - p.y - r);
	}

	/** Free space around a disc: negative when it overlaps something or leaves the view. */
	around(p: Pt, r: number): number {
		let best = this.outside(p, r);
		for (const it of this.items) best = Math.min(best, distToSegment(p, it.a, it.b) - it.r - r);
		return best;
	}

	alongSegment(a: Pt, b: Pt, r: number, ignoreNear: Pt[] = [], ignoreRadius = 0): number {
		let best = Math.min(this.outside(a, r), this.outside(b, r));
		for (const it of this.items) {
			if (ignoreNear.some((q) => distToSegment(q, it.a, it.b) <= ignoreRadius)) continue;
			best = Math.min(best, segmentDistance(a, b, it.a, it.b) - it.r - r);
		}
		return best;
	}

	textFree(origin: Pt, width: number, size: number, angle: number): number {
		const along = fromAngle(angle);
		const mid = add(origin, mul(perp(along), size * 0.36));
		return this.alongSegment(mid, add(mid, mul(along, width)), size * 0.5);
	}
}
