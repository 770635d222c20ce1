import { describe, expect, it } from 'vitest';
import { circumferenceMm, formatRate, repairRate } from './repair-rate';
import { outsideDiameterMm } from '../pipe-sizes';

describe('repair rate on a joint and a length basis', () => {
	it('measures a weld by its circumference at the outside diameter (NPS 6: 6.625 in OD, ASME B36.10M Table 1)', () => {
		const od = outsideDiameterMm('6')!;
		expect(od).toBeCloseTo(168.3, 1);
		expect(circumferenceMm(od)).toBeCloseTo(528.7, 1);
	});

	it('counts rejected welds over welds examined, and rejected length over length examined', () => {
		const six = outsideDiameterMm('6')!;
		const two = outsideDiameterMm('2')!;
		const rate = repairRate([
			{ diameterMm: six, rejected: true, indicationLengthsMm: [25, 15] },
			{ diameterMm: six, rejected: false, indicationLengthsMm: [] },
			{ diameterMm: two, rejected: true, indicationLengthsMm: [] },
			{ diameterMm: two, rejected: false, indicationLengthsMm: [] },
			{ diameterMm: null, rejected: false, indicationLengthsMm: [] }
		]);
		expect(rate).toMatchObject({ examined: 5, rejected: 2, unsized: 1 });
		expect(rate.jointRate).toBeCloseTo(0.4);
		const examined = 2 * circumferenceMm(six) + 2 * circumferenceMm(two);
		// The 6 in weld counts its 40 mm of indications; the 2 in weld, with none recorded, its
		// whole circumference.
		const rejected = 40 + circumferenceMm(two);
		expect(rate.examinedMm).toBeCloseTo(examined, 6);
		expect(rate.rejectedMm).toBeCloseTo(rejected, 6);
		expect(rate.lengthRate).toBeCloseTo(rejected / examined, 9);
		// The length basis reads smaller than the joint basis here, as the trade expects of it
		// (trade practice §4: contractors prefer it because it gives smaller numbers).
		expect(rate.lengthRate!).toBeLessThan(rate.jointRate!);
	});

	it('says nothing before anything is examined', () => {
		const none = repairRate([]);
		expect(none.jointRate).toBeNull();
		expect(none.lengthRate).toBeNull();
		expect(formatRate(none.jointRate)).toBe('–');
		expect(formatRate(0.0325)).toBe('3.3 %');
	});
});
