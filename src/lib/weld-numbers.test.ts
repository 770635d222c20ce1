import { describe, expect, it } from 'vitest';
import { insertedWeldNumber, nextWeldNumber, weldNumberSortKey } from './weld-numbers';

describe('weld number order', () => {
	// Common practice: a joint added between 5 and 6 becomes 5A, 5B, so existing numbers never move.
	it('sorts inserted joints between their neighbours and numbers by value', () => {
		const numbers = ['10', '5B', '6', '5', 'FW-2', '5A', '1', 'FW-10'];
		const sorted = [...numbers].sort((a, b) =>
			weldNumberSortKey(a) < weldNumberSortKey(b) ? -1 : 1
		);
		expect(sorted).toEqual(['1', '5', '5A', '5B', '6', '10', 'FW-2', 'FW-10']);
	});

	it('continues after the highest number of the same prefix, voided ones included', () => {
		expect(nextWeldNumber(['1', '2', '7', '3A', 'FW-4'])).toBe('8');
		expect(nextWeldNumber(['1', 'FW-4', 'FW-9'], 'FW-')).toBe('FW-10');
		expect(nextWeldNumber([])).toBe('1');
	});

	// Common practice (published contractor numbering procedures): inserted joints take the
	// next letter after the number before them; R (repair) and M (modified) are not used.
	it('inserts 5A, 5B … after 5, skipping the letters that mean repair and modified', () => {
		expect(insertedWeldNumber('5', ['4', '5', '6'])).toBe('5A');
		expect(insertedWeldNumber('5', ['5', '5A'])).toBe('5B');
		expect(insertedWeldNumber('5A', ['5', '5A', '5B'])).toBe('5C');
		const upToQ = 'ABCDEFGHJKLNPQ'.split('').map((l) => `5${l}`);
		expect(insertedWeldNumber('5', upToQ)).toBe('5S');
		expect(insertedWeldNumber('FW-3', ['FW-3'])).toBe('FW-3A');
	});
});
