/**
 * Which words on a page are weld labels. A word is a candidate when it reads as a weld number
 * under the project's rule (src/lib/weld-labels.ts); it is kept when it stands like a label:
 * inside a small closed outline that fits it (a bubble), at the end of a leader that runs to
 * the pipe or a weld dot, beside a weld dot or a weld tick, or (for a distinctive prefix such
 * as FW-) on its own. It is dropped when it stands like anything else that carries numbers:
 * in a table (its cell shares rules with others, or it is one of a column of alike words), in
 * running text (a word beside it on its line: notes, "SHEET 1 OF 2", "E 4450"), beside a
 * dimension line, in a revision triangle, or in an outline shared with other words (an
 * instrument bubble, a title-block cell). Pure.
 */
import { readWeldLabel, type WeldLabelRule } from '$lib/weld-labels';
import type { SheetGeometry } from './reader';
import {
	Grid,
	add,
	cross,
	dist,
	dot,
	mul,
	pointSegmentDistance,
	polygonContains,
	polygonOutlineDistance,
	sub,
	type Box,
	type Pt
} from './plane';
import { pageShapes, type Line, type Outline, type PageShapes } from './shapes';
import {
	DIGIT_HEIGHT,
	inWordFrame,
	wordBox,
	wordCentre,
	wordCorners,
	wordsOf,
	type Word
} from './words';

export type Evidence = 'bubble' | 'leader' | 'dot' | 'tick' | 'prefix';

export interface PageLabel {
	number: string;
	location: 'shop' | 'field' | null;
	/** Centre of the printed number, PDF user-space points. */
	x: number;
	y: number;
	/** The weld the label points at (leader end, dot or tick), when the sheet shows it. */
	target: { x: number; y: number } | null;
	evidence: Evidence[];
	score: number;
}

interface Candidate {
	word: Word;
	/** The words it was read from (a prefix and its digits may be two). */
	parts: Word[];
	number: string;
	location: 'shop' | 'field' | null;
	prefixed: boolean;
}

interface Page {
	words: Word[];
	wordGrid: Grid<Word>;
	shapes: PageShapes;
	rule: WeldLabelRule;
}

const outlineContainsWord = (o: Outline, w: Word) =>
	wordCorners(w, -0.12 * w.size).every((c) => polygonContains(o.pts, c));

/** Words on the same baseline within `reach` (in font sizes) either side, nearest first. */
function lineNeighbours(page: Page, w: Word, reach: number): { word: Word; gap: number }[] {
	const r = w.size * (reach + 1) + w.length;
	const out: { word: Word; gap: number }[] = [];
	for (const o of page.wordGrid.query({
		x0: w.centre[0] - r,
		y0: w.centre[1] - r,
		x1: w.centre[0] + r,
		y1: w.centre[1] + r
	})) {
		if (o === w || dot(o.u, w.u) < 0.99) continue;
		if (o.size < w.size * 0.7 || o.size > w.size * 1.4) continue;
		const [s] = inWordFrame(w, o.origin);
		const across = Math.abs(dot(sub(o.origin, w.origin), w.up));
		if (across > 0.35 * w.size) continue;
		const gap = s >= 0 ? s - w.length : -(s + o.length);
		if (gap > reach * w.size || gap < -0.5 * w.size) continue;
		out.push({ word: o, gap });
	}
	return out.sort((a, b) => a.gap - b.gap);
}

/** A prefix printed as its own word ("FW 12"): the two read together. */
function joinWords(a: Word, b: Word, text: string): Word {
	const end = add(b.origin, mul(b.u, b.length));
	const length = dot(sub(end, a.origin), a.u);
	return {
		text,
		origin: a.origin,
		u: a.u,
		up: a.up,
		size: a.size,
		length,
		centre: wordCentre(a.origin, a.u, a.up, length, a.size),
		font: a.font
	};
}

function candidatesOf(page: Page): Candidate[] {
	const out: Candidate[] = [];
	const used = new Set<Word>();
	const prefixCores = [page.rule.shopPrefix, page.rule.fieldPrefix]
		.map((p) => p.toUpperCase().replace(/[^A-Z0-9]/g, ''))
		.filter((p) => p.length > 0);
	for (const w of page.words) {
		if (used.has(w)) continue;
		const bare = w.text.toUpperCase().replace(/[^A-Z0-9]/g, '');
		if (prefixCores.includes(bare) && /^[A-Z0-9]+[-_]?$/i.test(w.text)) {
			const next = lineNeighbours(page, w, 0.9).find(
				({ word, gap }) => gap >= -0.1 * w.size && dot(sub(word.origin, w.origin), w.u) > 0
			);
			if (next) {
				const read = readWeldLabel(`${w.text} ${next.word.text}`, page.rule);
				if (read) {
					used.add(w).add(next.word);
					out.push({
						word: joinWords(w, next.word, `${w.text} ${next.word.text}`),
						parts: [w, next.word],
						number: read.number,
						location: read.location,
						prefixed: true
					});
					continue;
				}
			}
		}
		const read = readWeldLabel(w.text, page.rule);
		if (!read) continue;
		const core = read.number.toUpperCase().replace(/[^A-Z0-9]/g, '');
		const prefixed = prefixCores.some((p) => p.length >= 2 && core.startsWith(p));
		out.push({ word: w, parts: [w], number: read.number, location: read.location, prefixed });
	}
	return out;
}

// Surroundings ---------------------------------------------------------------------------------

interface Bubble {
	outline: Outline;
	/** Other words inside the same outline. */
	others: Word[];
}

function enclosingOutline(page: Page, c: Candidate): Bubble | null {
	const w = c.word;
	let best: Outline | null = null;
	for (const o of page.shapes.outlineGrid.query({
		x0: w.centre[0],
		y0: w.centre[1],
		x1: w.centre[0],
		y1: w.centre[1]
	})) {
		if (o.dark || !o.stroked) continue;
		const b = o.box;
		if (w.centre[0] < b.x0 || w.centre[0] > b.x1 || w.centre[1] < b.y0 || w.centre[1] > b.y1)
			continue;
		if (best && o.area >= best.area) continue;
		// Only an outline that fits the number snugly is its bubble.
		let minU = Infinity;
		let maxU = -Infinity;
		let minV = Infinity;
		let maxV = -Infinity;
		for (let i = 0; i < o.pts.length; i += 2) {
			const [s, t] = inWordFrame(w, [o.pts[i], o.pts[i + 1]]);
			minU = Math.min(minU, s);
			maxU = Math.max(maxU, s);
			minV = Math.min(minV, t);
			maxV = Math.max(maxV, t);
		}
		if (maxU - minU > w.length + 6.5 * w.size || maxV - minV > 5 * w.size) continue;
		if (!outlineContainsWord(o, w)) continue;
		best = o;
	}
	if (!best) return null;
	const others = page.wordGrid
		.query(best.box)
		.filter((o) => !c.parts.includes(o) && polygonContains(best.pts, o.centre));
	return { outline: best, others };
}

function coversHorizontally(page: Page, y: number, x: number, tol = 0.8): boolean {
	return page.shapes.rules
		.query({ x0: x - 1, y0: y - tol, x1: x + 1, y1: y + tol })
		.some(
			(l) =>
				Math.abs(l.u[1]) < 0.001 &&
				Math.abs(l.a[1] - y) <= tol &&
				Math.min(l.a[0], l.b[0]) <= x &&
				Math.max(l.a[0], l.b[0]) >= x
		);
}

function coversVertically(page: Page, x: number, y: number, tol = 0.8): boolean {
	return page.shapes.rules
		.query({ x0: x - tol, y0: y - 1, x1: x + tol, y1: y + 1 })
		.some(
			(l) =>
				Math.abs(l.u[0]) < 0.001 &&
				Math.abs(l.a[0] - x) <= tol &&
				Math.min(l.a[1], l.b[1]) <= y &&
				Math.max(l.a[1], l.b[1]) >= y
		);
}

/** The nearest rule beyond a box edge in one direction, covering the box's middle. */
function nearestRule(
	page: Page,
	box: Box,
	side: 'up' | 'down' | 'left' | 'right',
	reach: number
): number | null {
	const cx = (box.x0 + box.x1) / 2;
	const cy = (box.y0 + box.y1) / 2;
	// Strictly outside the box, so a bubble's own straight edges are not taken for rules.
	const search: Box =
		side === 'up'
			? { x0: cx - 1, y0: box.y1 + 0.3, x1: cx + 1, y1: box.y1 + reach }
			: side === 'down'
				? { x0: cx - 1, y0: box.y0 - reach, x1: cx + 1, y1: box.y0 - 0.3 }
				: side === 'left'
					? { x0: box.x0 - reach, y0: cy - 1, x1: box.x0 - 0.3, y1: cy + 1 }
					: { x0: box.x1 + 0.3, y0: cy - 1, x1: box.x1 + reach, y1: cy + 1 };
	let best: number | null = null;
	for (const l of page.shapes.rules.query(search)) {
		const horizontal = Math.abs(l.u[1]) < 0.001;
		if (horizontal !== (side === 'up' || side === 'down')) continue;
		if (horizontal) {
			const y = l.a[1];
			if (Math.min(l.a[0], l.b[0]) > cx || Math.max(l.a[0], l.b[0]) < cx) continue;
			if (y < search.y0 || y > search.y1) continue;
			const d = Math.abs(y - cy);
			if (best === null || d < Math.abs(best - cy)) best = y;
		} else {
			const x = l.a[0];
			if (Math.min(l.a[1], l.b[1]) > cy || Math.max(l.a[1], l.b[1]) < cy) continue;
			if (x < search.x0 || x > search.x1) continue;
			const d = Math.abs(x - cx);
			if (best === null || d < Math.abs(best - cx)) best = x;
		}
	}
	return best;
}

type Ruled = 'table' | 'column' | 'box' | null;

/**
 * How rules sit around a box: a table cell (ruled on four sides, with a rule running on into
 * a neighbouring cell), a column (long rules left and right only), a lone box, or nothing.
 */
function ruledAround(page: Page, box: Box, size: number, own: Word[]): Ruled {
	const up = nearestRule(page, box, 'up', 2.4 * size);
	const down = nearestRule(page, box, 'down', 2.4 * size);
	const left = nearestRule(page, box, 'left', 18 * size);
	const right = nearestRule(page, box, 'right', 18 * size);
	if (left !== null && right !== null) {
		const closed =
			up !== null &&
			down !== null &&
			[left + 1, (left + right) / 2, right - 1].every(
				(x) => coversHorizontally(page, up, x) && coversHorizontally(page, down, x)
			) &&
			[down + 1, (down + up) / 2, up - 1].every(
				(y) => coversVertically(page, left, y) && coversVertically(page, right, y)
			);
		if (closed) {
			const step = 2.5;
			const runsOn =
				coversHorizontally(page, up, left - step) ||
				coversHorizontally(page, up, right + step) ||
				coversHorizontally(page, down, left - step) ||
				coversHorizontally(page, down, right + step) ||
				coversVertically(page, left, up + step) ||
				coversVertically(page, left, down - step) ||
				coversVertically(page, right, up + step) ||
				coversVertically(page, right, down - step);
			// A table has words in the cells beside or above and below; members of a steel
			// drawing make ruled boxes too, but empty ones.
			// Table rows are about two text heights: a taller box is a part of the drawing.
			const tight = up - down <= 3.2 * size;
			const filled =
				runsOn && tight && neighbourCellsHoldText(page, { left, right, down, up }, size, own);
			return filled ? 'table' : 'box';
		}
		const tall = 2.5 * size;
		const cy = (box.y0 + box.y1) / 2;
		if (
			coversVertically(page, left, cy + tall) &&
			coversVertically(page, left, cy - tall) &&
			coversVertically(page, right, cy + tall) &&
			coversVertically(page, right, cy - tall)
		)
			return 'column';
	}
	return null;
}

/** Words in the same row (left or right of the cell) or column (above or below it). */
function neighbourCellsHoldText(
	page: Page,
	cell: { left: number; right: number; down: number; up: number },
	size: number,
	own: Word[]
): boolean {
	const across = 40 * size;
	const along = 8 * size;
	for (const o of page.wordGrid.query({
		x0: cell.left - across,
		y0: cell.down - along,
		x1: cell.right + across,
		y1: cell.up + along
	})) {
		if (own.includes(o)) continue;
		const [x, y] = o.centre;
		const inRow = y > cell.down && y < cell.up && (x < cell.left || x > cell.right);
		const inColumn = x > cell.left && x < cell.right && (y < cell.down || y > cell.up);
		if (inRow || inColumn) return true;
	}
	return false;
}

/** An alike word one row above (`sign` 1) or below (-1): same size and turn, aligned, 1–3 sizes away. */
function rowNeighbour(page: Page, w: Word, sign: 1 | -1, step?: number): Word | null {
	const reach = 3 * w.size;
	let best: Word | null = null;
	let bestRise = Infinity;
	for (const o of page.wordGrid.query({
		x0: w.centre[0] - reach,
		y0: w.centre[1] - reach,
		x1: w.centre[0] + reach,
		y1: w.centre[1] + reach
	})) {
		if (o === w || dot(o.u, w.u) < 0.999) continue;
		if (Math.abs(o.size - w.size) > 0.12 * w.size) continue;
		const d = sub(o.centre, w.centre);
		const rise = sign * dot(d, w.up);
		const centred = Math.abs(dot(d, w.u)) < 0.6 * w.size;
		const leftAligned = Math.abs(dot(sub(o.origin, w.origin), w.u)) < 0.3 * w.size;
		if (!centred && !leftAligned) continue;
		if (rise < 1.05 * w.size || rise > 2.9 * w.size) continue;
		if (step !== undefined && Math.abs(rise - step) > 0.15 * step) continue;
		if (rise < bestRise) {
			best = o;
			bestRise = rise;
		}
	}
	return best;
}

/**
 * How many alike words stand with it in a column at an even step (a table's or a list's
 * column): 0 alone, 1 with one neighbour, 2 or more in a column of three or more.
 */
function stackedWith(page: Page, w: Word): number {
	let count = 0;
	for (const sign of [1, -1] as const) {
		let at = w;
		let step: number | undefined;
		for (let n = 0; n < 4; n++) {
			const next = rowNeighbour(page, at, sign, step);
			if (!next) break;
			step ??= Math.abs(dot(sub(next.centre, at.centre), w.up));
			count++;
			at = next;
		}
	}
	return count;
}

/**
 * Whether a dimension line ends at `end` (heading outwards along `d`): an arrowhead or dot,
 * an oblique tick, or an extension line crossing it near one of its own ends. A pipe ending
 * in a flange (a stroke across it at its middle) or running on into a bend does not.
 */
function terminated(page: Page, end: Pt, d: Pt, size: number): boolean {
	const reach = 1.2 * size;
	const near: Box = {
		x0: end[0] - reach,
		y0: end[1] - reach,
		x1: end[0] + reach,
		y1: end[1] + reach
	};
	// Arrowheads: small dark triangles (a dark dot there is more likely a weld on a pipe).
	for (const o of page.shapes.outlineGrid.query(near)) {
		if (!o.dark || o.kind !== 'triangle') continue;
		if (o.box.x1 - o.box.x0 > 2 * size || o.box.y1 - o.box.y0 > 2 * size) continue;
		if (dist(o.centre, end) <= reach) return true;
	}
	for (const m of page.shapes.lineGrid.query(near)) {
		const turn = Math.abs(cross(m.u, d));
		if (turn < 0.3 || pointSegmentDistance(end, m.a, m.b) > 0.8) continue;
		const da = dist(end, m.a);
		const db = dist(end, m.b);
		if (m.length <= 3 * size && turn < 0.95) return true;
		if (turn > 0.9 && m.length >= 1.5 * size && Math.min(da, db) <= 0.5 * Math.max(da, db))
			return true;
	}
	return false;
}

/**
 * A dimension line beside the number (ending in arrowheads, ticks or extension lines at both
 * ends), or one broken to make room for it.
 */
function besideDimension(page: Page, w: Word): 'beside' | 'broken' | null {
	const grow = 2.6 * w.size;
	const box = wordBox(w, grow);
	const h = w.size * DIGIT_HEIGHT;
	let before = false;
	let after = false;
	for (const l of page.shapes.lineGrid.query(box)) {
		if (Math.abs(cross(l.u, w.u)) > 0.03) continue;
		const [ua, va] = inWordFrame(w, l.a);
		const [ub] = inWordFrame(w, l.b);
		const lo = Math.min(ua, ub);
		const hi = Math.max(ua, ub);
		const beside =
			(va < -0.06 * w.size && va > -1.7 * w.size) ||
			(va > h + 0.06 * w.size && va < h + 1.7 * w.size);
		if (beside && lo < -0.2 * w.size && hi > w.length + 0.2 * w.size) {
			const [first, last] = ua <= ub ? [l.a, l.b] : [l.b, l.a];
			const along: Pt = ua <= ub ? l.u : mul(l.u, -1);
			if (terminated(page, first, mul(along, -1), w.size) && terminated(page, last, along, w.size))
				return 'beside';
			continue;
		}
		const through = va > -0.15 * w.size && va < h + 0.15 * w.size;
		if (!through) continue;
		if (hi <= 0.15 * w.size && hi > -2.5 * w.size && lo < hi - 1.5 * w.size) before = true;
		if (lo >= w.length - 0.15 * w.size && lo < w.length + 2.5 * w.size && hi > lo + 1.5 * w.size)
			after = true;
	}
	return before && after ? 'broken' : null;
}

function darkDotNear(page: Page, p: Pt, reach: number, maxSize: number): Outline | null {
	let best: Outline | null = null;
	let bestD = Infinity;
	for (const o of page.shapes.outlineGrid.query({
		x0: p[0] - reach,
		y0: p[1] - reach,
		x1: p[0] + reach,
		y1: p[1] + reach
	})) {
		if (!o.dark || o.kind !== 'round') continue;
		if (o.box.x1 - o.box.x0 > maxSize || o.box.y1 - o.box.y0 > maxSize) continue;
		const d = dist(o.centre, p);
		if (d <= reach && d < bestD) {
			best = o;
			bestD = d;
		}
	}
	return best;
}

/** A small dark shape with corners (a flag, an arrowhead) touching a point. */
function pennantAt(page: Page, p: Pt, size: number): boolean {
	const reach = 1.5;
	return page.shapes.outlineGrid
		.query({ x0: p[0] - reach, y0: p[1] - reach, x1: p[0] + reach, y1: p[1] + reach })
		.some(
			(o) =>
				o.dark &&
				o.kind !== 'round' &&
				Math.max(o.box.x1 - o.box.x0, o.box.y1 - o.box.y0) > 0.4 * size &&
				o.box.x1 - o.box.x0 < 2 * size &&
				o.box.y1 - o.box.y0 < 2 * size &&
				(polygonContains(o.pts, p) || polygonOutlineDistance(o.pts, p) <= reach)
		);
}

interface Leader {
	/** Where the leader ends, away from the label. */
	end: Pt;
	/** It ends at a weld dot or on a line (the pipe). */
	anchored: boolean;
}

/**
 * A leader leaving the label: a line with one end on the label's edge (`edgeDistance`) and
 * the other well away from it, followed through any bend to where it ends.
 */
function leaderFrom(
	page: Page,
	w: Word,
	searchBox: Box,
	edgeDistance: (p: Pt) => number,
	inside: (p: Pt) => boolean
): Leader | null {
	const touch = 0.4 * w.size + 1.2;
	let best: Leader | null = null;
	for (const l of page.shapes.lineGrid.query(searchBox)) {
		if (l.length < 0.8 * w.size) continue;
		const da = edgeDistance(l.a);
		const db = edgeDistance(l.b);
		const [near, far, dNear] = da <= db ? [l.a, l.b, da] : [l.b, l.a, db];
		if (dNear > touch || inside(far) || edgeDistance(far) < 0.8 * w.size) continue;
		// It leaves the label: heading away from its middle, not running along its edge.
		const out = sub(far, near);
		const from = sub(near, w.centre);
		if (dot(out, from) < 0.2 * Math.hypot(...out) * Math.hypot(...from)) continue;
		// A flag or an arrowhead at the label's end makes it a field-weld flag's pole or an
		// arrow pointing at the label's neighbourhood, not this label's leader.
		if (pennantAt(page, near, w.size)) continue;
		// A line through the number (a pipe under the text) is not its leader.
		if (pointSegmentDistance(w.centre, l.a, l.b) < 0.3 * w.size) continue;
		// A leader stops a little short of its weld: how short grows with the print size.
		const slack = Math.max(2.6, 0.4 * w.size);
		const anchorAt = (end: Pt, chain: Set<Line>): Leader | null => {
			const weldDot = darkDotNear(
				page,
				end,
				Math.max(3.5, 0.55 * w.size),
				Math.max(8, 1.2 * w.size)
			);
			if (weldDot) return { end: weldDot.centre, anchored: true };
			const onLine = page.shapes.lineGrid
				.query({ x0: end[0] - slack, y0: end[1] - slack, x1: end[0] + slack, y1: end[1] + slack })
				.some((m) => !chain.has(m) && pointSegmentDistance(end, m.a, m.b) < slack);
			return onLine ? { end, anchored: true } : null;
		};
		const chain = new Set<Line>([l]);
		let leader = anchorAt(far, chain);
		if (!leader) {
			// One bend, as leaders with a shoulder have.
			const bend = page.shapes.lineGrid
				.query({ x0: far[0] - 0.6, y0: far[1] - 0.6, x1: far[0] + 0.6, y1: far[1] + 0.6 })
				.find((m) => m !== l && (dist(m.a, far) < 0.6 || dist(m.b, far) < 0.6));
			if (bend) {
				chain.add(bend);
				const end = dist(bend.a, far) < 0.6 ? bend.b : bend.a;
				leader = anchorAt(end, chain) ?? { end, anchored: false };
			} else leader = { end: far, anchored: false };
		}
		if (!best || (leader.anchored && !best.anchored)) best = leader;
	}
	return best;
}

/**
 * A sample bubble in a key or legend: words explaining it run on from the bubble along its
 * line ("(7) WELD NUMBER"), where a weld's bubble stands on its own.
 */
function captioned(page: Page, w: Word, outline: Outline): boolean {
	const reach = 3 * w.size;
	for (const o of page.wordGrid.query({
		x0: outline.box.x0 - reach,
		y0: outline.box.y0 - reach,
		x1: outline.box.x1 + reach,
		y1: outline.box.y1 + reach
	})) {
		if (o === w || dot(o.u, w.u) < 0.99 || polygonContains(outline.pts, o.centre)) continue;
		const across = Math.abs(dot(sub(o.centre, w.centre), w.up));
		if (across > 0.45 * Math.max(w.size, o.size)) continue;
		const gap = polygonOutlineDistance(
			outline.pts,
			add(o.origin, mul(o.u, dot(sub(w.centre, o.origin), o.u) > 0 ? o.length : 0))
		);
		if (gap > reach) continue;
		if (readWeldLabel(o.text, page.rule) || !/[A-Za-z]{2}/.test(o.text)) continue;
		// The explanation is one of a list of them, one under another.
		const listed = [1, -1].some((sign) => {
			const row = rowNeighbour(page, o, sign as 1 | -1);
			return row !== null && /[A-Za-z]{2}/.test(row.text);
		});
		if (listed) return true;
	}
	return false;
}

/** A weld tick beside the label: a short stroke across a longer line (the pipe). */
function tickNear(page: Page, w: Word, box: Box): Pt | null {
	const reach = 1.5 * w.size;
	const area: Box = {
		x0: box.x0 - reach,
		y0: box.y0 - reach,
		x1: box.x1 + reach,
		y1: box.y1 + reach
	};
	for (const t of page.shapes.lineGrid.query(area)) {
		if (t.length < 0.6 * w.size || t.length > 2.6 * w.size) continue;
		const mid: Pt = [(t.a[0] + t.b[0]) / 2, (t.a[1] + t.b[1]) / 2];
		if (mid[0] < area.x0 || mid[0] > area.x1 || mid[1] < area.y0 || mid[1] > area.y1) continue;
		const pipe = page.shapes.lineGrid
			.query({ x0: mid[0] - 1, y0: mid[1] - 1, x1: mid[0] + 1, y1: mid[1] + 1 })
			.find(
				(m) =>
					m !== t &&
					m.length > 3 * t.length &&
					Math.abs(cross(m.u, t.u)) > 0.7 &&
					pointSegmentDistance(mid, m.a, m.b) < 1
			);
		if (pipe) return mid;
	}
	return null;
}

/** Why a candidate was not taken, for tracing the finder on a sheet. */
export type Rejection =
	| 'running text'
	| 'revision triangle'
	| 'shared outline'
	| 'table'
	| 'column'
	| 'dimension'
	| 'key'
	| 'no evidence'
	| 'repeated';

/**
 * A bubble holding the number and other words: read together top to bottom they may be one
 * weld number (a prefix set over the digits, "FW" above "12"); anything else shares it.
 */
function readTogether(page: Page, c: Candidate, others: Word[]): Candidate | null {
	const w = c.word;
	const ordered = [...others, w].sort((a, b) => {
		const rise = dot(sub(b.centre, a.centre), w.up);
		if (Math.abs(rise) > 0.5 * w.size) return rise;
		return dot(sub(a.centre, b.centre), w.u);
	});
	const read = readWeldLabel(ordered.map((o) => o.text).join(' '), page.rule);
	if (!read || read.number === c.number) return null;
	return { ...c, parts: ordered, number: read.number, location: read.location, prefixed: true };
}

function judge(page: Page, candidate: Candidate, trace?: Trace): PageLabel | null {
	let c = candidate;
	const w = c.word;
	const reject = (why: Rejection) => {
		trace?.(c.number, w.centre, why);
		return null;
	};
	const bubble = enclosingOutline(page, c);
	if (bubble) {
		if (bubble.outline.kind === 'triangle') return reject('revision triangle');
		if (bubble.others.length > 0) {
			const together = readTogether(page, c, bubble.others);
			if (!together) return reject('shared outline');
			c = together;
		}
		if (captioned(page, w, bubble.outline)) return reject('key');
	} else {
		// Running text: a word beside it on its line that is not itself a weld number.
		const beside = lineNeighbours(page, w, 2.2).filter(({ word }) => !c.parts.includes(word));
		if (beside.some(({ word }) => !readWeldLabel(word.text, page.rule)))
			return reject('running text');
	}
	const region = bubble ? bubble.outline.box : wordBox(w, 0.1 * w.size);
	const ruled = ruledAround(page, region, w.size, c.parts);
	if (ruled === 'table') return reject('table');
	const stacked = stackedWith(page, w);
	// The same figure just above or below: the two sides of a weld symbol, never a weld number
	// (a weld number is printed once).
	for (const sign of [1, -1] as const) {
		const row = rowNeighbour(page, w, sign);
		if (row && row.text.trim().toUpperCase() === w.text.trim().toUpperCase())
			return reject('repeated');
	}
	const dimension = bubble ? null : besideDimension(page, w);
	if (dimension === 'broken') return reject('dimension');

	const evidence: Evidence[] = [];
	let score = 0;
	let target: Pt | null = null;
	if (bubble && (bubble.outline.kind !== 'rect' || ruled !== 'box' || true)) {
		evidence.push('bubble');
		score += 3;
	}
	const corners = wordCorners(w, 0.12 * w.size);
	const boxPts = corners.flatMap((p) => p);
	const outlinePts = bubble ? bubble.outline.pts : boxPts;
	const searchBox = bubble ? bubble.outline.box : { ...wordBox(w, 0.12 * w.size) };
	const grown: Box = {
		x0: searchBox.x0 - w.size,
		y0: searchBox.y0 - w.size,
		x1: searchBox.x1 + w.size,
		y1: searchBox.y1 + w.size
	};
	const leader = leaderFrom(
		page,
		w,
		grown,
		(p) => (polygonContains(outlinePts, p) ? 0 : polygonOutlineDistance(outlinePts, p)),
		(p) => polygonContains(outlinePts, p)
	);
	if (leader && (leader.anchored || bubble)) {
		evidence.push('leader');
		score += leader.anchored ? 3 : 1;
		target = leader.end;
	}
	// A weld dot just off the label's edge (measured edge to edge).
	const reach = (bubble ? 0.6 : 1.1) * w.size + 3;
	const maxDot = Math.max(8, 1.2 * w.size);
	let weldDot: Outline | null = null;
	let weldDotGap = Infinity;
	for (const o of page.shapes.outlineGrid.query({
		x0: searchBox.x0 - reach - maxDot,
		y0: searchBox.y0 - reach - maxDot,
		x1: searchBox.x1 + reach + maxDot,
		y1: searchBox.y1 + reach + maxDot
	})) {
		if (!o.dark || o.kind !== 'round') continue;
		const r = Math.max(o.box.x1 - o.box.x0, o.box.y1 - o.box.y0) / 2;
		if (2 * r > maxDot || polygonContains(outlinePts, o.centre)) continue;
		const gap = polygonOutlineDistance(outlinePts, o.centre) - r;
		if (gap < reach && gap < weldDotGap) {
			weldDot = o;
			weldDotGap = gap;
		}
	}
	if (weldDot) {
		evidence.push('dot');
		score += 2;
		target ??= weldDot.centre;
	}
	if (!bubble && !leader) {
		const tick = tickNear(page, w, searchBox);
		if (tick) {
			evidence.push('tick');
			score += 2;
			target ??= tick;
		}
	}
	if (c.prefixed) {
		evidence.push('prefix');
		score += 2;
	}
	if (evidence.length === 0) return reject('no evidence');
	// A weld dot, a tick or a leader to the pipe outweighs a line beside it or a neighbour above.
	const pointsAtWeld =
		(leader?.anchored ?? false) || evidence.includes('dot') || evidence.includes('tick');
	// A column of alike figures is a table's, unless each points at its own weld (welds
	// evenly spaced along a member are labelled in a column too).
	if (!pointsAtWeld && (stacked >= 2 || (stacked >= 1 && ruled === 'column')))
		return reject('column');
	// Beside a dimension line only a leader to the weld tells a label from the dimension's figure.
	if (dimension === 'beside' && !leader?.anchored) return reject('dimension');

	if (evidence.length === 1 && evidence[0] === 'prefix' && ruled) return reject('table');
	return {
		number: c.number,
		location: c.location,
		x: w.centre[0],
		y: w.centre[1],
		target: target ? { x: target[0], y: target[1] } : null,
		evidence,
		score
	};
}

export type Trace = (number: string, at: Pt, why: Rejection) => void;

/** How strongly a kind of evidence says "weld label": a bubble most, a prefix alone least. */
function rank(label: PageLabel): number {
	if (label.evidence.includes('bubble')) return 3;
	if (label.evidence.includes('leader')) return 2;
	if (label.evidence.includes('dot') || label.evidence.includes('tick')) return 1;
	return 0;
}

/**
 * One label where a number was found more than once: the only one of the strongest kind, or
 * of two equally strong the better scored. Three or more equally strong give none: item tags
 * and weld-symbol sizes repeat, weld numbers never do.
 */
function bestOf(list: PageLabel[]): PageLabel | null {
	if (list.length === 1) return list[0];
	const top = Math.max(...list.map(rank));
	const strongest = list.filter((l) => rank(l) === top);
	if (strongest.length === 1) return strongest[0];
	if (strongest.length >= 3) return null;
	return strongest.reduce((a, b) => (b.score > a.score ? b : a));
}

/**
 * The weld labels of one page, one per number (the best-placed where a number repeats).
 * `trace` hears of every candidate that was turned down, and why.
 */
export function findPageLabels(
	geometry: SheetGeometry,
	rule: WeldLabelRule,
	trace?: Trace
): PageLabel[] {
	const steps = labelsOf(geometry, rule, trace);
	for (;;) {
		const step = steps.next();
		if (step.done) return step.value;
	}
}

/**
 * The same, handing the event loop back whenever `budgetMs` of work has gone by, so a dense
 * sheet never keeps the server from answering.
 */
export async function findPageLabelsPaced(
	geometry: SheetGeometry,
	rule: WeldLabelRule,
	budgetMs = 8
): Promise<PageLabel[]> {
	const steps = labelsOf(geometry, rule);
	let since = performance.now();
	for (;;) {
		const step = steps.next();
		if (step.done) return step.value;
		if (performance.now() - since > budgetMs) {
			await new Promise<void>((resolve) => setImmediate(resolve));
			since = performance.now();
		}
	}
}

/** The work of findPageLabels, in steps: it pauses after each part and each candidate. */
function* labelsOf(
	geometry: SheetGeometry,
	rule: WeldLabelRule,
	trace?: Trace
): Generator<void, PageLabel[]> {
	const words = wordsOf(geometry.texts);
	yield;
	const wordGrid = new Grid<Word>(24);
	for (const w of words) wordGrid.insert(w, wordBox(w));
	const shapes = pageShapes(geometry.shapes, geometry.segments);
	yield;
	const page: Page = { words, wordGrid, shapes, rule };
	const found = new Map<string, PageLabel[]>();
	for (const c of candidatesOf(page)) {
		const label = judge(page, c, trace);
		yield;
		if (!label) continue;
		const key = label.number.toUpperCase();
		const list = found.get(key);
		if (list) list.push(label);
		else found.set(key, [label]);
	}
	const labels: PageLabel[] = [];
	for (const list of found.values()) {
		const best = bestOf(list);
		if (best) labels.push(best);
		else for (const l of list) trace?.(l.number, [l.x, l.y], 'repeated');
	}
	return labels;
}
