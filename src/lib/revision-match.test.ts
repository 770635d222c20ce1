import { describe, expect, it } from 'vitest';
import { matchRevision, toleranceFor, type NewPage } from './revision-match';

const ansiB: NewPage = { pageIndex: 0, width: 1224, height: 792, textLayer: true };
const pin = (number: string, x: number, y: number, pageIndex = 0) => ({ number, pageIndex, x, y });

describe('how far a label may shift and still be in place', () => {
	// Product rule: 36 pt (half an inch) or 1.5 % of the sheet's short side, whichever is larger.
	it('is 36 pt on A3 and A1 sheets and grows with a larger sheet', () => {
		expect(toleranceFor({ width: 1191, height: 842 })).toBe(36);
		expect(toleranceFor({ width: 2384, height: 1684 })).toBe(36);
		expect(toleranceFor({ width: 7000, height: 5000 })).toBeCloseTo(75);
	});
});

describe('matching pins to a new revision', () => {
	it('follows each label: in place, moved, or gone', () => {
		const pins = [pin('1', 100, 100), pin('2', 300, 300), pin('3', 500, 500)];
		const oldLabels = [pin('1', 110, 120), pin('2', 310, 320), pin('3', 510, 520)];
		const newLabels = [pin('1', 112, 118), pin('2', 610, 120), pin('4', 700, 700)];
		const result = matchRevision({ pins, oldLabels, newLabels, newPages: [ansiB] });
		expect(result.fates.map((f) => f.status)).toEqual(['carried', 'moved', 'flagged']);
		// The moved pin keeps its place relative to its label.
		expect(result.fates[1]).toMatchObject({ x: 600, y: 100, reason: 'label moved' });
		expect(result.fates[2]).toMatchObject({ x: 500, y: 500, reason: 'label missing' });
		expect(result.counts).toEqual({ carried: 1, moved: 1, flagged: 1 });
		expect(result.newNumbers.map((n) => n.number)).toEqual(['4']);
	});

	it('reads numbers whatever their case and hands back the pin it was given', () => {
		const pins = [{ ...pin('FW-3', 100, 100), pinId: 41 }];
		const result = matchRevision({
			pins,
			oldLabels: [pin('fw-3', 90, 90)],
			newLabels: [pin('FW-3', 90, 92)],
			newPages: [ansiB]
		});
		expect(result.fates[0].status).toBe('carried');
		expect(result.fates[0].pin.pinId).toBe(41);
		expect(result.newNumbers).toEqual([]);
	});

	it('takes the nearest where a number is printed twice', () => {
		const result = matchRevision({
			pins: [pin('7', 100, 100)],
			oldLabels: [pin('7', 100, 120)],
			newLabels: [pin('7', 900, 500), pin('7', 105, 118)],
			newPages: [ansiB]
		});
		expect(result.fates[0].status).toBe('carried');
	});

	it('moves a pin to the sheet its number went to', () => {
		const result = matchRevision({
			pins: [pin('12', 100, 100)],
			oldLabels: [pin('12', 100, 115)],
			newLabels: [{ ...pin('12', 400, 415, 1), target: { x: 400, y: 400 } }],
			newPages: [ansiB, { ...ansiB, pageIndex: 1 }]
		});
		expect(result.fates[0]).toMatchObject({ status: 'moved', pageIndex: 1, x: 400, y: 400 });
	});

	it('without old labels, compares the pin with where the new label points', () => {
		const newLabels = [
			{ ...pin('1', 120, 130), target: { x: 101, y: 99 } },
			{ ...pin('2', 520, 530), target: { x: 500, y: 500 } }
		];
		const result = matchRevision({
			pins: [pin('1', 100, 100), pin('2', 300, 300)],
			newLabels,
			newPages: [ansiB]
		});
		expect(result.fates[0].status).toBe('carried');
		expect(result.fates[1]).toMatchObject({ status: 'moved', x: 500, y: 500 });
	});

	it('on a sheet without text, trusts the image comparison and flags what it cannot compare', () => {
		const scan: NewPage = { ...ansiB, textLayer: false };
		const pins = [pin('1', 100, 100), pin('2', 300, 300), pin('3', 500, 500)];
		const result = matchRevision({
			pins,
			newLabels: [],
			newPages: [scan],
			raster: ['unchanged', 'changed', 'unknown']
		});
		expect(result.fates.map((f) => [f.status, f.reason])).toEqual([
			['carried', 'image unchanged'],
			['flagged', 'image changed'],
			['flagged', 'nothing to compare']
		]);
	});

	it('flags a pin whose sheet is gone from the new revision', () => {
		const result = matchRevision({
			pins: [pin('5', 100, 100, 2)],
			newLabels: [],
			newPages: [ansiB]
		});
		expect(result.fates[0]).toMatchObject({ status: 'flagged', pageIndex: 2 });
	});
});
