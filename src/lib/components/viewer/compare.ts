/**
 * Composites two renders of the same sheet so the changes between revisions stand out.
 * The tinted overlay works on the pixels (ink that is on both sheets is taken out of each
 * tint, so it stays neutral even at anti-aliased edges); difference and flip are canvas blend
 * modes, cheap enough to follow a slider.
 */

import type { PDFPageProxy } from './pdf';
import { RenderSlot, blankCanvas, releaseCanvas, type SheetRegion } from './render';

export type CompareMode = 'tint' | 'difference' | 'flip';

/**
 * Orange for the older revision, blue for the newer: far apart for the common red–green
 * colour blindness, and both distinct from the dark grey of linework the revisions share.
 */
export const OLDER_TINT = '#d0581c';
export const NEWER_TINT = '#1d5fbf';
export const SHARED_INK = '#30363c';

export const COMPARE_MODES: { mode: CompareMode; label: string }[] = [
	{ mode: 'tint', label: 'Tinted overlay' },
	{ mode: 'difference', label: 'Difference' },
	{ mode: 'flip', label: 'Flip' }
];

function rgb(hex: string): [number, number, number] {
	const n = Number.parseInt(hex.slice(1), 16);
	return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
}

const OLDER = rgb(OLDER_TINT);
const NEWER = rgb(NEWER_TINT);
const SHARED = rgb(SHARED_INK);

function pixelsOf(canvas: HTMLCanvasElement): ImageData | null {
	return (
		canvas
			.getContext('2d', { willReadFrequently: true })
			?.getImageData(0, 0, canvas.width, canvas.height) ?? null
	);
}

/**
 * Per pixel: the ink of each revision (darkness, 0–255), the part both have in common drawn
 * in the shared grey, and what only one of them has drawn in that revision's tint.
 */
function tintByPixels(
	context: CanvasRenderingContext2D,
	older: HTMLCanvasElement,
	newer: HTMLCanvasElement
) {
	const a = pixelsOf(older);
	const b = pixelsOf(newer);
	if (!a || !b) return;
	const pa = a.data;
	const pb = b.data;
	for (let i = 0; i < pa.length; i += 4) {
		const inkA = 255 - ((77 * pa[i] + 150 * pa[i + 1] + 29 * pa[i + 2]) >> 8);
		const inkB = 255 - ((77 * pb[i] + 150 * pb[i + 1] + 29 * pb[i + 2]) >> 8);
		const shared = inkA < inkB ? inkA : inkB;
		const onlyA = inkA - shared;
		const onlyB = inkB - shared;
		for (let c = 0; c < 3; c++) {
			pa[i + c] =
				255 -
				(shared * (255 - SHARED[c]) + onlyA * (255 - OLDER[c]) + onlyB * (255 - NEWER[c])) / 255;
		}
		pa[i + 3] = 255;
	}
	context.putImageData(a, 0, 0);
}

/**
 * Draws `older` and `newer` (renders of the same sheet region, same size) onto `target`.
 * `flip` runs from 0 (older only) to 1 (newer only) and is used by the flip mode.
 */
export function compose(
	target: HTMLCanvasElement,
	older: HTMLCanvasElement,
	newer: HTMLCanvasElement,
	mode: CompareMode,
	flip: number
): void {
	if (target.width !== older.width || target.height !== older.height) {
		target.width = older.width;
		target.height = older.height;
	}
	const { width, height } = target;
	const context = target.getContext('2d');
	if (!context) return;
	context.globalCompositeOperation = 'source-over';
	context.globalAlpha = 1;
	if (mode === 'tint') {
		tintByPixels(context, older, newer);
	} else if (mode === 'difference') {
		context.drawImage(older, 0, 0, width, height);
		context.globalCompositeOperation = 'difference';
		context.drawImage(newer, 0, 0, width, height);
	} else {
		context.drawImage(older, 0, 0, width, height);
		context.globalAlpha = Math.min(1, Math.max(0, flip));
		context.drawImage(newer, 0, 0, width, height);
	}
	context.globalCompositeOperation = 'source-over';
	context.globalAlpha = 1;
}

/** The same sheet region of both revisions, rendered at the same size. */
export interface SheetPair {
	older: HTMLCanvasElement;
	newer: HTMLCanvasElement;
}

export function releasePair(pair: SheetPair | null): void {
	if (!pair) return;
	releaseCanvas(pair.older);
	releaseCanvas(pair.newer);
}

/**
 * Renders one region of both sheets; a revision without that sheet gives blank paper, so all
 * of the other one's linework shows as its own. Resolves to null when cancelled.
 */
export class SheetPairSlot {
	#older = new RenderSlot();
	#newer = new RenderSlot();

	async run(
		older: PDFPageProxy | null,
		newer: PDFPageProxy | null,
		region: SheetRegion,
		pixelRatio: number
	): Promise<SheetPair | null> {
		const draw = (page: PDFPageProxy | null, slot: RenderSlot) =>
			page ? slot.run(page, region, pixelRatio) : Promise.resolve(blankCanvas(region, pixelRatio));
		const [o, n] = await Promise.all([draw(older, this.#older), draw(newer, this.#newer)]);
		if (o && n) return { older: o, newer: n };
		if (o) releaseCanvas(o);
		if (n) releaseCanvas(n);
		return null;
	}

	cancel(): void {
		this.#older.cancel();
		this.#newer.cancel();
	}
}
