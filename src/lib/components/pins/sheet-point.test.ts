import { describe, expect, it } from 'vitest';
import { sheetPoint } from './sheet-point';

// ISO 32000-1:2008 §8.3.2.3 and Table 30 (/Rotate): the page is shown turned clockwise.
describe('a PDF point on the sheet as shown', () => {
	const box = { index: 0, x0: 0, y0: 0, x1: 1224, y1: 792 };
	it('puts the bottom-left corner of an upright page at the bottom-left of the sheet', () => {
		expect(sheetPoint({ ...box, rotation: 0 }, 0, 0)).toEqual([0, 792]);
		expect(sheetPoint({ ...box, rotation: 0 }, 1224, 792)).toEqual([1224, 0]);
	});
	it('turns a page with /Rotate 90 clockwise: its bottom-left corner goes to the top-left', () => {
		expect(sheetPoint({ ...box, rotation: 90 }, 0, 0)).toEqual([0, 0]);
		expect(sheetPoint({ ...box, rotation: 90 }, 1224, 0)).toEqual([0, 1224]);
	});
	it('turns /Rotate 180 and 270 the same way', () => {
		expect(sheetPoint({ ...box, rotation: 180 }, 0, 0)).toEqual([1224, 0]);
		expect(sheetPoint({ ...box, rotation: 270 }, 0, 0)).toEqual([792, 1224]);
	});
});
