import type { SheetBox } from '$lib/components/viewer/types';

/**
 * A PDF user-space point in sheet units: the page as shown (its /Rotate applied), origin at
 * the top-left, y down, one unit a point. Where the viewer centres on a pin or a cluster.
 */
export function sheetPoint(box: SheetBox, x: number, y: number): [number, number] {
	const [u, v] = [x - box.x0, box.y1 - y];
	const w = box.x1 - box.x0;
	const h = box.y1 - box.y0;
	if (box.rotation === 90) return [h - v, u];
	if (box.rotation === 180) return [w - u, h - v];
	if (box.rotation === 270) return [v, w - u];
	return [u, v];
}
