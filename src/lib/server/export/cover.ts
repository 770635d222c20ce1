/** The cover and index pages of a turnover set: what it covers, counts, legend, sheet index. */
import type { PDFPage } from 'pdf-lib';
import { JOINT_STATES, STATE_LOOKS } from '$lib/joint-state';
import type { StateCounts } from '$lib/state-counts';
import { INK, MUTED, REVIEW_RING, RULE, SUPERSEDED, drawGlyph, type Fonts } from './pdf-marks';
import type { SheetBox } from './sheet-frame';
import { CAUTION } from '$lib/caution';

export interface CoverFacts {
	projectCode: string;
	projectName: string;
	client: string;
	scope: string;
	options: string[];
	/** `YYYY-MM-DD`, UTC: printed on the cover and every footer. */
	exportDay: string;
	exportedBy: string;
	counts: StateCounts;
	warnings: string[];
}

export interface IndexEntry {
	drawing: string;
	revision: string;
	status: 'current' | 'superseded';
	sheets: number;
	pins: number;
	/** First page in the set (1-based, after the cover pages), or the reason it is missing. */
	firstPage?: number;
	problem?: string;
}

export const COVER = { width: 842, height: 595, margin: 40 } as const;
const INDEX_ROWS_FIRST = 30;
const INDEX_ROWS_MORE = 36;

export function coverPageCount(entries: number): number {
	return entries <= INDEX_ROWS_FIRST
		? 1
		: 1 + Math.ceil((entries - INDEX_ROWS_FIRST) / INDEX_ROWS_MORE);
}

/** The cover in the frame the footer is laid out in. */
export const coverBox: SheetBox = { x0: 0, y0: 0, x1: COVER.width, y1: COVER.height, rotation: 0 };

function indexTable(
	page: PDFPage,
	rows: IndexEntry[],
	left: number,
	top: number,
	width: number,
	fonts: Fonts
) {
	const cols = [0, 0.42, 0.5, 0.66, 0.88].map((f) => left + f * width);
	const heads = ['Drawing', 'Rev', 'Status', 'Sheets · weld marks', 'Page'];
	heads.forEach((h, i) =>
		page.drawText(h.toUpperCase(), {
			x: cols[i],
			y: top,
			size: 7,
			font: fonts.semibold,
			color: MUTED
		})
	);
	page.drawRectangle({ x: left, y: top - 4, width, height: 0.6, color: RULE });
	let y = top - 16;
	for (const row of rows) {
		const colour = row.problem ? SUPERSEDED : INK;
		page.drawText(row.drawing, { x: cols[0], y, size: 8.5, font: fonts.semibold, color: INK });
		page.drawText(row.revision, { x: cols[1], y, size: 8.5, font: fonts.regular, color: INK });
		page.drawText(row.status, { x: cols[2], y, size: 8.5, font: fonts.regular, color: INK });
		if (row.problem) {
			page.drawText(`Not included: ${row.problem}`.slice(0, 90), {
				x: cols[3],
				y,
				size: 7,
				font: fonts.regular,
				color: colour
			});
		} else {
			page.drawText(`${row.sheets} · ${row.pins}`, {
				x: cols[3],
				y,
				size: 8.5,
				font: fonts.regular,
				color: INK
			});
			page.drawText(String(row.firstPage ?? ''), {
				x: cols[4],
				y,
				size: 8.5,
				font: fonts.regular,
				color: INK
			});
		}
		y -= 13;
	}
}

/** What a weld number's suffixes mean, printed under the key. */
export const SUFFIX_KEY = [
	'The weld number stands above its mark. What follows the number:',
	'-R1, -R2 …  repair cycle: the weld repaired once, twice …',
	'N (12N)  the weld that replaces weld 12, which was cut out; 12N2 replaces 12N',
	'A letter (12A, 12B)  a weld added after numbering, between 12 and 13',
	'A voided weld keeps its number; no number is used twice.'
] as const;

/** Words laid into lines no wider than `width` at `size`. */
function wrapText(text: string, font: Fonts['regular'], size: number, width: number): string[] {
	const lines: string[] = [];
	let line = '';
	for (const word of text.split(' ')) {
		const next = line ? `${line} ${word}` : word;
		if (line && font.widthOfTextAtSize(next, size) > width) {
			lines.push(line);
			line = word;
		} else line = next;
	}
	if (line) lines.push(line);
	return lines;
}

export function drawCover(
	pages: PDFPage[],
	facts: CoverFacts,
	entries: IndexEntry[],
	fonts: Fonts
) {
	const [first, ...more] = pages;
	const m = COVER.margin;
	let y = COVER.height - m - 8;
	first.drawText('TACKSHEET · TURNOVER SET', {
		x: m,
		y,
		size: 9,
		font: fonts.semibold,
		color: MUTED
	});
	// The caution comes first: every verdict in this set travels with it.
	y -= 13;
	for (const line of wrapText(CAUTION, fonts.semibold, 7.5, COVER.width / 2 - m - 10)) {
		first.drawText(line, { x: m, y, size: 7.5, font: fonts.semibold, color: INK });
		y -= 10;
	}
	y -= 14;
	// The title keeps to the left half, which the index leaves free: long names step down in size.
	const title = `${facts.projectCode} ${facts.projectName}`.slice(0, 90);
	const room = COVER.width / 2 - m - 10;
	let titleSize = 20;
	while (titleSize > 11 && fonts.semibold.widthOfTextAtSize(title, titleSize) > room)
		titleSize -= 1;
	first.drawText(title, { x: m, y, size: titleSize, font: fonts.semibold, color: INK });
	y -= 22;
	const lines: [string, string][] = [
		['Client', facts.client || '—'],
		['Scope', facts.scope],
		['Options', facts.options.join('; ')],
		['Exported', `${facts.exportDay} (UTC) by ${facts.exportedBy}`]
	];
	for (const [label, value] of lines) {
		first.drawText(label.toUpperCase(), { x: m, y, size: 7, font: fonts.semibold, color: MUTED });
		first.drawText(value.slice(0, 70), {
			x: m + 62,
			y,
			size: 9.5,
			font: fonts.regular,
			color: INK
		});
		y -= 15;
	}

	y -= 10;
	first.drawText('WELDS IN SCOPE AND KEY', {
		x: m,
		y,
		size: 7,
		font: fonts.semibold,
		color: MUTED
	});
	y -= 6;
	for (const state of JOINT_STATES) {
		y -= 22;
		const look = STATE_LOOKS[state];
		drawGlyph(first, state, m + 10, y + 3, 0.8, 0);
		first.drawText(look.label, { x: m + 28, y, size: 10, font: fonts.semibold, color: INK });
		first.drawText(String(facts.counts[state]), {
			x: m + 140,
			y,
			size: 10,
			font: fonts.semibold,
			color: INK
		});
		first.drawText(look.next, { x: m + 175, y, size: 8, font: fonts.regular, color: MUTED });
	}
	y -= 22;
	first.drawSvgPath(REVIEW_RING, {
		x: m + 10,
		y: y + 3,
		scale: 0.8,
		borderColor: MUTED,
		borderWidth: 1.6,
		borderDashArray: [3, 2]
	});
	first.drawText(
		'Dashed ring: weld mark carried to a new revision, its place still to be checked',
		{
			x: m + 28,
			y,
			size: 8,
			font: fonts.regular,
			color: INK
		}
	);
	for (const line of SUFFIX_KEY) {
		y -= 12;
		first.drawText(line, { x: m + 28, y, size: 8, font: fonts.regular, color: INK });
	}

	y -= 22;
	for (const warning of facts.warnings) {
		first.drawText(warning.slice(0, 80), {
			x: m,
			y,
			size: 9,
			font: fonts.semibold,
			color: SUPERSEDED
		});
		y -= 13;
	}

	const indexLeft = COVER.width / 2 + 10;
	const indexWidth = COVER.width - m - indexLeft;
	first.drawText('SHEETS IN THIS SET', {
		x: indexLeft,
		y: COVER.height - m - 8,
		size: 7,
		font: fonts.semibold,
		color: MUTED
	});
	indexTable(
		first,
		entries.slice(0, INDEX_ROWS_FIRST),
		indexLeft,
		COVER.height - m - 30,
		indexWidth,
		fonts
	);
	more.forEach((page, i) => {
		const from = INDEX_ROWS_FIRST + i * INDEX_ROWS_MORE;
		page.drawText('SHEETS IN THIS SET (CONTINUED)', {
			x: m,
			y: COVER.height - m - 8,
			size: 7,
			font: fonts.semibold,
			color: MUTED
		});
		indexTable(
			page,
			entries.slice(from, from + INDEX_ROWS_MORE),
			m,
			COVER.height - m - 30,
			COVER.width - 2 * m,
			fonts
		);
	});
}
