/**
 * Reading a WPS register CSV: RFC 4180 quoting (IETF RFC 4180, section 2), headings by label
 * or field name, every problem by line and column. The procedures are invented.
 */
import { describe, expect, it } from 'vitest';
import { readCsv } from './csv-read';
import { readWpsCsv, wpsCsvTemplate } from './wps-csv';

describe('reading CSV text', () => {
	it('reads quoted cells with commas, doubled quotes and line breaks (RFC 4180 §2.6–2.7)', () => {
		const read = readCsv('a,b\r\n"x, y","say ""hi""",\r\n"two\nlines",z\r\n');
		expect(read).toEqual({
			ok: true,
			rows: [
				{ line: 1, cells: ['a', 'b'] },
				{ line: 2, cells: ['x, y', 'say "hi"', ''] },
				{ line: 3, cells: ['two\nlines', 'z'] }
			]
		});
	});

	it('skips notes and blank lines, keeps line numbers, takes ; as a spreadsheet writes it', () => {
		const read = readCsv('\uFEFF# note\nA;B\n\n1;2');
		expect(read).toEqual({
			ok: true,
			rows: [
				{ line: 2, cells: ['A', 'B'] },
				{ line: 4, cells: ['1', '2'] }
			]
		});
	});

	it('refuses a quote never closed, naming its line', () => {
		expect(readCsv('a,b\n"open,x\n')).toMatchObject({ ok: false, line: 2 });
	});
});

describe('a WPS register CSV', () => {
	it('reads the template back as one WPS, in either unit system', () => {
		for (const units of ['imperial', 'metric'] as const) {
			const read = readWpsCsv(wpsCsvTemplate(units), units);
			expect(read.ok).toBe(true);
			if (read.ok) expect(read.rows.map((r) => r.record.number)).toEqual(['WPS-EX-01']);
		}
	});

	it('takes field names as headings in any order', () => {
		const read = readWpsCsv('processes,revision,number\nGTAW,0,WPS-A\nSMAW,1,WPS-A\n', 'metric');
		expect(read.ok && read.rows.map((r) => `${r.record.number}/${r.record.revision}`)).toEqual([
			'WPS-A/0',
			'WPS-A/1'
		]);
	});

	it('names each problem by line and column', () => {
		const csv = [
			'WPS number,Revision,Processes,Thickness min,Bevel angle min,Bevel angle max',
			'WPS-A,0,GTAW,3,30,35',
			'WPS-B,0,,thick,40,30',
			'WPS-A,0,SMAW,,,'
		].join('\n');
		const read = readWpsCsv(csv, 'metric');
		expect(read.ok).toBe(false);
		if (read.ok) return;
		expect(read.problems.map((p) => [p.line, p.column])).toEqual([
			[3, 'Processes'],
			[3, 'Thickness min'],
			[3, 'Bevel angle min'],
			[4, 'WPS number']
		]);
	});

	it('refuses unknown and missing columns on the heading line', () => {
		const read = readWpsCsv('WPS number,Colour\nWPS-A,red\n', 'metric');
		expect(read.ok).toBe(false);
		if (read.ok) return;
		expect(read.problems.map((p) => p.column)).toEqual(['Colour', 'Revision', 'Processes']);
		expect(read.problems.every((p) => p.line === 1)).toBe(true);
	});

	it('refuses an empty file and a file of headings only', () => {
		expect(readWpsCsv('', 'metric').ok).toBe(false);
		expect(readWpsCsv('WPS number,Revision,Processes\n', 'metric').ok).toBe(false);
	});
});
