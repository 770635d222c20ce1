/**
 * `marked-up-set.pdf`: a cover sheet, then every sheet in scope copied from its stored
 * revision (vector content kept, never rasterised) with each pin stamped in vector graphics
 * at its stored PDF point, and a footer on every page. One damaged or locked source fails its
 * drawing only: the reason goes into the job's report and into the cover's index.
 */
import {
	PDFDocument,
	EncryptedPDFError,
	ParseSpeeds,
	degrees,
	type Color,
	type PDFFont,
	type PDFPage
} from 'pdf-lib';
import fontkit from '@pdf-lib/fontkit';
import { JOINT_STATES, STATE_LOOKS, type JointState } from '$lib/joint-state';
import {
	STAMP,
	normaliseRotation,
	shownSize,
	shownToUser,
	turn,
	userToShown,
	type SheetBox
} from './sheet-frame';
import { layoutStamps, stampSize, type StampPlacement, type StampSize } from './stamp-layout';
import {
	COVER,
	coverBox,
	coverPageCount,
	drawCover,
	type CoverFacts,
	type IndexEntry
} from './cover';
import {
	INK,
	MUTED,
	REVIEW_RING,
	RULE,
	SUPERSEDED,
	WHITE,
	drawGlyph,
	embedFonts,
	hex,
	type Fonts
} from './pdf-marks';
import type { ScopeDrawing, ScopeRevision } from './scope';

export { coverPageCount, type CoverFacts, type IndexEntry };

export interface StampPin {
	pageIndex: number;
	x: number;
	y: number;
	state: JointState;
	/** The weld number as written on the map, repair suffix included. */
	label: string;
	needsReview: boolean;
}

export interface SetInput {
	cover: CoverFacts;
	drawings: ScopeDrawing[];
	pinsOf: (revisionId: number) => StampPin[];
	readFile: (fileKey: string) => Promise<Uint8Array>;
	/** Fixed dates inside the PDF, so unchanged data gives the same bytes. */
	fixedDate: Date;
	onProgress: (done: number, total: number, current: string) => void;
	/** Throws to stop the job between drawings (a cancelled export). */
	checkpoint: () => void;
}

export interface SetResult {
	bytes: Uint8Array;
	pageCount: number;
	entries: IndexEntry[];
}

function shownText(
	page: PDFPage,
	box: SheetBox,
	text: string,
	u: number,
	v: number,
	options: { font: PDFFont; size: number; color: Color }
) {
	const at = shownToUser(box, u, v);
	page.drawText(text, { ...options, x: at.x, y: at.y, rotate: degrees(box.rotation) });
}

function shownRect(
	page: PDFPage,
	box: SheetBox,
	u: number,
	v: number,
	width: number,
	height: number,
	options: { color?: Color; opacity?: number; borderColor?: Color; borderWidth?: number }
) {
	const at = shownToUser(box, u, v);
	page.drawRectangle({
		...options,
		x: at.x,
		y: at.y,
		width,
		height,
		rotate: degrees(box.rotation)
	});
}

/** Where a stamp's glyph sits in user space: on its pin, or where the layout moved it. */
function stampPoint(box: SheetBox, placement: StampPlacement) {
	return shownToUser(box, placement.u, placement.v);
}

/** An offset stamp's leader, ending on the pin's exact point, which a small dot marks. */
function stampLeader(page: PDFPage, box: SheetBox, placement: StampPlacement, size: StampSize) {
	if (!placement.leader) return;
	const from = shownToUser(box, ...placement.leader.from);
	const to = shownToUser(box, ...placement.leader.to);
	page.drawLine({ start: from, end: to, thickness: 0.6 * size.scale, color: INK });
	page.drawCircle({ x: to.x, y: to.y, size: 1.3 * size.scale, color: INK });
}

function stampMark(
	page: PDFPage,
	box: SheetBox,
	pin: StampPin,
	placement: StampPlacement,
	size: StampSize
) {
	const look = STATE_LOOKS[pin.state];
	const at = stampPoint(box, placement);
	if (pin.needsReview) {
		page.drawSvgPath(REVIEW_RING, {
			x: at.x,
			y: at.y,
			scale: size.glyphScale,
			rotate: degrees(box.rotation),
			borderColor: hex(look.color),
			borderWidth: 1.6 * size.scale,
			borderDashArray: [3 * size.scale, 2 * size.scale]
		});
	}
	drawGlyph(page, pin.state, at.x, at.y, size.glyphScale, box.rotation);
}

/**
 * The number sits above the glyph, centred on it in the shown frame. Numbers are drawn after
 * every mark of the sheet, so a neighbouring joint's glyph never hides one.
 */
function stampLabel(
	page: PDFPage,
	box: SheetBox,
	pin: StampPin,
	placement: StampPlacement,
	size: StampSize,
	fonts: Fonts
) {
	const at = stampPoint(box, placement);
	const k = size.scale;
	const width = fonts.semibold.widthOfTextAtSize(pin.label, size.labelSize);
	const halo = turn(box.rotation, -width / 2 - 1.4 * k, size.labelBaseline - 1.6 * k);
	page.drawRectangle({
		x: at.x + halo.x,
		y: at.y + halo.y,
		width: width + 2.8 * k,
		height: size.labelSize * 0.72 + 3.2 * k,
		rotate: degrees(box.rotation),
		color: WHITE,
		opacity: 0.88
	});
	const start = turn(box.rotation, -width / 2, size.labelBaseline);
	page.drawText(pin.label, {
		x: at.x + start.x,
		y: at.y + start.y,
		size: size.labelSize,
		font: fonts.semibold,
		color: INK,
		rotate: degrees(box.rotation)
	});
}

/**
 * Stamp size for the sheet, and each pin's place: on its point, or offset with a leader where
 * stamps would overlap (stamp-layout.ts).
 */
export function planStamps(box: SheetBox, pins: StampPin[], fonts: Fonts) {
	const { width, height } = shownSize(box);
	const size = stampSize(width, height);
	const placements = layoutStamps(
		pins.map((pin) => ({
			...userToShown(box, pin.x, pin.y),
			labelWidth: fonts.semibold.widthOfTextAtSize(pin.label, size.labelSize)
		})),
		{ width, height, bottom: STAMP.footerHeight },
		size
	);
	return { size, placements };
}

function supersededMark(page: PDFPage, box: SheetBox, note: string, fonts: Fonts) {
	const { width, height } = shownSize(box);
	const text = `SUPERSEDED  ${note}`;
	const size = 14;
	const textWidth = fonts.semibold.widthOfTextAtSize(text, size);
	const u = (width - textWidth) / 2;
	const v = height - 34;
	shownRect(page, box, u - 10, v - 8, textWidth + 20, size + 12, {
		color: WHITE,
		opacity: 0.9,
		borderColor: SUPERSEDED,
		borderWidth: 2
	});
	shownText(page, box, text, u, v, { font: fonts.semibold, size, color: SUPERSEDED });
}

interface FooterFacts {
	left: string;
	centre: string;
	superseded: boolean;
	/** A sheet's footer carries the key to its marks, so a page read alone still explains them. */
	legend?: boolean;
}

const LEGEND = { glyphScale: 0.34, size: 6.5, gap: 9 } as const;

/** Width of the footer's key: each state's glyph and label, in the order of the cover's legend. */
function legendWidth(fonts: Fonts): number {
	return JOINT_STATES.reduce(
		(sum, state) =>
			sum +
			10 +
			fonts.regular.widthOfTextAtSize(STATE_LOOKS[state].label, LEGEND.size) +
			LEGEND.gap,
		0
	);
}

function footerLegend(page: PDFPage, box: SheetBox, u: number, fonts: Fonts) {
	for (const state of JOINT_STATES) {
		const at = shownToUser(box, u + 4, STAMP.footerHeight / 2);
		drawGlyph(page, state, at.x, at.y, LEGEND.glyphScale, box.rotation);
		const label = STATE_LOOKS[state].label;
		shownText(page, box, label, u + 10, 5.4, {
			font: fonts.regular,
			size: LEGEND.size,
			color: INK
		});
		u += 10 + fonts.regular.widthOfTextAtSize(label, LEGEND.size) + LEGEND.gap;
	}
}

function footer(
	page: PDFPage,
	box: SheetBox,
	facts: FooterFacts,
	pageNo: number,
	total: number,
	fonts: Fonts
) {
	const { width } = shownSize(box);
	const h = STAMP.footerHeight;
	shownRect(page, box, 0, 0, width, h, { color: WHITE, opacity: 0.92 });
	shownRect(page, box, 0, h, width, 0.6, { color: RULE });
	const size = 7.5;
	const base = 5.2;
	const left = facts.superseded ? `${facts.left} (SUPERSEDED)` : facts.left;
	shownText(page, box, left, 10, base, {
		font: fonts.semibold,
		size,
		color: facts.superseded ? SUPERSEDED : INK
	});
	const centreWidth = fonts.regular.widthOfTextAtSize(facts.centre, size);
	const right = `Page ${pageNo} of ${total}`;
	const rightWidth = fonts.semibold.widthOfTextAtSize(right, size);
	// With the key: [drawing, rev, sheet] [key …] [set, date] [page]; without (narrow sheets,
	// where the key would not fit), the set and date are centred and the cover holds the key.
	const leftEnd = 10 + fonts.semibold.widthOfTextAtSize(left, size) + 14;
	const keyWidth = facts.legend ? legendWidth(fonts) : 0;
	const withKey =
		facts.legend && leftEnd + keyWidth + 14 + centreWidth + 14 + rightWidth + 10 <= width;
	if (withKey) footerLegend(page, box, leftEnd, fonts);
	shownText(
		page,
		box,
		facts.centre,
		withKey ? width - 10 - rightWidth - 14 - centreWidth : (width - centreWidth) / 2,
		base,
		{ font: fonts.regular, size, color: MUTED }
	);
	shownText(page, box, right, width - 10 - rightWidth, base, {
		font: fonts.semibold,
		size,
		color: INK
	});
}

function problemOf(error: unknown): string {
	// Matched by message too: pdf-lib's errors extend Error in ES5 style, so instanceof can miss.
	if (
		error instanceof EncryptedPDFError ||
		(error instanceof Error && /\bis encrypted\b/.test(error.message))
	)
		return 'the stored PDF is password-protected; upload an unprotected copy as a new revision';
	if (error instanceof Error && 'code' in error && error.code === 'ENOENT')
		return 'the stored file is missing from the file store';
	const detail = error instanceof Error ? error.message.split('\n')[0].slice(0, 160) : '';
	return `the stored PDF is damaged and cannot be read${detail ? ` (${detail})` : ''}`;
}

const yieldToServer = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Hands the event loop back once `budgetMs` of work has gone by since the last time, so the
 * server keeps answering however dense a sheet is; between those moments it costs a clock read.
 */
function pacer(budgetMs = 15) {
	let since = performance.now();
	return async () => {
		if (performance.now() - since < budgetMs) return;
		await yieldToServer();
		since = performance.now();
	};
}

// The set -----------------------------------------------------------------------------------

interface SheetMeta {
	box: SheetBox;
	footer: FooterFacts;
}

export async function buildMarkedUpSet(input: SetInput): Promise<SetResult> {
	const out = await PDFDocument.create({ updateMetadata: false });
	out.registerFontkit(fontkit);
	const fonts = await embedFonts(out);
	out.setTitle(`Turnover set ${input.cover.projectCode} ${input.cover.exportDay}`);
	out.setCreator('Tacksheet');
	out.setProducer('Tacksheet');
	out.setCreationDate(input.fixedDate);
	out.setModificationDate(input.fixedDate);

	const revisions: { drawing: ScopeDrawing; revision: ScopeRevision }[] = input.drawings.flatMap(
		(drawing) => drawing.revisions.map((revision) => ({ drawing, revision }))
	);
	const entries: IndexEntry[] = [];
	const metas: SheetMeta[] = [];
	const centre = `Turnover set · ${input.cover.projectCode} · exported ${input.cover.exportDay}`;
	const pace = pacer();

	for (const [i, { drawing, revision }] of revisions.entries()) {
		input.checkpoint();
		input.onProgress(i, revisions.length, `${drawing.number} rev ${revision.label}`);
		const entry: IndexEntry = {
			drawing: drawing.number,
			revision: revision.label,
			status: revision.status,
			sheets: revision.sheets.length,
			pins: 0
		};
		entries.push(entry);
		let copied: PDFPage[];
		try {
			const source = await PDFDocument.load(await input.readFile(revision.fileKey), {
				updateMetadata: false,
				parseSpeed: ParseSpeeds.Fast
			});
			await pace();
			const available = source.getPageCount();
			const wanted = revision.sheets.map((s) => s.pageIndex);
			if (wanted.length === 0 || wanted.some((index) => index >= available))
				throw new Error(`it has ${available} pages where ${wanted.length} were registered`);
			copied = await out.copyPages(source, wanted);
		} catch (error) {
			entry.problem = problemOf(error);
			continue;
		}
		const pins = input.pinsOf(revision.id);
		entry.firstPage = metas.length + 1;
		for (const [k, page] of copied.entries()) {
			out.addPage(page);
			const sheet = revision.sheets[k];
			const box: SheetBox = {
				x0: sheet.x0,
				y0: sheet.y0,
				x1: sheet.x1,
				y1: sheet.y1,
				rotation: normaliseRotation(page.getRotation().angle)
			};
			const onSheet = pins.filter((pin) => pin.pageIndex === sheet.pageIndex);
			const { size, placements } = planStamps(box, onSheet, fonts);
			for (const placement of placements) stampLeader(page, box, placement, size);
			for (const [k, pin] of onSheet.entries()) {
				stampMark(page, box, pin, placements[k], size);
				await pace();
			}
			for (const [k, pin] of onSheet.entries()) {
				stampLabel(page, box, pin, placements[k], size, fonts);
				entry.pins++;
				await pace();
			}
			if (revision.status === 'superseded') {
				supersededMark(
					page,
					box,
					revision.supersededBy ? `by revision ${revision.supersededBy}` : '',
					fonts
				);
			}
			metas.push({
				box,
				footer: {
					left: `${drawing.number} · Rev ${revision.label} · sheet ${sheet.pageIndex + 1} of ${revision.sheets.length}`,
					centre,
					superseded: revision.status === 'superseded',
					legend: true
				}
			});
			await pace();
		}
	}
	input.checkpoint();

	const coverCount = coverPageCount(entries.length);
	for (const entry of entries) if (entry.firstPage) entry.firstPage += coverCount;
	const coverPages = Array.from({ length: coverCount }, (_, i) =>
		out.insertPage(i, [COVER.width, COVER.height])
	);
	drawCover(coverPages, input.cover, entries, fonts);
	await yieldToServer();

	const total = out.getPageCount();
	coverPages.forEach((page, i) =>
		footer(
			page,
			coverBox,
			{ left: 'Cover and index', centre, superseded: false },
			i + 1,
			total,
			fonts
		)
	);
	const pages = out.getPages();
	// Footers cost a few milliseconds a page: hand the event loop back as the budget runs out.
	for (const [i, meta] of metas.entries()) {
		footer(pages[coverCount + i], meta.box, meta.footer, coverCount + i + 1, total, fonts);
		await pace();
	}

	// Without object streams the writer has no large block to deflate in one go, so its
	// yields every `objectsPerTick` objects keep the server answering.
	const saved = await out.save({ objectsPerTick: 200, useObjectStreams: false });
	return { bytes: saved, pageCount: total, entries };
}
