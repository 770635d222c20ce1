/**
 * A sheet's tile pyramid as the server stores it and the viewer reads it, and the arithmetic
 * of showing it: which level suits a zoom, and which tiles cover a part of the sheet. Sheet
 * units are CSS pixels of the page at scale 1 (PDF points, rotation applied); a level of
 * `scale` has `scale` image pixels per sheet unit, cut into square tiles from the top left.
 */

export const TILE_STATUSES = ['queued', 'rendering', 'done', 'failed'] as const;
export type TileStatus = (typeof TILE_STATUSES)[number];
export type TileFormat = 'webp' | 'png' | 'jpeg';

export interface TileLevel {
	scale: number;
	width: number;
	height: number;
	cols: number;
	rows: number;
}

/** One sheet's pyramid, as `GET /api/revisions/{id}/tiles` lists it. */
export interface SheetTiles {
	pageIndex: number;
	status: TileStatus;
	/** A scan: shown from its tiles alone, never decoded whole in the browser. */
	raster: boolean;
	format: TileFormat | null;
	tileSize: number;
	/** The sheet in sheet units, as the tiles were drawn. */
	width: number | null;
	height: number | null;
	/** Coarsest first. Empty until the sheet is done. */
	levels: TileLevel[];
	tiles: number;
	bytes: number;
	renderMs: number | null;
	error: string | null;
	/** Changes whenever the sheet is rendered again. */
	version: number | null;
	/** Tiles are at `{url}/{level}/{col}_{row}.{extension}`. */
	url: string;
	extension: string | null;
}

/** A revision whose sheets are being prepared (or failed to be), with how far it is. */
export interface PreparingRevision {
	revisionId: number;
	drawingId: number;
	number: string;
	label: string;
	total: number;
	done: number;
	failed: number;
}

/** `GET /api/projects/{id}/tiles`: "Preparing sheets 3/12". */
export interface TileProgress {
	preparing: PreparingRevision[];
	/** Current revisions where a sheet could not be prepared (it opens with pdf.js). */
	failed: PreparingRevision[];
	/** Sheets finished (or failed) and in all, over the revisions being prepared. */
	done: number;
	total: number;
}

export interface SheetRect {
	x: number;
	y: number;
	width: number;
	height: number;
}

export interface PlacedTile {
	/** Unique within the sheet, for keyed lists. */
	key: string;
	level: number;
	col: number;
	row: number;
	url: string;
	/** Where the tile goes, in sheet units. */
	x: number;
	y: number;
	width: number;
	height: number;
}

/** A sheet whose tiles can be shown. */
export function isReady(sheet: SheetTiles | undefined): sheet is SheetTiles {
	return !!sheet && sheet.status === 'done' && sheet.levels.length > 0 && !!sheet.extension;
}

/**
 * The coarsest level with at least `pixelsPerUnit` image pixels per sheet unit (screen
 * pixels per sheet unit × device pixel ratio), or the finest there is. A level a few percent
 * short still counts: the difference does not show, and the next one costs four times the
 * tiles.
 */
export function levelFor(levels: TileLevel[], pixelsPerUnit: number): number {
	const index = levels.findIndex((level) => level.scale >= pixelsPerUnit * 0.92);
	return index === -1 ? levels.length - 1 : index;
}

export function tileUrl(sheet: SheetTiles, level: number, col: number, row: number): string {
	return `${sheet.url}/${level}/${col}_${row}.${sheet.extension}`;
}

/** The tiles of a level that cover a part of the sheet (the whole sheet if none is given). */
export function tilesIn(sheet: SheetTiles, level: number, area?: SheetRect): PlacedTile[] {
	const shape = sheet.levels[level];
	if (!shape) return [];
	const size = sheet.tileSize;
	const perTile = size / shape.scale;
	const firstCol = area ? Math.max(0, Math.floor(area.x / perTile)) : 0;
	const firstRow = area ? Math.max(0, Math.floor(area.y / perTile)) : 0;
	const lastCol = area
		? Math.min(shape.cols - 1, Math.ceil((area.x + area.width) / perTile) - 1)
		: shape.cols - 1;
	const lastRow = area
		? Math.min(shape.rows - 1, Math.ceil((area.y + area.height) / perTile) - 1)
		: shape.rows - 1;
	const placed: PlacedTile[] = [];
	for (let row = firstRow; row <= lastRow; row++) {
		for (let col = firstCol; col <= lastCol; col++) {
			const px = col * size;
			const py = row * size;
			placed.push({
				key: `${level}/${col}_${row}`,
				level,
				col,
				row,
				url: tileUrl(sheet, level, col, row),
				x: px / shape.scale,
				y: py / shape.scale,
				width: Math.min(size, shape.width - px) / shape.scale,
				height: Math.min(size, shape.height - py) / shape.scale
			});
		}
	}
	return placed;
}
