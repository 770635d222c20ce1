/**
 * The second signal for sheets without text: the images of two revisions compared around each
 * pin. `compareAroundPins(oldBytes, newBytes, pins)` renders both revisions' pages (in the
 * sheet reader's worker) and says, per pin in order, whether the drawing around it is
 * `unchanged`, `changed`, or `unknown` (the page is missing from one of them), for
 * matchRevision in src/lib/revision-match.ts.
 */
import type { RasterOutcome, SheetPoint } from '$lib/revision-match';
import { hasChanged, inkChange } from './crop-diff';
import { renderSheetCrops } from './reader';

export interface RasterOptions {
	/** Half the side of the square compared around each pin, points. */
	halfSide?: number;
	/** Pixels per point the pages are rendered at. */
	pxPerPt?: number;
}

export async function compareAroundPins(
	oldBytes: Uint8Array,
	newBytes: Uint8Array,
	pins: readonly SheetPoint[],
	{ halfSide = 20, pxPerPt = 2 }: RasterOptions = {}
): Promise<RasterOutcome[]> {
	const outcomes: RasterOutcome[] = pins.map(() => 'unknown');
	const pages = [...new Set(pins.map((p) => p.pageIndex))].sort((a, b) => a - b);
	for (const pageIndex of pages) {
		const on = pins.flatMap((p, i) => (p.pageIndex === pageIndex ? [i] : []));
		const boxes = on.map((i) => [
			pins[i].x - halfSide,
			pins[i].y - halfSide,
			pins[i].x + halfSide,
			pins[i].y + halfSide
		]);
		const before = await renderSheetCrops(oldBytes, pageIndex, boxes, pxPerPt);
		const after = await renderSheetCrops(newBytes, pageIndex, boxes, pxPerPt);
		if (!before || !after) continue;
		on.forEach((pinIndex, k) => {
			outcomes[pinIndex] = hasChanged(inkChange(before[k], after[k])) ? 'changed' : 'unchanged';
		});
	}
	return outcomes;
}
