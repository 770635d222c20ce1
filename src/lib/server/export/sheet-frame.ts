/**
 * The frame a sheet is read in. pdf-lib draws in unrotated user space, while a person reads
 * the sheet after its /Rotate; stamps, the footer and the superseded mark are laid out in the
 * shown frame (origin at the bottom-left of the page as displayed, y up, in points) and turned
 * into user space here, so they land upright on rotated pages and on boxes that do not start
 * at zero. Pure, so the tests use the same arithmetic.
 */
export type SheetRotation = 0 | 90 | 180 | 270;

export interface SheetBox {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	/** Clockwise, as /Rotate means it. */
	rotation: SheetRotation;
}

export function normaliseRotation(angle: number): SheetRotation {
	const turned = (((Math.round(angle / 90) * 90) % 360) + 360) % 360;
	return turned as SheetRotation;
}

/** Width and height of the sheet as it is shown. */
export function shownSize(box: SheetBox): { width: number; height: number } {
	const w = box.x1 - box.x0;
	const h = box.y1 - box.y0;
	return box.rotation === 90 || box.rotation === 270
		? { width: h, height: w }
		: { width: w, height: h };
}

/** A point of the shown frame in user space. */
export function shownToUser(box: SheetBox, u: number, v: number): { x: number; y: number } {
	switch (box.rotation) {
		case 90:
			return { x: box.x1 - v, y: box.y0 + u };
		case 180:
			return { x: box.x1 - u, y: box.y1 - v };
		case 270:
			return { x: box.x0 + v, y: box.y1 - u };
		default:
			return { x: box.x0 + u, y: box.y0 + v };
	}
}

/** A user-space point in the shown frame (the inverse of shownToUser). */
export function userToShown(box: SheetBox, x: number, y: number): { u: number; v: number } {
	switch (box.rotation) {
		case 90:
			return { u: y - box.y0, v: box.x1 - x };
		case 180:
			return { u: box.x1 - x, v: box.y1 - y };
		case 270:
			return { u: box.y1 - y, v: x - box.x0 };
		default:
			return { u: x - box.x0, v: y - box.y0 };
	}
}

/**
 * A displacement of the shown frame in user space: the shown frame is user space turned
 * counter-clockwise by the page's rotation, which is also the `rotate` pdf-lib is given.
 */
export function turn(rotation: SheetRotation, du: number, dv: number): { x: number; y: number } {
	const a = (rotation * Math.PI) / 180;
	const cos = Math.round(Math.cos(a));
	const sin = Math.round(Math.sin(a));
	return { x: du * cos - dv * sin, y: du * sin + dv * cos };
}

/**
 * How a pin is stamped: the state's glyph centred on the pin's PDF point, and the weld number
 * centred above it with its baseline `labelBaseline` points above the pin in the shown frame.
 * Printed at the sheet's size the glyph is about 6 mm across and the number 2.5 mm tall.
 */
export const STAMP = {
	glyphScale: 0.8,
	labelSize: 7,
	labelBaseline: 10.6,
	footerHeight: 16
} as const;
