/**
 * A sheet's coordinates without pdf.js: sheet units (CSS pixels of the page at scale 1, its
 * /Rotate applied, y down) to PDF user-space points (unrotated, y up) and back, from the view
 * box and rotation stored with each page. The same transform as pdf.js's PageViewport at
 * scale 1 (checked against it in sheet-geometry.test.ts), so a viewer showing server tiles
 * puts pins exactly where the pdf.js viewer does, before pdf.js has even loaded.
 */

export interface SheetBoxLike {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: number;
}

export interface SheetGeometry {
	/** The sheet in sheet units. */
	width: number;
	height: number;
	toViewport: (x: number, y: number) => [number, number];
	toPdf: (cx: number, cy: number) => [number, number];
}

/** `userUnit`: the page's /UserUnit (points per user-space unit), 1 for nearly every PDF. */
export function sheetGeometry(box: SheetBoxLike, userUnit = 1): SheetGeometry {
	const rotation = (((box.rotation % 360) + 360) % 360) as 0 | 90 | 180 | 270;
	const centerX = (box.x0 + box.x1) / 2;
	const centerY = (box.y0 + box.y1) / 2;
	const [a, b, c, d] = {
		0: [1, 0, 0, -1],
		90: [0, 1, 1, 0],
		180: [-1, 0, 0, 1],
		270: [0, -1, -1, 0]
	}[rotation];
	const s = userUnit;
	const turned = a === 0;
	const boxWidth = (box.x1 - box.x0) * s;
	const boxHeight = (box.y1 - box.y0) * s;
	const offsetX = Math.abs(turned ? centerY - box.y0 : centerX - box.x0) * s;
	const offsetY = Math.abs(turned ? centerX - box.x0 : centerY - box.y0) * s;
	const m = [
		a * s,
		b * s,
		c * s,
		d * s,
		offsetX - a * s * centerX - c * s * centerY,
		offsetY - b * s * centerX - d * s * centerY
	];
	const det = m[0] * m[3] - m[1] * m[2];
	return {
		width: turned ? boxHeight : boxWidth,
		height: turned ? boxWidth : boxHeight,
		toViewport: (x, y) => [m[0] * x + m[2] * y + m[4], m[1] * x + m[3] * y + m[5]],
		toPdf: (cx, cy) => [
			(m[3] * (cx - m[4]) - m[2] * (cy - m[5])) / det,
			(m[0] * (cy - m[5]) - m[1] * (cx - m[4])) / det
		]
	};
}
