import {
	LineCapStyle,
	LineJoinStyle,
	appendBezierCurve,
	closePath,
	degrees,
	fill,
	fillAndStroke,
	grayscale,
	lineTo,
	moveTo,
	popGraphicsState,
	pushGraphicsState,
	setDashPattern,
	setFillingGrayscaleColor,
	setLineCap,
	setLineJoin,
	setLineWidth,
	setStrokingGrayscaleColor,
	stroke,
	type PDFFont,
	type PDFOperator,
	type PDFPage
} from 'pdf-lib';

/** A point in sheet space: landscape, origin bottom-left, in points, before any page rotation. */
export interface Pt {
	x: number;
	y: number;
}

export const pt = (x: number, y: number): Pt => ({ x, y });
export const add = (a: Pt, b: Pt): Pt => ({ x: a.x + b.x, y: a.y + b.y });
export const sub = (a: Pt, b: Pt): Pt => ({ x: a.x - b.x, y: a.y - b.y });
export const mul = (a: Pt, k: number): Pt => ({ x: a.x * k, y: a.y * k });
export const dot = (a: Pt, b: Pt): number => a.x * b.x + a.y * b.y;
export const len = (a: Pt): number => Math.hypot(a.x, a.y);
export const dist = (a: Pt, b: Pt): number => Math.hypot(a.x - b.x, a.y - b.y);
export const lerp = (a: Pt, b: Pt, t: number): Pt => ({
	x: a.x + (b.x - a.x) * t,
	y: a.y + (b.y - a.y) * t
});
export const perp = (a: Pt): Pt => ({ x: -a.y, y: a.x });
export const unit = (a: Pt): Pt => {
	const l = len(a);
	return l === 0 ? { x: 1, y: 0 } : { x: a.x / l, y: a.y / l };
};
export const fromAngle = (deg: number, r = 1): Pt => ({
	x: Math.cos((deg * Math.PI) / 180) * r,
	y: Math.sin((deg * Math.PI) / 180) * r
});
export const angleOf = (a: Pt): number => (Math.atan2(a.y, a.x) * 180) / Math.PI;

/** Text set along a direction reads left to right or bottom to top, never upside down. */
export function readableAngle(deg: number): number {
	let a = ((deg % 360) + 360) % 360;
	if (a > 90.5 && a <= 270.5) a -= 180;
	if (a > 270.5) a -= 360;
	return a;
}

export function distToSegment(p: Pt, a: Pt, b: Pt): number {
	const ab = sub(b, a);
	const l2 = dot(ab, ab);
	const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, dot(sub(p, a), ab) / l2));
	return dist(p, add(a, mul(ab, t)));
}

function segmentsCross(a: Pt, b: Pt, c: Pt, d: Pt): boolean {
	const cross = (o: Pt, p: Pt, q: Pt) => (p.x - o.x) * (q.y - o.y) - (p.y - o.y) * (q.x - o.x);
	const d1 = cross(c, d, a);
	const d2 = cross(c, d, b);
	const d3 = cross(a, b, c);
	const d4 = cross(a, b, d);
	return d1 * d2 < 0 && d3 * d4 < 0;
}

export function segmentDistance(a: Pt, b: Pt, c: Pt, d: Pt): number {
	if (segmentsCross(a, b, c, d)) return 0;
	return Math.min(
		distToSegment(a, c, d),
		distToSegment(b, c, d),
		distToSegment(c, a, b),
		distToSegment(d, a, b)
	);
}

export interface StrokeStyle {
	width?: number;
	gray?: number;
	dash?: number[];
	cap?: 'butt' | 'round' | 'square';
}

export interface ShapeStyle {
	/** Fill grey level (0 black, 1 white); omit for no fill. */
	fill?: number;
	/** Stroke grey level; omit for no outline. */
	stroke?: number;
	width?: number;
	dash?: number[];
}

export interface TextStyle {
	size: number;
	bold?: boolean;
	align?: 'left' | 'center' | 'right';
	valign?: 'baseline' | 'middle' | 'top';
	angle?: number;
	gray?: number;
}

const KAPPA = 0.5522847498;
const CAP_HEIGHT = 0.718;

const FALLBACKS: Record<string, string> = {
	'⌀': 'DIA ',
	'≤': '<=',
	'≥': '>=',
	ł: 'l',
	Ł: 'L',
	đ: 'd',
	Đ: 'D',
	ı: 'i',
	'→': '->',
	'←': '<-'
};

/**
 * Draws in sheet space on one page. The page's own rotation is applied once by the caller
 * (a `cm` around everything), so nothing here needs to know whether the page is rotated.
 */
export class Pen {
	private readonly encodable: Set<number>;

	constructor(
		readonly page: PDFPage,
		readonly regular: PDFFont,
		readonly boldFont: PDFFont
	) {
		this.encodable = new Set(regular.getCharacterSet());
	}

	/** Party names come from outside; the standard fonts only carry WinAnsi. */
	clean(text: string): string {
		let out = '';
		for (const ch of text) {
			const code = ch.codePointAt(0) ?? 63;
			if (this.encodable.has(code)) {
				out += ch;
				continue;
			}
			const fallback = FALLBACKS[ch];
			if (fallback !== undefined) {
				out += fallback;
				continue;
			}
			const base = ch.normalize('NFD').replace(/[\u0300-\u036f]/g, '');
			out +=
				[...base].every((c) => this.encodable.has(c.codePointAt(0) ?? 63)) && base ? base : '?';
		}
		return out;
	}

	textWidth(text: string, size: number, bold = false): number {
		return (bold ? this.boldFont : this.regular).widthOfTextAtSize(this.clean(text), size);
	}

	private emit(ops: PDFOperator[]): void {
		this.page.pushOperators(pushGraphicsState(), ...ops, popGraphicsState());
	}

	private strokeState(style: StrokeStyle): PDFOperator[] {
		const cap =
			style.cap === 'round'
				? LineCapStyle.Round
				: style.cap === 'square'
					? LineCapStyle.Projecting
					: LineCapStyle.Butt;
		return [
			setLineWidth(style.width ?? 0.5),
			setStrokingGrayscaleColor(style.gray ?? 0),
			setLineCap(cap),
			setLineJoin(LineJoinStyle.Round),
			setDashPattern(style.dash ?? [], 0)
		];
	}

	line(a: Pt, b: Pt, style: StrokeStyle = {}): void {
		this.emit([...this.strokeState(style), moveTo(a.x, a.y), lineTo(b.x, b.y), stroke()]);
	}

	polyline(points: Pt[], style: StrokeStyle = {}, closed = false): void {
		if (points.length < 2) return;
		const ops = [...this.strokeState(style), moveTo(points[0].x, points[0].y)];
		for (const p of points.slice(1)) ops.push(lineTo(p.x, p.y));
		if (closed) ops.push(closePath());
		ops.push(stroke());
		this.emit(ops);
	}

	/** Quadratic curve from a through control c to b: elbows and bends. */
	curve(a: Pt, c: Pt, b: Pt, style: StrokeStyle = {}): void {
		const c1 = lerp(a, c, 2 / 3);
		const c2 = lerp(b, c, 2 / 3);
		this.emit([
			...this.strokeState(style),
			moveTo(a.x, a.y),
			appendBezierCurve(c1.x, c1.y, c2.x, c2.y, b.x, b.y),
			stroke()
		]);
	}

	private shape(path: PDFOperator[], style: ShapeStyle): void {
		const ops: PDFOperator[] = [];
		if (style.stroke !== undefined)
			ops.push(...this.strokeState({ width: style.width, gray: style.stroke, dash: style.dash }));
		if (style.fill !== undefined) ops.push(setFillingGrayscaleColor(style.fill));
		ops.push(...path);
		if (style.fill !== undefined && style.stroke !== undefined) ops.push(fillAndStroke());
		else if (style.fill !== undefined) ops.push(fill());
		else ops.push(stroke());
		this.emit(ops);
	}

	polygon(points: Pt[], style: ShapeStyle): void {
		const path = [
			moveTo(points[0].x, points[0].y),
			...points.slice(1).map((p) => lineTo(p.x, p.y)),
			closePath()
		];
		this.shape(path, style);
	}

	rect(x: number, y: number, w: number, h: number, style: ShapeStyle): void {
		this.polygon([pt(x, y), pt(x + w, y), pt(x + w, y + h), pt(x, y + h)], style);
	}

	circle(c: Pt, r: number, style: ShapeStyle): void {
		const k = r * KAPPA;
		const path = [
			moveTo(c.x + r, c.y),
			appendBezierCurve(c.x + r, c.y + k, c.x + k, c.y + r, c.x, c.y + r),
			appendBezierCurve(c.x - k, c.y + r, c.x - r, c.y + k, c.x - r, c.y),
			appendBezierCurve(c.x - r, c.y - k, c.x - k, c.y - r, c.x, c.y - r),
			appendBezierCurve(c.x + k, c.y - r, c.x + r, c.y - k, c.x + r, c.y),
			closePath()
		];
		this.shape(path, style);
	}

	/** Arc as a polyline; the arcs on these sheets are small enough that 8° steps look smooth. */
	arcPoints(c: Pt, r: number, fromDeg: number, toDeg: number): Pt[] {
		const steps = Math.max(2, Math.ceil(Math.abs(toDeg - fromDeg) / 8));
		const out: Pt[] = [];
		for (let i = 0; i <= steps; i++)
			out.push(add(c, fromAngle(fromDeg + ((toDeg - fromDeg) * i) / steps, r)));
		return out;
	}

	/** Filled arrowhead with its tip at `tip`, pointing along `dir`. */
	arrowHead(tip: Pt, dir: Pt, length = 6, halfWidth = 1.8, gray = 0): void {
		const d = unit(dir);
		const n = perp(d);
		const base = sub(tip, mul(d, length));
		this.polygon([tip, add(base, mul(n, halfWidth)), sub(base, mul(n, halfWidth))], { fill: gray });
	}

	text(value: string, at: Pt, style: TextStyle): number {
		const text = this.clean(value);
		const font = style.bold ? this.boldFont : this.regular;
		const width = font.widthOfTextAtSize(text, style.size);
		const angle = style.angle ?? 0;
		const along = fromAngle(angle);
		const up = perp(along);
		const shiftX = style.align === 'center' ? width / 2 : style.align === 'right' ? width : 0;
		const shiftY =
			style.valign === 'middle'
				? (style.size * CAP_HEIGHT) / 2
				: style.valign === 'top'
					? style.size * CAP_HEIGHT
					: 0;
		const origin = sub(sub(at, mul(along, shiftX)), mul(up, shiftY));
		this.page.drawText(text, {
			x: origin.x,
			y: origin.y,
			size: style.size,
			font,
			color: grayscale(style.gray ?? 0),
			rotate: degrees(angle)
		});
		return width;
	}
}
