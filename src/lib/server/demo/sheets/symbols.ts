import type { Clearance } from './clearance';
import {
	add,
	angleOf,
	fromAngle,
	len,
	mul,
	perp,
	pt,
	readableAngle,
	sub,
	unit,
	type Pen,
	type Pt
} from './pen';

/**
 * Weld bubbles keep one size on every paper: the numbers must stay close to their dot so a
 * tap on the dot and the printed number always agree, whatever the sheet size.
 */
export const BUBBLE = { distance: 13, radius: 5.5, text: 6.5, dot: 2.5 };

export function drawWeldDot(
	pen: Pen,
	clearance: Clearance,
	p: Pt,
	field: boolean,
	flagSide: Pt | null
): void {
	pen.circle(p, BUBBLE.dot, { fill: 0 });
	clearance.circle(p, BUBBLE.dot + 1);
	if (!field) return;
	const up = unit(flagSide ?? pt(0, 1));
	const side = perp(up);
	const foot = add(p, mul(up, BUBBLE.dot));
	const top = add(p, mul(up, 11));
	pen.line(foot, top, { width: 0.7 });
	pen.polygon(
		[
			top,
			add(top, mul(side, 6)),
			add(sub(top, mul(up, 2.2)), mul(side, 3)),
			sub(top, mul(up, 4.4))
		],
		{ fill: 0 }
	);
	clearance.segment(foot, top, 1);
	clearance.circle(add(sub(top, mul(up, 2.2)), mul(side, 3)), 3.5);
}

function bubbleOutline(pen: Pen, c: Pt, halfW: number, r: number): Pt[] {
	if (halfW <= 0) return pen.arcPoints(c, r, 0, 360);
	return [
		...pen.arcPoints(pt(c.x + halfW, c.y), r, -90, 90),
		...pen.arcPoints(pt(c.x - halfW, c.y), r, 90, 270)
	];
}

/**
 * Puts a weld number in a bubble beside its dot, on the freest side; perpendicular to the pipe
 * is preferred so the number never hides the line it belongs to.
 */
export function placeWeldBubble(
	pen: Pen,
	clearance: Clearance,
	dot: Pt,
	along: Pt | null,
	label: string,
	avoid: Pt | null = null
): Pt {
	const textW = pen.textWidth(label, BUBBLE.text);
	const halfW = Math.max(0, textW / 2 + 1.6 - BUBBLE.radius);
	const base = along ? angleOf(perp(along)) : 90;
	const offsets = [0, 180, 25, -25, 155, 205, 50, -50, 130, 230, 75, -75, 105, 255, 90, 270];
	let best = { score: -Infinity, centre: add(dot, fromAngle(base, BUBBLE.distance)) };
	for (const [i, off] of offsets.entries()) {
		const dir = fromAngle(base + off);
		const centre = add(dot, mul(dir, BUBBLE.distance + halfW * Math.abs(dir.x)));
		// The number's own origin must stay within reach of the dot, or a wide label reads as another joint's.
		const origin = pt(centre.x - textW / 2, centre.y - BUBBLE.text * 0.36);
		if (len(sub(origin, dot)) > BUBBLE.distance + 5.5) continue;
		const reach = BUBBLE.radius + halfW * Math.abs(dir.x) + 1.2;
		let score = clearance.around(centre, reach) - i * 0.15;
		if (halfW > 0)
			score = Math.min(
				score,
				clearance.alongSegment(
					pt(centre.x - halfW, centre.y),
					pt(centre.x + halfW, centre.y),
					BUBBLE.radius + 1.2
				)
			);
		if (avoid) score -= Math.max(0, 8 - len(sub(centre, add(dot, mul(unit(avoid), 8)))));
		if (score > best.score) best = { score, centre };
		if (score >= 2.5) break;
	}
	const c = best.centre;
	const toDot = unit(sub(dot, c));
	const edge = halfW > 0 ? BUBBLE.radius + halfW * Math.abs(toDot.x) : BUBBLE.radius;
	const from = add(c, mul(toDot, edge));
	const to = sub(dot, mul(toDot, BUBBLE.dot + 0.6));
	if (len(sub(to, from)) > 0.8) pen.line(from, to, { width: 0.5 });
	pen.polygon(bubbleOutline(pen, c, halfW, BUBBLE.radius), { fill: 1, stroke: 0, width: 0.6 });
	pen.text(label, c, { size: BUBBLE.text, align: 'center', valign: 'middle' });
	clearance.circle(c, BUBBLE.radius + 0.5);
	if (halfW > 0) clearance.segment(pt(c.x - halfW, c.y), pt(c.x + halfW, c.y), BUBBLE.radius + 0.5);
	clearance.segment(from, to, 0.5);
	return c;
}

/** Which way a field-weld flag should fly: away from the bubble. */
export function awayFrom(dot: Pt, bubble: Pt, along: Pt | null): Pt {
	const away = unit(sub(dot, bubble));
	if (!along) return away;
	const n = perp(unit(along));
	return n.x * away.x + n.y * away.y >= 0 ? n : mul(n, -1);
}

export interface DimensionStyle {
	t: number;
	gray?: number;
}

/** A dimension between a and b, with extension lines along `offsetDir`, text on a knocked-out gap. */
export function drawDimension(
	pen: Pen,
	clearance: Clearance,
	a: Pt,
	b: Pt,
	offsetDir: Pt,
	offset: number,
	text: string,
	style: DimensionStyle
): void {
	const t = style.t;
	const gray = style.gray ?? 0.15;
	const o = unit(offsetDir);
	const a1 = add(a, mul(o, offset));
	const b1 = add(b, mul(o, offset));
	const gap = 3 * t;
	pen.line(add(a, mul(o, gap)), add(a, mul(o, offset + 4 * t)), { width: 0.35 * t, gray });
	pen.line(add(b, mul(o, gap)), add(b, mul(o, offset + 4 * t)), { width: 0.35 * t, gray });
	const along = unit(sub(b1, a1));
	pen.line(a1, b1, { width: 0.4 * t, gray });
	pen.arrowHead(a1, mul(along, -1), 5 * t, 1.4 * t, gray);
	pen.arrowHead(b1, along, 5 * t, 1.4 * t, gray);
	const size = 6 * t;
	const angle = readableAngle(angleOf(along));
	const w = pen.textWidth(text, size);
	const mid = mul(add(a1, b1), 0.5);
	const dir = fromAngle(angle);
	const up = perp(dir);
	const textCentre = add(mid, mul(up, size * 0.75));
	const halfW = w / 2 + 1.5 * t;
	const halfH = size * 0.55;
	pen.polygon(
		[
			add(add(textCentre, mul(dir, -halfW)), mul(up, -halfH)),
			add(add(textCentre, mul(dir, halfW)), mul(up, -halfH)),
			add(add(textCentre, mul(dir, halfW)), mul(up, halfH)),
			add(add(textCentre, mul(dir, -halfW)), mul(up, halfH))
		],
		{ fill: 1 }
	);
	pen.text(text, textCentre, { size, align: 'center', valign: 'middle', angle, gray: 0 });
	clearance.segment(a1, b1, 1.5 * t, 'line');
	clearance.segment(add(a, mul(o, gap)), a1, 0.5, 'line');
	clearance.segment(add(b, mul(o, gap)), b1, 0.5, 'line');
	clearance.segment(add(textCentre, mul(dir, -halfW)), add(textCentre, mul(dir, halfW)), halfH);
}

export function dimensionClearance(
	clearance: Clearance,
	pen: Pen,
	a: Pt,
	b: Pt,
	offsetDir: Pt,
	offset: number,
	text: string,
	t: number
): number {
	const o = unit(offsetDir);
	const a1 = add(a, mul(o, offset));
	const b1 = add(b, mul(o, offset));
	const along = unit(sub(b1, a1));
	const angle = readableAngle(angleOf(along));
	const dir = fromAngle(angle);
	const size = 6 * t;
	const w = pen.textWidth(text, size);
	const mid = add(mul(add(a1, b1), 0.5), mul(perp(dir), size * 0.75));
	const line = clearance.alongSegment(
		add(a1, mul(along, 4)),
		sub(b1, mul(along, 4)),
		1.5 * t,
		'dimension'
	);
	const label = clearance.alongSegment(
		add(mid, mul(dir, -w / 2)),
		add(mid, mul(dir, w / 2)),
		size * 0.6
	);
	const extA = clearance.alongSegment(add(a, mul(o, 8 * t)), a1, 0.3, 'extension');
	const extB = clearance.alongSegment(add(b, mul(o, 8 * t)), b1, 0.3, 'extension');
	return Math.min(line, label, extA, extB);
}

export function drawNorthArrow(pen: Pen, centre: Pt, north: Pt, t: number): void {
	const r = 18 * t;
	pen.circle(centre, r, { stroke: 0, width: 0.7 * t });
	const n = unit(north);
	const tip = add(centre, mul(n, r * 1.45));
	const tail = sub(centre, mul(n, r * 0.8));
	const side = perp(n);
	pen.polygon([tip, add(centre, mul(side, 5 * t)), tail, sub(centre, mul(side, 5 * t))], {
		stroke: 0,
		width: 0.7 * t,
		fill: 1
	});
	pen.polygon([tip, add(centre, mul(side, 5 * t)), tail], { fill: 0 });
	pen.text('N', add(tip, mul(n, 7 * t)), {
		size: 9 * t,
		bold: true,
		align: 'center',
		valign: 'middle'
	});
	pen.text('PLANT NORTH', pt(centre.x, centre.y - r - 9 * t), { size: 5.2 * t, align: 'center' });
}
