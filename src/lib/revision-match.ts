/**
 * What becomes of each pin when a drawing gets a new revision, so that only pins whose weld
 * moved or vanished need a person's review. Pure: no server, database or DOM.
 *
 * `matchRevision(input)` takes
 * - `pins`: the old revision's pins `{ number, pageIndex, x, y }` (PDF points; any extra
 *   fields, such as a pin id, are handed back untouched);
 * - `oldLabels`: the weld numbers found on the old revision's sheets, when it had text (the
 *   finder's items); with them a pin follows its label's own displacement, exactly;
 * - `newLabels`: the weld numbers found on the new revision (`target`, where the label points,
 *   is used when there is no old label to compare with);
 * - `newPages`: per page of the new revision, its size in points and whether it has text;
 * - `raster`: for pins on pages without text, the outcome of comparing the two revisions'
 *   images around the pin (see compareAroundPins in src/lib/server/sheet-text/raster.ts).
 *
 * It gives back, per pin in order, a fate:
 * - `carried`: the number is found where it was (within the tolerance: 36 pt or 1.5 % of the
 *   sheet's short side, whichever is larger), or on a sheet without text the image around it
 *   did not change: keep the pin where it is, no review;
 * - `moved`: the number is found elsewhere (on this sheet or another): the pin goes to `x, y`
 *   on `pageIndex`, flagged for review as moved;
 * - `flagged`: the number is not on the new revision (the weld may have been deleted), or the
 *   image around it changed, or nothing could be compared: the pin stays, flagged for review.
 * plus the counts of each and `newNumbers`: labels on the new revision that no pin carries,
 * to be offered as suggestions.
 */

export interface SheetPoint {
	number: string;
	pageIndex: number;
	x: number;
	y: number;
}

export interface FoundLabel extends SheetPoint {
	target?: { x: number; y: number } | null;
}

export interface NewPage {
	pageIndex: number;
	width: number;
	height: number;
	textLayer: boolean;
}

export type RasterOutcome = 'unchanged' | 'changed' | 'unknown';

export type FateReason =
	| 'label in place'
	| 'image unchanged'
	| 'label moved'
	| 'label missing'
	| 'image changed'
	| 'nothing to compare';

export type PinFate<P extends SheetPoint> =
	| { pin: P; status: 'carried'; reason: FateReason; pageIndex: number; x: number; y: number }
	| {
			pin: P;
			status: 'moved';
			reason: FateReason;
			pageIndex: number;
			x: number;
			y: number;
			/** How far the label moved, points (across sheets: Infinity). */
			distance: number;
	  }
	| { pin: P; status: 'flagged'; reason: FateReason; pageIndex: number; x: number; y: number };

export interface RevisionMatch<P extends SheetPoint> {
	fates: PinFate<P>[];
	counts: { carried: number; moved: number; flagged: number };
	newNumbers: FoundLabel[];
}

export interface MatchInput<P extends SheetPoint> {
	pins: P[];
	oldLabels?: FoundLabel[];
	newLabels: FoundLabel[];
	newPages: NewPage[];
	/** Per pin, in the order of `pins`; only read for pins on pages without text. */
	raster?: RasterOutcome[];
	tolerance?: { points: number; shortSideShare: number };
}

export const DEFAULT_TOLERANCE = { points: 36, shortSideShare: 0.015 };

const key = (number: string) => number.trim().toUpperCase();

/** How far a label may shift on a sheet and still be "where it was". */
export function toleranceFor(
	page: { width: number; height: number } | undefined,
	tolerance = DEFAULT_TOLERANCE
): number {
	const short = page ? Math.min(page.width, page.height) : 0;
	return Math.max(tolerance.points, tolerance.shortSideShare * short);
}

function byNumber(labels: FoundLabel[]): Map<string, FoundLabel[]> {
	const map = new Map<string, FoundLabel[]>();
	for (const label of labels) {
		const k = key(label.number);
		const list = map.get(k);
		if (list) list.push(label);
		else map.set(k, [label]);
	}
	return map;
}

function nearest<T extends SheetPoint>(list: T[], to: SheetPoint): T {
	let best = list[0];
	let bestD = Infinity;
	for (const item of list) {
		const d =
			item.pageIndex === to.pageIndex
				? Math.hypot(item.x - to.x, item.y - to.y)
				: 1e9 + item.pageIndex;
		if (d < bestD) {
			best = item;
			bestD = d;
		}
	}
	return best;
}

export function matchRevision<P extends SheetPoint>(input: MatchInput<P>): RevisionMatch<P> {
	const tolerance = input.tolerance ?? DEFAULT_TOLERANCE;
	const pages = new Map(input.newPages.map((p) => [p.pageIndex, p]));
	const oldBy = byNumber(input.oldLabels ?? []);
	const newBy = byNumber(input.newLabels);
	const anyText = input.newPages.some((p) => p.textLayer);
	const fates: PinFate<P>[] = input.pins.map((pin, i) => {
		const page = pages.get(pin.pageIndex);
		const stay = { pageIndex: pin.pageIndex, x: pin.x, y: pin.y };
		if (!page?.textLayer) {
			// A sheet without text: only the images can say whether anything changed here.
			const outcome = input.raster?.[i] ?? 'unknown';
			if (outcome === 'unchanged')
				return { pin, status: 'carried', reason: 'image unchanged', ...stay };
			if (outcome === 'changed')
				return { pin, status: 'flagged', reason: 'image changed', ...stay };
			// A sheet that lost its text while others kept theirs: the number may be elsewhere.
			if (!anyText || !newBy.has(key(pin.number)))
				return { pin, status: 'flagged', reason: 'nothing to compare', ...stay };
		}
		const found = newBy.get(key(pin.number));
		if (!found) return { pin, status: 'flagged', reason: 'label missing', ...stay };
		const limit = toleranceFor(page, tolerance);
		const oldLabel = oldBy.has(key(pin.number)) ? nearest(oldBy.get(key(pin.number))!, pin) : null;
		if (oldLabel) {
			// The label's own shift, carried over to the pin.
			const label = nearest(found, oldLabel);
			const samePage = label.pageIndex === oldLabel.pageIndex;
			const dx = label.x - oldLabel.x;
			const dy = label.y - oldLabel.y;
			const distance = samePage ? Math.hypot(dx, dy) : Infinity;
			if (distance <= limit) return { pin, status: 'carried', reason: 'label in place', ...stay };
			const to = samePage
				? { x: pin.x + dx, y: pin.y + dy }
				: (label.target ?? { x: label.x, y: label.y });
			return {
				pin,
				status: 'moved',
				reason: 'label moved',
				pageIndex: label.pageIndex,
				x: to.x,
				y: to.y,
				distance
			};
		}
		// No old label to compare with: the pin against where the new label points (or the label).
		const label = nearest(
			found.map((f) => ({ ...f, x: f.target?.x ?? f.x, y: f.target?.y ?? f.y })),
			pin
		);
		const samePage = label.pageIndex === pin.pageIndex;
		const distance = samePage ? Math.hypot(label.x - pin.x, label.y - pin.y) : Infinity;
		// A label without a leader or dot stands beside its weld, not on it.
		const pointed = found.some((f) => f.target);
		const reach = limit + (pointed ? 0 : 40);
		if (distance <= reach) return { pin, status: 'carried', reason: 'label in place', ...stay };
		return {
			pin,
			status: 'moved',
			reason: 'label moved',
			pageIndex: label.pageIndex,
			x: label.x,
			y: label.y,
			distance
		};
	});
	const carriedNumbers = new Set(input.pins.map((p) => key(p.number)));
	const newNumbers = input.newLabels.filter((l) => !carriedNumbers.has(key(l.number)));
	const counts = { carried: 0, moved: 0, flagged: 0 };
	for (const f of fates) counts[f.status]++;
	return { fates, counts, newNumbers };
}
