/**
 * The marks the turnover set draws, shared by the cover's legend and the stamped sheets:
 * the embedded Barlow faces, the house colours and each state's glyph from STATE_LOOKS.
 */
import fs from 'node:fs/promises';
import { createRequire } from 'node:module';
import { LineCapStyle, degrees, rgb, type Color, type PDFDocument, type PDFFont } from 'pdf-lib';
import type { PDFPage } from 'pdf-lib';
import { STATE_LOOKS, type JointState } from '$lib/joint-state';

const require = createRequire(import.meta.url);
const fontFiles = {
	regular: '@expo-google-fonts/barlow/400Regular/Barlow_400Regular.ttf',
	semibold: '@expo-google-fonts/barlow/600SemiBold/Barlow_600SemiBold.ttf'
} as const;

let fontCache: Promise<{ regular: Uint8Array; semibold: Uint8Array }> | undefined;
function fontBytes() {
	fontCache ??= Promise.all([
		fs.readFile(require.resolve(fontFiles.regular)),
		fs.readFile(require.resolve(fontFiles.semibold))
	]).then(([regular, semibold]) => ({
		regular: new Uint8Array(regular),
		semibold: new Uint8Array(semibold)
	}));
	return fontCache;
}

export function hex(colour: string): Color {
	const n = Number.parseInt(colour.slice(1), 16);
	return rgb(((n >> 16) & 255) / 255, ((n >> 8) & 255) / 255, (n & 255) / 255);
}

export const INK = hex('#1c2126');
export const MUTED = hex('#5a636b');
export const WHITE = rgb(1, 1, 1);
export const RULE = hex('#b9b3a6');
export const SUPERSEDED = hex('#8c1d18');
export const REVIEW_RING = 'M 0 -12.5 A 12.5 12.5 0 1 1 0 12.5 A 12.5 12.5 0 1 1 0 -12.5 Z';

export interface Fonts {
	regular: PDFFont;
	semibold: PDFFont;
}

/** Text placed in the shown frame of a sheet: (u, v) is the start of its baseline. */
/** Both faces of Barlow, embedded from full TTFs and subset to the characters used. */
export async function embedFonts(pdf: PDFDocument): Promise<Fonts> {
	const bytes = await fontBytes();
	return {
		regular: await pdf.embedFont(bytes.regular, { subset: true, customName: 'Barlow-Regular' }),
		semibold: await pdf.embedFont(bytes.semibold, { subset: true, customName: 'Barlow-SemiBold' })
	};
}

/** The glyph of a state centred on (x, y), turned by `rotation` degrees counter-clockwise. */
export function drawGlyph(
	page: PDFPage,
	state: JointState,
	x: number,
	y: number,
	scale: number,
	rotation: number
) {
	const look = STATE_LOOKS[state];
	const colour = hex(look.color);
	page.drawSvgPath(look.glyph.shape, {
		x,
		y,
		scale,
		rotate: degrees(rotation),
		color: look.glyph.filled ? colour : WHITE,
		borderColor: colour,
		borderWidth: 2.2
	});
	if (look.glyph.mark) {
		page.drawSvgPath(look.glyph.mark, {
			x,
			y,
			scale,
			rotate: degrees(rotation),
			borderColor: look.glyph.filled ? hex(look.onColor) : colour,
			borderWidth: 2.4,
			borderLineCap: LineCapStyle.Round
		});
	}
}
