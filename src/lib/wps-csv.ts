/**
 * A WPS register as a CSV file: one WPS a line, the columns of the template (by label or by
 * field name, in any order, any case). Every problem is named by its line and column; a file
 * with any problem imports nothing. Pure: the server adds the register's own uniqueness check.
 */
import { readCsv } from './csv-read';
import type { UnitSystem } from './domain';
import {
	emptyWps,
	readWps,
	WPS_FIELD_LABELS,
	WPS_FIELDS,
	type WpsField,
	type WpsRecord,
	type WpsTyped
} from './wps-register';

export interface WpsCsvProblem {
	line: number;
	/** the column's heading as the template writes it; empty for a problem of the whole line */
	column: string;
	message: string;
}

export interface WpsCsvRow {
	line: number;
	typed: WpsTyped;
	record: WpsRecord;
}

export type WpsCsvRead =
	{ ok: true; rows: WpsCsvRow[] } | { ok: false; problems: WpsCsvProblem[]; rows: number };

/** At most this many WPS lines in one file. */
export const WPS_CSV_MAX_ROWS = 2000;

const key = (heading: string) =>
	heading
		.trim()
		.toLowerCase()
		.replace(/[\s_-]+/g, ' ');
const HEADINGS = new Map<string, WpsField>(
	WPS_FIELDS.flatMap((field) => [
		[key(WPS_FIELD_LABELS[field]), field],
		[key(field), field]
	])
);

/** The template: a note, the headings and one invented example line, in the project's units. */
export function wpsCsvTemplate(units: UnitSystem): string {
	const example: Partial<WpsTyped> =
		units === 'imperial'
			? {
					number: 'WPS-EX-01',
					revision: '0',
					status: 'draft',
					title: 'Example: carbon steel pipe',
					processes: 'GTAW/SMAW',
					materialGroups: 'P1',
					thicknessMin: '3/16',
					thicknessMax: '3/4',
					diameterMin: '2',
					grooveType: 'Single-V',
					rootOpeningMin: '1/16',
					rootOpeningMax: '1/8',
					rootFaceMin: '1/32',
					rootFaceMax: '3/32',
					bevelAngleMin: '35',
					bevelAngleMax: '40',
					preheatMin: '50',
					interpassMax: '600',
					fillerClasses: 'ER70S-2; E7018',
					pqrs: 'PQR-EX-01'
				}
			: {
					number: 'WPS-EX-01',
					revision: '0',
					status: 'draft',
					title: 'Example: non-alloy pipe',
					processes: '141/111',
					materialGroups: '1.1',
					thicknessMin: '3',
					thicknessMax: '20',
					diameterMin: '25',
					grooveType: 'Single-V',
					rootOpeningMin: '2',
					rootOpeningMax: '4',
					rootFaceMin: '1',
					rootFaceMax: '2',
					bevelAngleMin: '30',
					bevelAngleMax: '35',
					preheatMin: '10',
					interpassMax: '250',
					fillerClasses: 'W 42 5 W3Si1; E 42 4 B 32 H5',
					pqrs: 'PQR-EX-01'
				};
	const cell = (value: string) =>
		/[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
	const note =
		units === 'imperial'
			? '# Tacksheet WPS register: one WPS a line. Bare lengths are inches (or type mm), temperatures °F (or type °C). Lists separated by ; or /. Status: draft, approved or superseded. Replace the example line. Each WPS rests on its PQRs: check it against the code and edition in force.'
			: '# Tacksheet WPS register: one WPS a line. Bare lengths are millimetres, temperatures °C (or type °F). Lists separated by ; or /. Status: draft, approved or superseded. Replace the example line. Each WPS rests on its PQRs: check it against the code and edition in force.';
	return [
		note,
		WPS_FIELDS.map((f) => cell(WPS_FIELD_LABELS[f])).join(','),
		WPS_FIELDS.map((f) => cell(example[f] ?? '')).join(',')
	]
		.map((line) => `${line}\r\n`)
		.join('');
}

/** A WPS register CSV read in the project's units: every WPS, or every problem. */
export function readWpsCsv(text: string, units: UnitSystem): WpsCsvRead {
	const parsed = readCsv(text);
	if (!parsed.ok) {
		return {
			ok: false,
			rows: 0,
			problems: [{ line: parsed.line, column: '', message: parsed.message }]
		};
	}
	const [header, ...lines] = parsed.rows;
	if (!header) {
		return {
			ok: false,
			rows: 0,
			problems: [{ line: 1, column: '', message: 'The file is empty: start from the template.' }]
		};
	}
	const problems: WpsCsvProblem[] = [];
	const columns: (WpsField | null)[] = header.cells.map((heading) => {
		if (heading.trim() === '') return null;
		const field = HEADINGS.get(key(heading));
		if (!field) {
			problems.push({
				line: header.line,
				column: heading.trim(),
				message: `Unknown column "${heading.trim()}": use the template's headings.`
			});
			return null;
		}
		return field;
	});
	for (const field of ['number', 'revision', 'processes'] as const) {
		if (!columns.includes(field)) {
			problems.push({
				line: header.line,
				column: WPS_FIELD_LABELS[field],
				message: `The column "${WPS_FIELD_LABELS[field]}" is missing.`
			});
		}
	}
	const seen = new Set<WpsField>();
	for (const field of columns) {
		if (field && seen.has(field)) {
			problems.push({
				line: header.line,
				column: WPS_FIELD_LABELS[field],
				message: `The column "${WPS_FIELD_LABELS[field]}" appears twice.`
			});
		}
		if (field) seen.add(field);
	}
	if (problems.length > 0) return { ok: false, rows: lines.length, problems };
	if (lines.length === 0) {
		return {
			ok: false,
			rows: 0,
			problems: [{ line: header.line, column: '', message: 'The file has no WPS lines.' }]
		};
	}
	if (lines.length > WPS_CSV_MAX_ROWS) {
		return {
			ok: false,
			rows: lines.length,
			problems: [
				{
					line: lines[WPS_CSV_MAX_ROWS].line,
					column: '',
					message: `At most ${WPS_CSV_MAX_ROWS} WPS lines in one file; split it.`
				}
			]
		};
	}
	const rows: WpsCsvRow[] = [];
	const keys = new Map<string, number>();
	for (const { line, cells } of lines) {
		if (cells.length > columns.length && cells.slice(columns.length).some((c) => c.trim())) {
			problems.push({ line, column: '', message: 'The line has more cells than the headings.' });
			continue;
		}
		const typed = emptyWps();
		columns.forEach((field, k) => {
			if (field) typed[field] = (cells[k] ?? '').trim();
		});
		const read = readWps(typed, units);
		if (!read.ok) {
			for (const problem of read.problems) {
				problems.push({ line, column: WPS_FIELD_LABELS[problem.field], message: problem.message });
			}
			continue;
		}
		const id = `${read.record.number}\u0000${read.record.revision}`.toUpperCase();
		const earlier = keys.get(id);
		if (earlier !== undefined) {
			problems.push({
				line,
				column: WPS_FIELD_LABELS.number,
				message: `WPS ${read.record.number} rev ${read.record.revision} is also on line ${earlier}.`
			});
			continue;
		}
		keys.set(id, line);
		rows.push({ line, typed, record: read.record });
	}
	return problems.length > 0 ? { ok: false, rows: lines.length, problems } : { ok: true, rows };
}
