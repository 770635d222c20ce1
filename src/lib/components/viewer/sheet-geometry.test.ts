/**
 * The viewer's own sheet coordinates against pdf.js (the reference renderer the viewer also
 * uses): for pages with every /Rotate, with view boxes that do not start at 0 0 and a
 * CropBox inside the MediaBox, the sheet size and both directions of the mapping agree with
 * page.getViewport({ scale: 1, rotation: page.rotate }).
 */
import path from 'node:path';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { PDFDocument, degrees } from 'pdf-lib';
import { sheetGeometry } from './sheet-geometry';

const require = createRequire(import.meta.url);

async function pdfjsPages() {
	const doc = await PDFDocument.create();
	const cases = [
		{ rotate: 0, media: [0, 0, 1224, 792], crop: null },
		{ rotate: 90, media: [-50, -50, 950, 550], crop: [0, 0, 800, 500] },
		{ rotate: 180, media: [10, 20, 610, 820], crop: null },
		{ rotate: 270, media: [0, 0, 2384, 1684], crop: [100, 40, 2300, 1600] }
	] as const;
	for (const c of cases) {
		const page = doc.addPage([c.media[2] - c.media[0], c.media[3] - c.media[1]]);
		page.setMediaBox(c.media[0], c.media[1], c.media[2] - c.media[0], c.media[3] - c.media[1]);
		if (c.crop) page.setCropBox(c.crop[0], c.crop[1], c.crop[2] - c.crop[0], c.crop[3] - c.crop[1]);
		page.setRotation(degrees(c.rotate));
	}
	const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
	const standardFontDataUrl =
		path.join(path.dirname(require.resolve('pdfjs-dist/package.json')), 'standard_fonts') +
		path.sep;
	const pdf = await pdfjs.getDocument({ data: await doc.save(), standardFontDataUrl, verbosity: 0 })
		.promise;
	const pages = [];
	for (let n = 1; n <= pdf.numPages; n++) pages.push(await pdf.getPage(n));
	return { pdf, pages };
}

describe('sheet geometry', () => {
	it('maps PDF points to sheet units and back exactly as pdf.js does', async () => {
		const { pdf, pages } = await pdfjsPages();
		expect(pages.map((p) => p.rotate)).toEqual([0, 90, 180, 270]);
		for (const page of pages) {
			const viewport = page.getViewport({ scale: 1, rotation: page.rotate });
			const [x0, y0, x1, y1] = page.view;
			const geometry = sheetGeometry({ x0, y0, x1, y1, rotation: page.rotate });
			expect(geometry.width).toBeCloseTo(viewport.width, 9);
			expect(geometry.height).toBeCloseTo(viewport.height, 9);
			for (const [x, y] of [
				[x0, y0],
				[x1, y1],
				[x0 + 37.5, y1 - 12.25],
				[(x0 + x1) / 2, (y0 + y1) / 2]
			]) {
				const ours = geometry.toViewport(x, y);
				const theirs = viewport.convertToViewportPoint(x, y);
				expect(ours[0]).toBeCloseTo(theirs[0], 9);
				expect(ours[1]).toBeCloseTo(theirs[1], 9);
				const back = geometry.toPdf(ours[0], ours[1]);
				const theirsBack = viewport.convertToPdfPoint(theirs[0], theirs[1]);
				expect(back[0]).toBeCloseTo(theirsBack[0], 9);
				expect(back[1]).toBeCloseTo(theirsBack[1], 9);
			}
		}
		await pdf.destroy();
	});

	it('keeps the worked example of a rotated, offset page (MediaBox from -50 -50, /Rotate 90)', () => {
		// At scale 0.5 pdf.js gives viewport 250×400 and maps CSS (30, 40) to PDF (80, 60): at
		// scale 1 that is sheet point (60, 80).
		const geometry = sheetGeometry({ x0: 0, y0: 0, x1: 800, y1: 500, rotation: 90 });
		expect([geometry.width, geometry.height]).toEqual([500, 800]);
		const [x, y] = geometry.toPdf(60, 80);
		expect(x).toBeCloseTo(80, 9);
		expect(y).toBeCloseTo(60, 9);
	});

	it('scales by a page UserUnit', () => {
		const geometry = sheetGeometry({ x0: 0, y0: 0, x1: 100, y1: 50, rotation: 0 }, 2);
		expect([geometry.width, geometry.height]).toEqual([200, 100]);
		expect(geometry.toViewport(100, 0)).toEqual([200, 100]);
	});
});
