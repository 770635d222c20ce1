/**
 * Where the turnover set's stamps go on a sheet, and how big they are. Pure: numbers in,
 * placements out, so the stamped PDF and its tests use the same arithmetic.
 *
 * Size: stamps are drawn at `stampScale` times their A3 size, from the sheet's short side, so
 * an A1 sheet (or a scan saved at its pixel size) gets proportionally larger marks that still
 * read when the sheet is printed; A3, ANSI B and anything smaller keep the A3 size.
 *
 * Place: `layoutStamps` puts each stamp (state glyph with its weld number above) on its pin.
 * Where it would overlap a stamp already placed, it goes to the nearest free place around
 * the pin instead, inside the sheet, with a leader from the stamp to the pin's exact point:
 * no two stamps overlap, and every leader ends on its pin. All in the shown frame: points,
 * origin at the bottom-left of the sheet as displayed, v up (see sheet-frame.ts).
 */
import { STAMP } from './sheet-frame';

/** The A3 short side (ISO 216: 297 mm), points: the sheet size the stamps were drawn for. */
const A3_SHORT_SIDE = 841.89;
/** Beyond this even a wall-sized scan gets no larger marks. */
const MAX_SCALE = 8;

export function stampScale(width: number, height: number): number {
	const short = Math.min(width, height);
	return Math.min(MAX_SCALE, Math.max(1, short / A3_SHORT_SIDE));
}

export interface StampSize {
	scale: number;
	glyphScale: number;
	labelSize: number;
	/** From the glyph's centre up to the number's baseline. */
	labelBaseline: number;
	/** Half the width and height of the glyph with its review ring and stroke. */
	glyphHalf: number;
}

export function stampSize(width: number, height: number): StampSize {
	const k = stampScale(width, height);
	return {
		scale: k,
		glyphScale: STAMP.glyphScale * k,
		labelSize: STAMP.labelSize * k,
		labelBaseline: STAMP.labelBaseline * k,
		// The review ring: radius 12.5 glyph units, plus its stroke.
		glyphHalf: (12.5 * STAMP.glyphScale + 0.8) * k
	};
}

export interface StampRequest {
	/** The pin, shown frame. */
	u: number;
	v: number;
	/** Width of the weld number at the stamp's label size. */
	labelWidth: number;
}

export interface StampPlacement {
	/** Centre of the stamp's glyph, shown frame. */
	u: number;
	v: number;
	offset: boolean;
	/** For an offset stamp: from the edge of its glyph to the pin. */
	leader: { from: [number, number]; to: [number, number] } | null;
}

export interface Frame {
	width: number;
	height: number;
	/** Kept clear at the bottom (the footer). */
	bottom: number;
}

interface Box {
	u0: number;
	v0: number;
	u1: number;
	v1: number;
}

/** The room a stamp takes around its glyph centre: glyph and ring, and the number above. */
export function stampBox(u: number, v: number, labelWidth: number, size: StampSize): Box {
	const half = Math.max(size.glyphHalf, labelWidth / 2 + 1.4 * size.scale);
	return {
		u0: u - half,
		v0: v - size.glyphHalf,
		u1: u + half,
		v1: v + size.labelBaseline + size.labelSize * 0.72 + 1.6 * size.scale
	};
}

const overlaps = (a: Box, b: Box) => a.u0 < b.u1 && b.u0 < a.u1 && a.v0 < b.v1 && b.v0 < a.v1;

function segmentHitsBox(a: [number, number], b: [number, number], box: Box): boolean {
	// Sampled along its length: leaders are short and boxes a few points across.
	const steps = Math.max(2, Math.ceil(Math.hypot(b[0] - a[0], b[1] - a[1]) / 2));
	for (let i = 1; i < steps; i++) {
		const t = i / steps;
		const u = a[0] + (b[0] - a[0]) * t;
		const v = a[1] + (b[1] - a[1]) * t;
		if (u > box.u0 && u < box.u1 && v > box.v0 && v < box.v1) return true;
	}
	return false;
}

class Boxes {
	#cells = new Map<string, Box[]>();
	constructor(readonly cell: number) {}
	#keys(b: Box): string[] {
		const keys: string[] = [];
		for (let i = Math.floor(b.u0 / this.cell); i <= Math.floor(b.u1 / this.cell); i++)
			for (let j = Math.floor(b.v0 / this.cell); j <= Math.floor(b.v1 / this.cell); j++)
				keys.push(`${i},${j}`);
		return keys;
	}
	add(b: Box) {
		for (const k of this.#keys(b)) {
			const list = this.#cells.get(k);
			if (list) list.push(b);
			else this.#cells.set(k, [b]);
		}
	}
	hits(b: Box): boolean {
		for (const k of this.#keys(b))
			for (const o of this.#cells.get(k) ?? []) if (overlaps(o, b)) return true;
		return false;
	}
	near(b: Box): Box[] {
		const out = new Set<Box>();
		for (const k of this.#keys(b)) for (const o of this.#cells.get(k) ?? []) out.add(o);
		return [...out];
	}
}

/** Placements in the order of the requests. Pins earlier in the list keep their place first. */
export function layoutStamps(
	requests: StampRequest[],
	frame: Frame,
	size: StampSize
): StampPlacement[] {
	const placed = new Boxes(40 * size.scale);
	const out: StampPlacement[] = new Array(requests.length);
	const inside = (b: Box) =>
		b.u0 >= 2 && b.u1 <= frame.width - 2 && b.v0 >= frame.bottom + 2 && b.v1 <= frame.height - 2;
	for (let i = 0; i < requests.length; i++) {
		const r = requests[i];
		const home = stampBox(r.u, r.v, r.labelWidth, size);
		if (!placed.hits(home)) {
			placed.add(home);
			out[i] = { u: r.u, v: r.v, offset: false, leader: null };
			continue;
		}
		out[i] = offsetStamp(r, home, placed, inside, size) ?? {
			u: r.u,
			v: r.v,
			offset: false,
			leader: null
		};
	}
	return out;
}

function offsetStamp(
	r: StampRequest,
	home: Box,
	placed: Boxes,
	inside: (b: Box) => boolean,
	size: StampSize
): StampPlacement | null {
	const w = home.u1 - home.u0;
	const h = home.v1 - home.v0;
	const step = Math.max(w, h) * 0.6;
	let fallback: StampPlacement | null = null;
	for (let ring = 1; ring <= 14; ring++) {
		const distance = ring * step + size.glyphHalf;
		for (let k = 0; k < 16; k++) {
			// Up and to the right first (where a reader looks for a label), then round.
			const a = ((45 + k * 22.5) * Math.PI) / 180;
			const u = r.u + Math.cos(a) * distance;
			const v = r.v + Math.sin(a) * distance;
			const box = stampBox(u, v, r.labelWidth, size);
			if (!inside(box) || placed.hits(box)) continue;
			const along = Math.hypot(r.u - u, r.v - v);
			const from: [number, number] = [
				u + ((r.u - u) / along) * size.glyphHalf,
				v + ((r.v - v) / along) * size.glyphHalf
			];
			const placement: StampPlacement = { u, v, offset: true, leader: { from, to: [r.u, r.v] } };
			// Best of all: a leader that crosses no other stamp.
			const reach = {
				u0: Math.min(from[0], r.u),
				v0: Math.min(from[1], r.v),
				u1: Math.max(from[0], r.u),
				v1: Math.max(from[1], r.v)
			};
			if (placed.near(reach).some((o) => segmentHitsBox(from, [r.u, r.v], o))) {
				fallback ??= placement;
				continue;
			}
			placed.add(box);
			return placement;
		}
	}
	if (fallback) placed.add(stampBox(fallback.u, fallback.v, r.labelWidth, size));
	return fallback;
}
