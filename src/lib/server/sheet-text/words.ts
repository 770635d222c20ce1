/**
 * Words from a page's text items. A PDF may hold a label as one item, as one item per glyph,
 * or inside a longer item ("W-12  W-13"); this splits items at spaces and joins pieces that
 * run on along one baseline without a gap, so each word comes out whole, with its box in
 * user space whatever its rotation. Pure.
 */
import type { SheetText } from './reader';
import { Grid, add, dot, mul, sub, type Box, type Pt } from './plane';

export interface Word {
	text: string;
	/** Left end of the baseline. */
	origin: Pt;
	/** Unit vector along the baseline, and the unit vector "up" the glyphs. */
	u: Pt;
	up: Pt;
	size: number;
	/** Advance along the baseline. */
	length: number;
	/** Centre of the word, half-way up the digits. */
	centre: Pt;
	font: string;
}

/** Relative advance of a glyph, close enough for sharing an item's width among its characters. */
function advanceOf(ch: string): number {
	if (ch === ' ') return 0.28;
	if (/[0-9]/.test(ch)) return 0.556;
	if (/[-.,:;'"!|()/]/.test(ch)) return 0.3;
	if (/[MW]/.test(ch)) return 0.85;
	if (/[A-Z]/.test(ch)) return 0.67;
	if (/[a-z]/.test(ch)) return 0.5;
	return 0.6;
}

/** Digits and capitals stand about this share of the font size above the baseline. */
export const DIGIT_HEIGHT = 0.7;

export function wordCentre(origin: Pt, u: Pt, up: Pt, length: number, size: number): Pt {
	return add(add(origin, mul(u, length / 2)), mul(up, (size * DIGIT_HEIGHT) / 2));
}

/** The four corners of a word's box: baseline to digit height, end to end. */
export function wordCorners(w: Word, grow = 0): Pt[] {
	const h = w.size * DIGIT_HEIGHT;
	const o = add(add(w.origin, mul(w.u, -grow)), mul(w.up, -grow));
	const along = mul(w.u, w.length + 2 * grow);
	const rise = mul(w.up, h + 2 * grow);
	return [o, add(o, along), add(add(o, along), rise), add(o, rise)];
}

export function wordBox(w: Word, grow = 0): Box {
	const c = wordCorners(w, grow);
	return {
		x0: Math.min(c[0][0], c[1][0], c[2][0], c[3][0]),
		y0: Math.min(c[0][1], c[1][1], c[2][1], c[3][1]),
		x1: Math.max(c[0][0], c[1][0], c[2][0], c[3][0]),
		y1: Math.max(c[0][1], c[1][1], c[2][1], c[3][1])
	};
}

/** A point in a word's own frame: along its baseline from its origin, and up from it. */
export function inWordFrame(w: Word, p: Pt): Pt {
	const d = sub(p, w.origin);
	return [dot(d, w.u), dot(d, w.up)];
}

interface Piece {
	text: string;
	origin: Pt;
	u: Pt;
	up: Pt;
	size: number;
	length: number;
	font: string;
	next: Piece | null;
	joined: boolean;
}

function piecesOf(item: SheetText): Piece[] {
	const [a, b, c, d, e, f] = item.m;
	const scaleX = Math.hypot(a, b);
	const size = Math.hypot(c, d) || item.h;
	if (!size || !scaleX) return [];
	const u: Pt = [a / scaleX, b / scaleX];
	// "Up" the glyphs, at right angles to the baseline even for skewed or mirrored text.
	let up: Pt = [-u[1], u[0]];
	if (c * up[0] + d * up[1] < 0) up = [-up[0], -up[1]];
	const chars = [...item.s];
	const weights = chars.map(advanceOf);
	const total = weights.reduce((s, x) => s + x, 0) || 1;
	const width = item.w > 0 ? item.w : total * size;
	const pieces: Piece[] = [];
	let at = 0;
	let start = -1;
	let startAt = 0;
	const flush = (end: number, endAt: number) => {
		if (start < 0) return;
		const origin: Pt = [
			e + u[0] * ((startAt / total) * width),
			f + u[1] * ((startAt / total) * width)
		];
		pieces.push({
			text: chars.slice(start, end).join(''),
			origin,
			u,
			up,
			size,
			length: ((endAt - startAt) / total) * width,
			font: item.font,
			next: null,
			joined: false
		});
		start = -1;
	};
	for (let i = 0; i < chars.length; i++) {
		if (/\s/.test(chars[i])) flush(i, at);
		else if (start < 0) {
			start = i;
			startAt = at;
		}
		at += weights[i];
	}
	flush(chars.length, at);
	return pieces;
}

/** The words of a page, in no particular order. */
export function wordsOf(texts: readonly SheetText[]): Word[] {
	const pieces = texts.flatMap(piecesOf);
	const grid = new Grid<Piece>(24);
	for (const p of pieces)
		grid.insert(p, { x0: p.origin[0], y0: p.origin[1], x1: p.origin[0], y1: p.origin[1] });

	// Each piece's follower: one that starts where it ends, on its baseline, with no space between.
	for (const p of pieces) {
		const end = add(p.origin, mul(p.u, p.length));
		const reach = p.size * 0.6;
		let best: Piece | null = null;
		let bestGap = Infinity;
		for (const q of grid.query({
			x0: end[0] - reach,
			y0: end[1] - reach,
			x1: end[0] + reach,
			y1: end[1] + reach
		})) {
			if (q === p || q.joined || dot(q.u, p.u) < 0.995) continue;
			if (q.size < p.size * 0.8 || q.size > p.size * 1.25) continue;
			const d = sub(q.origin, end);
			const across = Math.abs(dot(d, p.up));
			const gap = dot(d, p.u);
			if (across > p.size * 0.2 || gap < -p.size * 0.3 || gap > p.size * 0.14) continue;
			if (Math.abs(gap) < bestGap) {
				best = q;
				bestGap = Math.abs(gap);
			}
		}
		if (best) {
			p.next = best;
			best.joined = true;
		}
	}

	const words: Word[] = [];
	for (const head of pieces) {
		if (head.joined) continue;
		let text = '';
		let last = head;
		const seen = new Set<Piece>();
		for (let p: Piece | null = head; p && !seen.has(p); p = p.next) {
			seen.add(p);
			text += p.text;
			last = p;
		}
		const end = add(last.origin, mul(last.u, last.length));
		const length = Math.max(dot(sub(end, head.origin), head.u), head.length);
		words.push({
			text,
			origin: head.origin,
			u: head.u,
			up: head.up,
			size: head.size,
			length,
			centre: wordCentre(head.origin, head.u, head.up, length, head.size),
			font: head.font
		});
	}
	return words;
}
