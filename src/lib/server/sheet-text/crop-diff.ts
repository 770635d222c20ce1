/**
 * How much the ink of two grey crops of the same place on two revisions differs, allowing for
 * a small shift between them (a scan is never placed twice to the pixel) and a pixel of
 * slack around every stroke. Pure.
 */
export interface GreyCrop {
	width: number;
	height: number;
	/** One byte per pixel, row by row, 255 white. */
	grey: Uint8Array;
}

/** Darker than this is ink. */
const INK = 150;

function inkOf(crop: GreyCrop, width: number, height: number): Uint8Array {
	const ink = new Uint8Array(width * height);
	for (let y = 0; y < height; y++)
		for (let x = 0; x < width; x++)
			ink[y * width + x] = crop.grey[y * crop.width + x] < INK ? 1 : 0;
	return ink;
}

function dilate(ink: Uint8Array, width: number, height: number): Uint8Array {
	const out = new Uint8Array(ink.length);
	for (let y = 0; y < height; y++)
		for (let x = 0; x < width; x++) {
			if (!ink[y * width + x]) continue;
			for (let dy = -1; dy <= 1; dy++)
				for (let dx = -1; dx <= 1; dx++) {
					const nx = x + dx;
					const ny = y + dy;
					if (nx >= 0 && ny >= 0 && nx < width && ny < height) out[ny * width + nx] = 1;
				}
		}
	return out;
}

export interface InkChange {
	/** Share of all ink in either crop that has no counterpart in the other, 0 to 1. */
	share: number;
	/** Pixels of ink without a counterpart. */
	pixels: number;
	/** Pixels of ink in both crops together. */
	ink: number;
}

export function inkChange(a: GreyCrop, b: GreyCrop, maxShift = 3): InkChange {
	const width = Math.min(a.width, b.width);
	const height = Math.min(a.height, b.height);
	const inkA = inkOf(a, width, height);
	const inkB = inkOf(b, width, height);
	const nearA = dilate(inkA, width, height);
	const nearB = dilate(inkB, width, height);
	let total = 0;
	for (let i = 0; i < inkA.length; i++) total += inkA[i] + inkB[i];
	if (total === 0) return { share: 0, pixels: 0, ink: 0 };
	let best = Infinity;
	for (let sy = -maxShift; sy <= maxShift; sy++)
		for (let sx = -maxShift; sx <= maxShift; sx++) {
			let lost = 0;
			for (let y = 0; y < height; y++) {
				const by = y + sy;
				for (let x = 0; x < width; x++) {
					const bx = x + sx;
					const inside = bx >= 0 && by >= 0 && bx < width && by < height;
					const j = by * width + bx;
					if (inkA[y * width + x] && !(inside && nearB[j])) lost++;
					if (inside && inkB[j] && !nearA[y * width + x]) lost++;
				}
			}
			if (lost < best) best = lost;
		}
	return { share: best / total, pixels: best, ink: total };
}

/**
 * Whether the place changed between the revisions: more than 6 % of the ink, and more than a
 * speck (at two pixels a point, 24 pixels is a stroke about 4 pt long).
 */
export function hasChanged(change: InkChange): boolean {
	return change.share > 0.06 && change.pixels > 24;
}
