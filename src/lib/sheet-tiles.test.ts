import { describe, expect, it } from 'vitest';
import { isReady, levelFor, tilesIn, type SheetTiles } from './sheet-tiles';

/** An A1 sheet (2383.94 × 1683.78 pt) as the renderer cuts it: long sides 512 … 4096 px. */
function a1(): SheetTiles {
	const width = 2383.94;
	const height = 1683.78;
	const levels = [512, 1024, 2048, 4096].map((side) => {
		const scale = side / width;
		const w = Math.ceil(width * scale - 1e-6);
		const h = Math.ceil(height * scale - 1e-6);
		return { scale, width: w, height: h, cols: Math.ceil(w / 512), rows: Math.ceil(h / 512) };
	});
	return {
		pageIndex: 0,
		status: 'done',
		raster: false,
		format: 'webp',
		tileSize: 512,
		width,
		height,
		levels,
		tiles: levels.reduce((n, l) => n + l.cols * l.rows, 0),
		bytes: 1,
		renderMs: 1,
		error: null,
		version: 1,
		url: '/api/revisions/7/tiles/0',
		extension: 'webp'
	};
}

describe('sheet tiles', () => {
	it('picks the coarsest level that is fine enough, and the finest when none is', () => {
		const { levels } = a1();
		// A tablet's 1024 px frame at 2× fits the A1 sheet at about 0.42 CSS px per point.
		expect(levelFor(levels, 0.42 * 2)).toBe(2);
		expect(levelFor(levels, 0.42)).toBe(1);
		expect(levelFor(levels, 0.1)).toBe(0);
		expect(levelFor(levels, 16 * 2)).toBe(3);
		// 4 % short of a level still takes it.
		expect(levelFor(levels, levels[2].scale * 1.04)).toBe(2);
		expect(levelFor(levels, levels[2].scale * 1.2)).toBe(3);
	});

	it('covers the whole sheet with every tile of a level, edge tiles cut short', () => {
		const sheet = a1();
		const all = tilesIn(sheet, 2);
		expect(all).toHaveLength(sheet.levels[2].cols * sheet.levels[2].rows);
		const right = Math.max(...all.map((t) => t.x + t.width));
		const bottom = Math.max(...all.map((t) => t.y + t.height));
		// The level is whole pixels, so it ends within a pixel past the sheet.
		expect(right).toBeGreaterThanOrEqual(sheet.width!);
		expect(right - sheet.width!).toBeLessThan(1 / sheet.levels[2].scale);
		expect(bottom - sheet.height!).toBeLessThan(1 / sheet.levels[2].scale);
		expect(all[0].url).toBe('/api/revisions/7/tiles/0/2/0_0.webp');
		expect(new Set(all.map((t) => t.key)).size).toBe(all.length);
	});

	it('lists only the tiles over a part of the sheet', () => {
		const sheet = a1();
		const perTile = 512 / sheet.levels[3].scale;
		const some = tilesIn(sheet, 3, {
			x: perTile * 2.5,
			y: perTile * 1.2,
			width: perTile,
			height: perTile * 0.5
		});
		expect(some.map((t) => [t.col, t.row])).toEqual([
			[2, 1],
			[3, 1]
		]);
		expect(some[0].x).toBeCloseTo(perTile * 2, 9);
		expect(tilesIn(sheet, 3, { x: -500, y: -500, width: 10, height: 10 })).toEqual([]);
		expect(tilesIn(sheet, 9)).toEqual([]);
	});

	it('is ready only when done with levels', () => {
		expect(isReady(a1())).toBe(true);
		expect(isReady({ ...a1(), status: 'rendering' })).toBe(false);
		expect(isReady({ ...a1(), levels: [] })).toBe(false);
		expect(isReady(undefined)).toBe(false);
	});
});
