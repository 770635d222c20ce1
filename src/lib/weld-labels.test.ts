import { describe, expect, it } from 'vitest';
import { readWeldLabel } from './weld-labels';

const rule = { shopPrefix: '', fieldPrefix: 'FW-' };

describe('reading a weld number printed on a drawing', () => {
	// Common practice: field welds carry the project's field prefix, shop welds are bare numbers
	// or carry their own prefix; drawings print the prefix with or without its dash.
	it('reads bare and prefixed numbers in the project spelling of the prefix', () => {
		expect(readWeldLabel('12', rule)).toEqual({ number: '12', location: 'shop' });
		expect(readWeldLabel('FW-12', rule)).toEqual({ number: 'FW-12', location: 'field' });
		expect(readWeldLabel('fw12', rule)).toEqual({ number: 'FW-12', location: 'field' });
		expect(readWeldLabel('FW 12', rule)).toEqual({ number: 'FW-12', location: 'field' });
		expect(readWeldLabel('SW2', { shopPrefix: 'SW', fieldPrefix: 'FW-' })).toEqual({
			number: 'SW2',
			location: 'shop'
		});
		expect(readWeldLabel('101', rule)?.number).toBe('101');
	});

	// Common practice (contractors' numbering procedures): an inserted joint takes a letter
	// (5A), a repair an R suffix (12R1), a cut-out's replacement an N suffix (12N, 12N2).
	it('keeps insert letters and repair or cut-out suffixes', () => {
		expect(readWeldLabel('5A', rule)?.number).toBe('5A');
		expect(readWeldLabel('12R1', rule)?.number).toBe('12R1');
		expect(readWeldLabel('12-R1', rule)?.number).toBe('12R1');
		expect(readWeldLabel('12N', rule)?.number).toBe('12N');
		expect(readWeldLabel('FW-7N2', rule)?.number).toBe('FW-7N2');
	});

	it('reads leading zeros as the number itself', () => {
		expect(readWeldLabel('007', rule)?.number).toBe('7');
		expect(readWeldLabel('FW-003', rule)?.number).toBe('FW-3');
	});

	it('says a shop or field weld only where the prefixes differ', () => {
		// Both prefixed: a bare number is then not one of the project's.
		expect(readWeldLabel('7', { shopPrefix: 'W', fieldPrefix: 'W' })).toBeNull();
		expect(readWeldLabel('W7', { shopPrefix: 'W', fieldPrefix: 'W' })).toEqual({
			number: 'W7',
			location: null
		});
	});

	it('turns down what is not a weld number under the rule', () => {
		for (const text of [
			`12'-6 3/8"`,
			'3810.5',
			'EL',
			'+102',
			'6"-P-1201-A1A',
			'1:50',
			'0',
			'12345',
			'SW2',
			'5I',
			'5M',
			'(12)',
			'12.',
			'PS-12',
			'N',
			''
		])
			expect(readWeldLabel(text, rule), text).toBeNull();
	});
});
