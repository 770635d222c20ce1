import { describe, expect, it } from 'vitest';
import { outsideDiameterMm } from './pipe-sizes';

describe('outside diameter of nominal pipe sizes', () => {
	// ASME B36.10M, Table 1: NPS 6 = 6.625 in = 168.3 mm; NPS 2 = 2.375 in = 60.3 mm;
	// NPS 1/2 = 0.840 in = 21.3 mm; from NPS 14 up the OD equals the nominal size.
	it.each([
		['6', 168.3],
		['NPS 6', 168.3],
		['6"', 168.3],
		['DN150', 168.3],
		['2', 60.3],
		['DN 50', 60.3],
		['1/2', 21.3],
		['1-1/2 in', 48.3],
		['1 1/2"', 48.3],
		['14', 355.6],
		['24', 609.6]
	])('%s → %f mm', (size, mm) => {
		expect(outsideDiameterMm(size)).toBe(mm);
	});

	it('knows no size outside the table', () => {
		expect(outsideDiameterMm('7')).toBeNull();
		expect(outsideDiameterMm('DN 90')).toBeNull();
		expect(outsideDiameterMm('W14x90')).toBeNull();
	});
});
