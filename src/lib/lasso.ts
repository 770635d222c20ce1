/**
 * A lasso drawn on the sheet: which points it encloses. Pure (the weld map's "select
 * suggestions" mode), points in any one plane.
 */
export type LassoPoint = readonly [number, number];

/** Is the point inside the closed outline (even-odd rule)? Fewer than three corners: never. */
export function insideLasso(outline: readonly LassoPoint[], [x, y]: LassoPoint): boolean {
	if (outline.length < 3) return false;
	let inside = false;
	for (let i = 0, k = outline.length - 1; i < outline.length; k = i++) {
		const [xi, yi] = outline[i];
		const [xk, yk] = outline[k];
		if (yi > y !== yk > y && x < ((xk - xi) * (y - yi)) / (yk - yi) + xi) inside = !inside;
	}
	return inside;
}
