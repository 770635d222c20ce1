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
	/** 'line': another line may cross it, never run along it. 'dot': an extension line may pass it. */
	kind: 'solid' | 'line' | 'dot';
}

/** How strict a check is: text and bubbles touch nothing; dimension and extension lines may cross lines. */
export type Crossing = 'strict' | 'dimension' | 'extension';

const PARALLEL = Math.sin((25 * Math.PI) / 180);

function nearlyParallel(a: Pt, b: Pt, c: Pt, d: Pt): boolean {
	const u = { x: b.x - a.x, y: b.y - a.y };
	const v = { x: d.x - c.x, y: d.y - c.y };
	const lu = Math.hypot(u.x, u.y);
	const lv = Math.hypot(v.x, v.y);
	if (lu === 0 || lv === 0) return true;
	return Math.abs(u.x * v.y - u.y * v.x) / (lu * lv) < PARALLEL;
}

/**
 * What is already drawn in a view, as capsules (a segment with a radius), so labels, weld
 * bubbles and dimension strings can be put where they touch nothing.
 */
export class Clearance {
	private readonly items: Capsule[] = [];

	constructor(readonly bounds: Rect) {}

	segment(a: Pt, b: Pt, r = 0, kind: Capsule['kind'] = 'solid'): void {
		this.items.push({ a, b, r, kind });
	}

	circle(c: Pt, r: number): void {
		this.items.push({ a: c, b: c, r, kind: 'solid' });
	}

	dot(c: Pt, r: number): void {
		this.items.push({ a: c, b: c, r, kind: 'dot' });
	}

	box(x: number, y: number, w: number, h: number): void {
		if (w >= h)
			this.items.push({
				a: pt(x + h / 2, y + h / 2),
				b: pt(x + w - h / 2, y + h / 2),
				r: h / 2,
				kind: 'solid'
			});
		else
			this.items.push({
				a: pt(x + w / 2, y + w / 2),
				b: pt(x + w / 2, y + h - w / 2),
				r: w / 2,
				kind: 'solid'
			});
	}

	/** A run of text from its baseline origin, as the pen draws it. */
	text(origin: Pt, width: number, size: number, angle: number): void {
		const along = fromAngle(angle);
		const mid = add(origin, mul(perp(along), size * 0.36));
		this.items.push({ a: mid, b: add(mid, mul(along, width)), r: size * 0.5, kind: 'solid' });
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

	/** Free space along a thick segment. */
	alongSegment(a: Pt, b: Pt, r: number, crossing: Crossing = 'strict'): number {
		let best = Math.min(this.outside(a, r), this.outside(b, r));
		for (const it of this.items) {
			if (crossing !== 'strict' && it.kind === 'line' && !nearlyParallel(a, b, it.a, it.b))
				continue;
			if (crossing === 'extension' && it.kind === 'dot') continue;
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
