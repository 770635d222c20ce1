import { describe, expect, it } from 'vitest';
import { nextWeldNumber, weldNumberSortKey } from './weld-numbers';

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
});
