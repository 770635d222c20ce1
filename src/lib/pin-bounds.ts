/**
 * Where a pin may stand: on its sheet, in PDF user-space points, inside the page's view box
 * with a small margin (a weld drawn at the sheet's edge is still tapped just outside it).
 * Pure: the server refuses a point with it, and the viewer could keep a drag inside it.
 */
import type { Refusal } from './domain';

/** Half an inch: room for a pin on a weld drawn at the very edge of the sheet. */
export const PIN_MARGIN_PT = 36;

export interface PageBox {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
}

/** Why this point is not on the sheet, naming `x` or `y`, or null when it is. */
export function pinPointRefusal(box: PageBox, point: { x: number; y: number }): Refusal | null {
	for (const [axis, low, high] of [
		['x', Math.min(box.x0, box.x1), Math.max(box.x0, box.x1)],
		['y', Math.min(box.y0, box.y1), Math.max(box.y0, box.y1)]
	] as const) {
		const value = point[axis];
		if (!Number.isFinite(value) || value < low - PIN_MARGIN_PT || value > high + PIN_MARGIN_PT) {
			return {
				status: 400,
				field: axis,
				message: `The pin's ${axis} (${value}) is off the sheet: it runs from ${low} to ${high} points.`
			};
		}
	}
	return null;
}
