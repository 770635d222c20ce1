import type { Clearance } from './clearance';
import { add, mul, pt, sub, unit, type Pen, type Pt } from './pen';

/** An AWS A2.4-style welding symbol: reference line, arrow, weld symbol, tail. */
export interface WeldSymbolSpec {
	joint: Pt;
	type: 'fillet' | 'bevel';
	sides: 'arrow' | 'other' | 'both';
	/** Leg size as written on the symbol, without the unit (the notes carry it). */
	size: string;
	allAround: boolean;
	field: boolean;
	tail?: string;
}

export function referenceLength(t: number): number {
	return 46 * t;
}

export function symbolExtent(pen: Pen, spec: WeldSymbolSpec, t: number): number {
	return referenceLength(t) + (spec.tail ? 8 * t + pen.textWidth(spec.tail, 5.6 * t) : 6 * t);
}

/** Draws the symbol with its arrow end of the reference line at `start`, the line running along `dir`. */
export function drawWeldSymbol(
	pen: Pen,
	clearance: Clearance,
	spec: WeldSymbolSpec,
	start: Pt,
	dir: 1 | -1,
	t: number
): void {
	const refL = referenceLength(t);
	const end = pt(start.x + dir * refL, start.y);
	const w = 0.6 * t;
	pen.line(start, end, { width: w });
	const toJoint = unit(sub(spec.joint, start));
	const tip = sub(spec.joint, mul(toJoint, 4 * t));
	pen.line(start, tip, { width: w });
	pen.arrowHead(tip, toJoint, 6 * t, 1.8 * t);

	const h = 6 * t;
	const cx = Math.min(start.x, end.x) + refL * 0.45;
	const y = start.y;
	const sideSigns = spec.sides === 'both' ? [-1, 1] : spec.sides === 'arrow' ? [-1] : [1];
	const size = 6 * t;
	for (const s of sideSigns) {
		if (spec.type === 'fillet')
			pen.polygon([pt(cx, y), pt(cx, y + s * h), pt(cx + h, y)], { stroke: 0, width: w, fill: 1 });
		else {
			pen.line(pt(cx, y), pt(cx, y + s * h), { width: w });
			pen.line(pt(cx, y), pt(cx + h * 0.75, y + s * h), { width: w });
		}
		if (spec.size)
			pen.text(spec.size, pt(cx - 2.5 * t, y + (s < 0 ? -h * 0.9 : h * 0.15)), {
				size,
				align: 'right'
			});
	}
	if (spec.allAround) pen.circle(start, 3 * t, { stroke: 0, width: w });
	if (spec.field) {
		const top = pt(start.x, start.y + 10 * t);
		pen.line(start, top, { width: w });
		pen.polygon([top, pt(start.x + dir * 6.5 * t, start.y + 8 * t), pt(start.x, start.y + 6 * t)], {
			fill: 0
		});
		clearance.segment(start, top, 4 * t);
	}
	const tailA = add(end, pt(dir * 5 * t, 4 * t));
	const tailB = add(end, pt(dir * 5 * t, -4 * t));
	if (spec.tail) {
		pen.line(end, tailA, { width: w });
		pen.line(end, tailB, { width: w });
		const tw = pen.textWidth(spec.tail, 5.6 * t);
		const tx = end.x + dir * 7 * t;
		pen.text(spec.tail, pt(tx, y), {
			size: 5.6 * t,
			align: dir > 0 ? 'left' : 'right',
			valign: 'middle'
		});
		clearance.segment(pt(tx, y), pt(tx + dir * tw, y), 3.5 * t);
	}
	clearance.segment(start, end, h + 1.5 * t);
	clearance.segment(start, tip, 1.5 * t);
}
