/**
 * Reading a CSV file as people save it from a spreadsheet: RFC 4180 quoting (a quoted cell may
 * hold commas, quotes written twice and line breaks), CRLF or LF line ends, a byte-order mark,
 * and a comma or semicolon delimiter (as the first line uses). Lines starting with `#` are notes
 * and skipped; blank lines too. Each row keeps the line number it starts on. Pure.
 */

export interface CsvRow {
	/** 1-based line of the file where the row starts */
	line: number;
	cells: string[];
}

export type CsvRead = { ok: true; rows: CsvRow[] } | { ok: false; line: number; message: string };

/** The delimiter of the first line that is not a note: `;` where it has more of them. */
function delimiterOf(text: string): ',' | ';' {
	const first = text.split(/\r?\n/).find((line) => line.trim() && !line.startsWith('#')) ?? '';
	const count = (char: string) => first.split(char).length - 1;
	return count(';') > count(',') ? ';' : ',';
}

export function readCsv(input: string): CsvRead {
	const text = input.replace(/^\uFEFF/, '');
	const delimiter = delimiterOf(text);
	const rows: CsvRow[] = [];
	let line = 1;
	let i = 0;
	while (i < text.length) {
		const start = line;
		// A note line, or a blank one.
		if (text[i] === '#' || text[i] === '\n' || (text[i] === '\r' && text[i + 1] === '\n')) {
			const end = text.indexOf('\n', i);
			i = end === -1 ? text.length : end + 1;
			line++;
			continue;
		}
		const cells: string[] = [];
		let cell = '';
		let quoted = false;
		let wasQuoted = false;
		for (;;) {
			if (i >= text.length) {
				if (quoted) return { ok: false, line: start, message: 'A quoted cell is never closed.' };
				cells.push(cell);
				break;
			}
			const char = text[i];
			if (quoted) {
				if (char === '"') {
					if (text[i + 1] === '"') {
						cell += '"';
						i += 2;
						continue;
					}
					quoted = false;
					i++;
					continue;
				}
				if (char === '\n') line++;
				cell += char;
				i++;
				continue;
			}
			if (char === '"' && cell.trim() === '' && !wasQuoted) {
				quoted = true;
				wasQuoted = true;
				cell = '';
				i++;
				continue;
			}
			if (char === delimiter) {
				cells.push(cell);
				cell = '';
				wasQuoted = false;
				i++;
				continue;
			}
			if (char === '\r' && text[i + 1] === '\n') {
				i++;
				continue;
			}
			if (char === '\n') {
				cells.push(cell);
				line++;
				i++;
				break;
			}
			if (wasQuoted && char.trim() !== '') {
				return {
					ok: false,
					line: start,
					message: 'Text follows a closing quote; write a quote inside a quoted cell as "".'
				};
			}
			cell += char;
			i++;
		}
		if (cells.some((c) => c.trim() !== '')) rows.push({ line: start, cells });
	}
	return { ok: true, rows };
}
