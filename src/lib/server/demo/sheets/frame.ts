import type { Rng } from '$lib/random';
import { pt, type Pen, type Pt } from './pen';
import type { Rect } from './clearance';
import type { DemoRevisionEntry, DemoSheetSpec, PaperSize } from './types';

/** Landscape sizes in points, as the sheet is read. */
export const PAPER: Record<PaperSize, { width: number; height: number }> = {
	'ANSI-B': { width: 1224, height: 792 },
	A3: { width: 1190.55, height: 841.89 },
	'ANSI-D': { width: 2448, height: 1584 },
	A1: { width: 2383.94, height: 1683.78 }
};

const LINE = { frame: 1.4, cell: 0.6, thin: 0.35 };

export interface TableColumn {
	title: string;
	width: number;
	align?: 'left' | 'center' | 'right';
}

export interface FrameText {
	scale: string;
	/** Line number, spool mark or piece mark shown in the title block. */
	mark: { label: string; value: string };
	notes: string[];
	initials: { drawn: string; checked: string; approved: string };
}

export interface Frame {
	/** Text and frame scale: 1 on B/A3, about 1.5 on D/A1 (bigger sheets carry bigger lettering). */
	t: number;
	inner: Rect;
	/** Free part of the right-hand column, above the notes. */
	column: Rect;
	/** Where the views go. */
	drawing: Rect;
}

export function frameScale(height: number): number {
	return 1 + (height / 792 - 1) * 0.5;
}

export function inventInitials(rng: Rng): FrameText['initials'] {
	const letters = 'ABCDEFGHJKLMNPRSTVW';
	const one = () => `${rng.pick([...letters])}.${rng.pick([...letters])}.`;
	return { drawn: one(), checked: one(), approved: one() };
}

export function wrapText(
	pen: Pen,
	text: string,
	size: number,
	width: number,
	bold = false
): string[] {
	const words = text.split(/\s+/).filter(Boolean);
	const lines: string[] = [];
	let current = '';
	for (const word of words) {
		const candidate = current ? `${current} ${word}` : word;
		if (pen.textWidth(candidate, size, bold) <= width || !current) current = candidate;
		else {
			lines.push(current);
			current = word;
		}
	}
	if (current) lines.push(current);
	return lines;
}

function fitText(pen: Pen, text: string, size: number, width: number, bold = false): string {
	if (pen.textWidth(text, size, bold) <= width) return text;
	let cut = text;
	while (cut.length > 1 && pen.textWidth(`${cut}...`, size, bold) > width) cut = cut.slice(0, -1);
	return `${cut.trimEnd()}...`;
}

function drawBorder(pen: Pen, width: number, height: number, t: number): Rect {
	const m = 14 * t;
	const band = 13 * t;
	pen.rect(m, m, width - 2 * m, height - 2 * m, { stroke: 0, width: LINE.cell * t });
	const inner: Rect = {
		x: m + band,
		y: m + band,
		w: width - 2 * (m + band),
		h: height - 2 * (m + band)
	};
	pen.rect(inner.x, inner.y, inner.w, inner.h, { stroke: 0, width: LINE.frame * t });
	const cols = width > 1500 ? 12 : 8;
	const rows = height > 1000 ? 8 : 6;
	const letters = 'ABCDEFGHJK';
	const size = 7 * t;
	for (let i = 0; i < cols; i++) {
		const x0 = m + ((width - 2 * m) * i) / cols;
		const x1 = m + ((width - 2 * m) * (i + 1)) / cols;
		if (i > 0) {
			pen.line(pt(x0, m), pt(x0, m + band), { width: LINE.cell * t });
			pen.line(pt(x0, height - m), pt(x0, height - m - band), { width: LINE.cell * t });
		}
		const label = String(i + 1);
		pen.text(label, pt((x0 + x1) / 2, m + band / 2), { size, align: 'center', valign: 'middle' });
		pen.text(label, pt((x0 + x1) / 2, height - m - band / 2), {
			size,
			align: 'center',
			valign: 'middle'
		});
	}
	for (let j = 0; j < rows; j++) {
		const y1 = height - m - ((height - 2 * m) * j) / rows;
		const y0 = height - m - ((height - 2 * m) * (j + 1)) / rows;
		if (j > 0) {
			pen.line(pt(m, y1), pt(m + band, y1), { width: LINE.cell * t });
			pen.line(pt(width - m, y1), pt(width - m - band, y1), { width: LINE.cell * t });
		}
		const label = letters[j];
		pen.text(label, pt(m + band / 2, (y0 + y1) / 2), { size, align: 'center', valign: 'middle' });
		pen.text(label, pt(width - m - band / 2, (y0 + y1) / 2), {
			size,
			align: 'center',
			valign: 'middle'
		});
	}
	const c = 5 * t;
	const mids: [Pt, Pt, Pt][] = [
		[pt(width / 2, inner.y), pt(width / 2 - c, m), pt(width / 2 + c, m)],
		[
			pt(width / 2, inner.y + inner.h),
			pt(width / 2 - c, height - m),
			pt(width / 2 + c, height - m)
		],
		[pt(inner.x, height / 2), pt(m, height / 2 - c), pt(m, height / 2 + c)],
		[
			pt(inner.x + inner.w, height / 2),
			pt(width - m, height / 2 - c),
			pt(width - m, height / 2 + c)
		]
	];
	for (const tri of mids) pen.polygon(tri, { fill: 0 });
	return inner;
}

function cell(
	pen: Pen,
	r: Rect,
	label: string,
	value: string,
	t: number,
	valueSize = 7,
	bold = false
): void {
	pen.rect(r.x, r.y, r.w, r.h, { stroke: 0, width: LINE.cell * t });
	pen.text(label, pt(r.x + 3 * t, r.y + r.h - 6 * t), { size: 4.6 * t, gray: 0.3 });
	const size = valueSize * t;
	const shown = fitText(pen, value, size, r.w - 6 * t, bold);
	pen.text(shown, pt(r.x + 3 * t, r.y + (r.h - 6 * t) / 2 - size * 0.2), {
		size,
		bold,
		valign: 'middle'
	});
}

function drawTitleBlock(
	pen: Pen,
	box: Rect,
	spec: DemoSheetSpec,
	sheet: number,
	sheetCount: number,
	text: FrameText,
	t: number
): void {
	const { x, w } = box;
	let top = box.y + box.h;
	const row = (h: number) => {
		top -= h * t;
		return top;
	};
	pen.rect(box.x, box.y, box.w, box.h, { stroke: 0, width: LINE.frame * t });

	let y = row(30);
	cell(pen, { x, y, w: w * 0.5, h: 30 * t }, 'OWNER', spec.party.owner, t, 8, true);
	cell(
		pen,
		{ x: x + w * 0.5, y, w: w * 0.5, h: 30 * t },
		'CONTRACTOR',
		spec.party.contractor,
		t,
		8,
		true
	);
	y = row(20);
	cell(pen, { x, y, w: w * 0.4, h: 20 * t }, 'PLANT', spec.party.plant, t, 6.5);
	cell(
		pen,
		{ x: x + w * 0.4, y, w: w * 0.6, h: 20 * t },
		'PROJECT',
		`${spec.party.projectCode}  ${spec.party.projectName}`,
		t,
		6.5
	);

	y = row(32);
	pen.rect(x, y, w, 32 * t, { stroke: 0, width: LINE.cell * t });
	pen.text('TITLE', pt(x + 3 * t, y + 26 * t), { size: 4.6 * t, gray: 0.3 });
	const titleLines = wrapText(pen, spec.title.toUpperCase(), 8.5 * t, w - 10 * t, true).slice(0, 2);
	titleLines.forEach((lineText, i) => {
		const baseline = titleLines.length === 1 ? y + 10 * t : y + (15 - i * 10) * t;
		pen.text(lineText, pt(x + w / 2, baseline), { size: 8.5 * t, bold: true, align: 'center' });
	});

	y = row(20);
	const q = w / 4;
	cell(pen, { x, y, w: q * 0.8, h: 20 * t }, 'AREA', spec.area, t, 6.5);
	cell(pen, { x: x + q * 0.8, y, w: q * 0.9, h: 20 * t }, 'SYSTEM', spec.system, t, 6.5);
	cell(pen, { x: x + q * 1.7, y, w: q * 1.3, h: 20 * t }, text.mark.label, text.mark.value, t, 6.5);
	cell(pen, { x: x + q * 3, y, w: q, h: 20 * t }, 'STATUS', issuedFor(spec), t, 5.2, true);

	y = row(30);
	cell(pen, { x, y, w: w * 0.6, h: 30 * t }, 'DRAWING NO.', spec.number, t, 11, true);
	cell(pen, { x: x + w * 0.6, y, w: w * 0.14, h: 30 * t }, 'REV', spec.revision, t, 12, true);
	cell(
		pen,
		{ x: x + w * 0.74, y, w: w * 0.26, h: 30 * t },
		'SHEET',
		`${sheet} OF ${sheetCount}`,
		t,
		9,
		true
	);

	const last = top - box.y;
	const cells: [string, string, number][] = [
		['SCALE', text.scale, 0.2],
		['DATE', spec.revisionDate, 0.23],
		['DRAWN', text.initials.drawn, 0.19],
		['CHECKED', text.initials.checked, 0.19],
		['APPROVED', text.initials.approved, 0.19]
	];
	let cx = x;
	for (const [label, value, frac] of cells) {
		cell(pen, { x: cx, y: box.y, w: w * frac, h: last }, label, value, t, 6.5);
		cx += w * frac;
	}
}

export const TITLE_BLOCK_HEIGHT = 150;

/** Draws a table from its top edge down and returns its height. */
export function drawTable(
	pen: Pen,
	x: number,
	top: number,
	title: string,
	columns: TableColumn[],
	rows: string[][],
	t: number,
	rowHeight = 10.5
): number {
	const width = columns.reduce((s, c) => s + c.width, 0);
	const titleH = 12 * t;
	const headH = 10 * t;
	const rh = rowHeight * t;
	const height = titleH + headH + rows.length * rh;
	const bottom = top - height;
	pen.rect(x, bottom, width, height, { stroke: 0, width: LINE.frame * 0.8 * t });
	pen.rect(x, top - titleH, width, titleH, { fill: 0.88, stroke: 0, width: LINE.cell * t });
	pen.text(title, pt(x + width / 2, top - titleH / 2), {
		size: 6.5 * t,
		bold: true,
		align: 'center',
		valign: 'middle'
	});
	pen.line(pt(x, top - titleH - headH), pt(x + width, top - titleH - headH), {
		width: LINE.cell * t
	});
	let cx = x;
	for (const [i, col] of columns.entries()) {
		if (i > 0) pen.line(pt(cx, bottom), pt(cx, top - titleH), { width: LINE.thin * t });
		pen.text(col.title, pt(cx + col.width / 2, top - titleH - headH / 2), {
			size: 5 * t,
			bold: true,
			align: 'center',
			valign: 'middle'
		});
		rows.forEach((r, j) => {
			const cy = top - titleH - headH - (j + 0.5) * rh;
			const value = fitText(pen, r[i] ?? '', 5.4 * t, col.width - 4 * t);
			const align = col.align ?? 'left';
			const tx =
				align === 'left'
					? cx + 2 * t
					: align === 'right'
						? cx + col.width - 2 * t
						: cx + col.width / 2;
			pen.text(value, pt(tx, cy), { size: 5.4 * t, align, valign: 'middle' });
		});
		cx += col.width;
	}
	rows.forEach((_, j) => {
		if (j === 0) return;
		const ry = top - titleH - headH - j * rh;
		pen.line(pt(x, ry), pt(x + width, ry), { width: LINE.thin * t, gray: 0.45 });
	});
	return height;
}

/** Isometrics go to site; spools and steel go to the shop first. */
function issuedFor(spec: DemoSheetSpec): string {
	return spec.kind === 'isometric' ? 'ISSUED FOR CONSTRUCTION' : 'ISSUED FOR FABRICATION';
}

function revisionRows(spec: DemoSheetSpec): DemoRevisionEntry[] {
	const history = [...(spec.revisionHistory ?? [])];
	if (!history.some((r) => r.label === spec.revision))
		history.push({ label: spec.revision, date: spec.revisionDate, description: issuedFor(spec) });
	return history.slice(-5).reverse();
}

export function drawNotes(pen: Pen, box: Rect, title: string, notes: string[], t: number): number {
	const size = 5.6 * t;
	const lineH = size * 1.35;
	const lines: { text: string; indent: boolean; lead: string }[] = [];
	notes.forEach((note, i) => {
		wrapText(pen, note.toUpperCase(), size, box.w - 18 * t).forEach((l, j) =>
			lines.push({ text: l, indent: true, lead: j === 0 ? `${i + 1}.` : '' })
		);
	});
	const height = 14 * t + lines.length * lineH + 4 * t;
	const top = box.y + box.h;
	pen.text(title, pt(box.x, top - 9 * t), { size: 6.8 * t, bold: true });
	pen.line(pt(box.x, top - 11 * t), pt(box.x + pen.textWidth(title, 6.8 * t, true), top - 11 * t), {
		width: 0.5 * t
	});
	lines.forEach((l, i) => {
		const y = top - 14 * t - (i + 1) * lineH + 2 * t;
		if (l.lead) pen.text(l.lead, pt(box.x, y), { size });
		pen.text(l.text, pt(box.x + 10 * t, y), { size });
	});
	return height;
}

/**
 * Border with zones, title block, revision block and general notes in the right-hand column.
 * Returns where the views and the column's tables may go.
 */
export function drawFrame(
	pen: Pen,
	spec: DemoSheetSpec,
	sheet: number,
	sheetCount: number,
	width: number,
	height: number,
	text: FrameText,
	columnWidth = 380
): Frame {
	const t = frameScale(height);
	const inner = drawBorder(pen, width, height, t);
	const colW = columnWidth * t;
	const colX = inner.x + inner.w - colW;
	const tbH = TITLE_BLOCK_HEIGHT * t;
	drawTitleBlock(pen, { x: colX, y: inner.y, w: colW, h: tbH }, spec, sheet, sheetCount, text, t);

	const revTop =
		inner.y + tbH + 2 * t + (12 + 10 + 10.5 * Math.max(3, revisionRows(spec).length)) * t;
	const rows = revisionRows(spec).map((r) => [
		r.label,
		r.date,
		r.description.toUpperCase(),
		text.initials.drawn,
		text.initials.checked,
		text.initials.approved
	]);
	while (rows.length < 3) rows.push(['', '', '', '', '', '']);
	drawTable(
		pen,
		colX,
		revTop,
		'REVISIONS',
		[
			{ title: 'REV', width: colW * 0.08, align: 'center' },
			{ title: 'DATE', width: colW * 0.17, align: 'center' },
			{ title: 'DESCRIPTION', width: colW * 0.48 },
			{ title: 'BY', width: colW * 0.09, align: 'center' },
			{ title: 'CHK', width: colW * 0.09, align: 'center' },
			{ title: 'APP', width: colW * 0.09, align: 'center' }
		],
		rows,
		t
	);
	const notesBottom = revTop + 6 * t;
	const notesBox: Rect = { x: colX + 4 * t, y: notesBottom, w: colW - 8 * t, h: inner.h };
	const notesHeightEstimate = measureNotes(pen, notesBox.w, text.notes, t);
	const notesTop = notesBottom + notesHeightEstimate;
	drawNotes(pen, { ...notesBox, h: notesHeightEstimate }, 'GENERAL NOTES', text.notes, t);

	const gap = 8 * t;
	const column: Rect = {
		x: colX,
		y: notesTop + gap,
		w: colW,
		h: inner.y + inner.h - notesTop - 2 * gap
	};
	pen.line(pt(colX, inner.y + tbH), pt(colX, inner.y + inner.h), { width: LINE.cell * t });
	const drawing: Rect = {
		x: inner.x + gap,
		y: inner.y + gap,
		w: inner.w - colW - 2 * gap,
		h: inner.h - 2 * gap
	};
	return { t, inner, column, drawing };
}

function measureNotes(pen: Pen, width: number, notes: string[], t: number): number {
	const size = 5.6 * t;
	let lines = 0;
	for (const n of notes) lines += wrapText(pen, n.toUpperCase(), size, width - 18 * t).length;
	return 14 * t + lines * size * 1.35 + 4 * t;
}

/** Scalloped cloud around a changed area, with the revision's delta triangle on its corner. */
export function drawRevisionCloud(pen: Pen, box: Rect, label: string, t: number): void {
	const scallop = 9 * t;
	const corners = [
		pt(box.x, box.y),
		pt(box.x + box.w, box.y),
		pt(box.x + box.w, box.y + box.h),
		pt(box.x, box.y + box.h)
	];
	const points: Pt[] = [];
	for (let i = 0; i < 4; i++) {
		const a = corners[i];
		const b = corners[(i + 1) % 4];
		const l = Math.hypot(b.x - a.x, b.y - a.y);
		const n = Math.max(1, Math.round(l / scallop));
		const edgeAngle = (Math.atan2(b.y - a.y, b.x - a.x) * 180) / Math.PI;
		for (let j = 0; j < n; j++) {
			const c = pt(a.x + ((b.x - a.x) * (j + 0.5)) / n, a.y + ((b.y - a.y) * (j + 0.5)) / n);
			const r = l / n / 2;
			points.push(...pen.arcPoints(c, r, edgeAngle + 180, edgeAngle + 360));
		}
	}
	pen.polyline(points, { width: 0.9 * t, gray: 0 }, true);
	drawDelta(pen, pt(box.x + box.w + 4 * t, box.y + box.h + 4 * t), label, t);
}

export function drawDelta(pen: Pen, centre: Pt, label: string, t: number): void {
	const s = 9 * t;
	pen.polygon(
		[
			pt(centre.x - s, centre.y - s * 0.6),
			pt(centre.x + s, centre.y - s * 0.6),
			pt(centre.x, centre.y + s * 1.05)
		],
		{ fill: 1, stroke: 0, width: 0.9 * t }
	);
	pen.text(label, pt(centre.x, centre.y - s * 0.1), {
		size: 7 * t,
		bold: true,
		align: 'center',
		valign: 'middle'
	});
}
