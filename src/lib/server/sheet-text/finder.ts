/**
 * Weld numbers found on a drawing's own sheets: the suggestions a revision offers before
 * anyone has placed a pin.
 *
 * `findWeldNumbers(bytes, rule)` reads every page of a PDF revision in the sheet reader's
 * worker thread (reader.ts) and returns:
 * - `items`: one `{ number, pageIndex, x, y }` per weld number found, x and y the centre of
 *   the printed number in PDF user-space points (unrotated, as pins are stored), `number` in
 *   the project's spelling of the prefix (src/lib/weld-labels.ts); plus `location` (shop or
 *   field, when the prefix tells), `target` (the weld the label points at, when a leader, dot
 *   or tick shows it: the better place for a pin) and `evidence` (why it was taken);
 * - `pages`: per page, whether it has a text layer (false for a scanned sheet or one whose
 *   text is drawn as line work: nothing can be read there) and its size and rotation;
 * - `textLayer`: whether any page has text.
 * A number found on several pages is suggested once, where it stands best. Rejects with a
 * SheetReadError (reader.ts) when the file cannot be read.
 *
 * The weld-label judgement is labels.ts; what counts as a weld number is the project's rule.
 */
import type { WeldLabelRule } from '$lib/weld-labels';
import { findPageLabelsPaced, type Evidence, type PageLabel } from './labels';
import { readSheetGeometry } from './reader';

export interface SuggestedLabel {
	number: string;
	pageIndex: number;
	x: number;
	y: number;
	location: 'shop' | 'field' | null;
	target: { x: number; y: number } | null;
	evidence: Evidence[];
}

export interface SheetPageFacts {
	pageIndex: number;
	textLayer: boolean;
	/** pdf.js's page.view, [x0, y0, x1, y1] in points. */
	view: number[];
	rotation: number;
	/** More line work than is read: labels there may be missed. */
	truncated: boolean;
}

export interface SheetSuggestions {
	textLayer: boolean;
	pages: SheetPageFacts[];
	items: SuggestedLabel[];
}

const round = (v: number) => Math.round(v * 100) / 100;

export async function findWeldNumbers(
	bytes: Uint8Array,
	rule: WeldLabelRule,
	{ onPage }: { onPage?: (done: number) => void } = {}
): Promise<SheetSuggestions> {
	const pages: SheetPageFacts[] = [];
	const best = new Map<string, PageLabel & { pageIndex: number }>();
	await readSheetGeometry(bytes, async (geometry) => {
		pages.push({
			pageIndex: geometry.pageIndex,
			textLayer: geometry.texts.length > 0,
			view: geometry.view,
			rotation: geometry.rotate,
			truncated: geometry.truncated
		});
		for (const label of await findPageLabelsPaced(geometry, rule)) {
			const key = label.number.toUpperCase();
			const held = best.get(key);
			if (!held || label.score > held.score)
				best.set(key, { ...label, pageIndex: geometry.pageIndex });
		}
		onPage?.(pages.length);
	});
	const items = [...best.values()]
		.sort((a, b) => a.pageIndex - b.pageIndex || b.y - a.y || a.x - b.x)
		.map((l) => ({
			number: l.number,
			pageIndex: l.pageIndex,
			x: round(l.x),
			y: round(l.y),
			location: l.location,
			target: l.target ? { x: round(l.target.x), y: round(l.target.y) } : null,
			evidence: l.evidence
		}));
	return { textLayer: pages.some((p) => p.textLayer), pages, items };
}
