import { describe, expect, it } from 'vitest';
import { csvLine, csvRows } from './csv';

describe('CSV cells', () => {
	it('quotes as RFC 4180 says, with CRLF line ends', () => {
		// RFC 4180 §2: fields with commas, quotes or line breaks are quoted; quotes are doubled.
		expect(csvLine(['a', 'b,c', 'say "hi"', 'two\nlines', 12, null])).toBe(
			'a,"b,c","say ""hi""","two\nlines",12,\r\n'
		);
		expect(csvRows([['x'], ['y']])).toBe('x\r\ny\r\n');
	});

	it('writes text a spreadsheet would run as a formula with a leading quote', () => {
		// OWASP, "CSV Injection": prefix cells starting with =, +, -, @, tab or CR with a single quote.
		expect(csvLine(['=HYPERLINK("http://x","y")', '+1', '-2+3', '@SUM(A1)', '\tx', '\rx'])).toBe(
			`"'=HYPERLINK(""http://x"",""y"")",'+1,'-2+3,'@SUM(A1),'\tx,"'\rx"\r\n`
		);
		expect(csvLine(['6-1/2', 'B-14', 'x=1'])).toBe('6-1/2,B-14,x=1\r\n');
	});

	it('keeps numbers as numbers, negative ones too', () => {
		expect(csvLine([-1.5, 0, 3])).toBe('-1.5,0,3\r\n');
	});
});
