import { describe, expect, it } from 'vitest';
import {
	followingWeldNumber,
	cutOutWeldNumber,
	insertedWeldNumber,
	nextWeldNumber,
	weldNumberSortKey
} from './weld-numbers';

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
	// next letter after the number before them; R (repair), M (modified) and N (cut-out) are
	// not used.
	it('inserts 5A, 5B … after 5, skipping the letters that mean repair, modified and cut-out', () => {
		expect(insertedWeldNumber('5', ['4', '5', '6'])).toBe('5A');
		expect(insertedWeldNumber('5', ['5', '5A'])).toBe('5B');
		expect(insertedWeldNumber('5A', ['5', '5A', '5B'])).toBe('5C');
		const upToQ = 'ABCDEFGHJKLPQ'.split('').map((l) => `5${l}`);
		expect(insertedWeldNumber('5', upToQ)).toBe('5S');
		expect(insertedWeldNumber('FW-3', ['FW-3'])).toBe('FW-3A');
	});
});

describe('cut-out numbers', () => {
	// Common practice (contractors' weld numbering procedures): a cut-out keeps its number with
	// an N suffix, and the history of the original stays in the log under the old number.
	it('gives 12N for a cut-out of 12, then 12N2, 12N3 for cut-outs of the replacement', () => {
		expect(cutOutWeldNumber('12', ['11', '12', '13'])).toBe('12N');
		expect(cutOutWeldNumber('12N', ['12', '12N'])).toBe('12N2');
		expect(cutOutWeldNumber('12N2', ['12', '12N', '12N2'])).toBe('12N3');
		expect(cutOutWeldNumber('FW-3', ['FW-3'])).toBe('FW-3N');
		expect(cutOutWeldNumber('5A', ['5', '5A'])).toBe('5AN');
	});

	it('never takes a number already used on the drawing', () => {
		expect(cutOutWeldNumber('12', ['12', '12N'])).toBe('12N2');
		expect(cutOutWeldNumber('12', ['12', '12n', '12N2'])).toBe('12N3');
	});

	it('sorts replacements right after the joint they replace', () => {
		const numbers = ['13', '12N2', '12', '12N10', '12N', '12A'];
		const sorted = [...numbers].sort((a, b) =>
			weldNumberSortKey(a) < weldNumberSortKey(b) ? -1 : 1
		);
		expect(sorted).toEqual(['12', '12A', '12N', '12N2', '12N10', '13']);
	});
});

describe('the number offered after a typed one', () => {
	// Common practice: a prefix names shop or field welds, numbers run on within it.
	it('keeps the prefix and counts on past the highest used with it', () => {
		expect(followingWeldNumber('FW-12', ['FW-3', '14'])).toBe('FW-13');
		expect(followingWeldNumber('FW-12', ['FW-20'])).toBe('FW-21');
		expect(followingWeldNumber('101', ['5', 'FW-300'])).toBe('102');
		expect(followingWeldNumber('SW2-7A', [])).toBe('SW2-8');
	});
	it('offers nothing after a number without digits', () => {
		expect(followingWeldNumber('TIE-IN', [])).toBeNull();
	});
});
