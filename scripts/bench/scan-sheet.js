// A scanned sheet for the benchmarks: a drawn PDF page rasterised at a scanner's resolution,
// given a paper tone, a slight skew and sensor noise, and put back into a PDF as one JPEG
// image filling the page (no text, no vectors), as a scanned drawing arrives from a plotter
// room.
import { createRequire } from 'node:module';
import path from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import { PDFDocument } from 'pdf-lib';

const require = createRequire(import.meta.url);
const pdfjsDir = path.dirname(require.resolve('pdfjs-dist/package.json'));

/** Small and repeatable: the same scan on every run. */
function noise(seed) {
	let state = seed >>> 0;
	return () => {
		state = (state * 1664525 + 1013904223) >>> 0;
		return state / 2 ** 32;
	};
}

/**
 * @param {Uint8Array} pdfBytes a drawn sheet
 * @param {number} dpi scanner resolution
 * @returns {Promise<{ bytes: Uint8Array, width: number, height: number, jpegBytes: number }>}
 */
export async function scanOf(pdfBytes, dpi = 200) {
	const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
	const doc = await pdfjs.getDocument({
		data: pdfBytes.slice(),
		standardFontDataUrl: path.join(pdfjsDir, 'standard_fonts') + path.sep,
		isEvalSupported: false,
		verbosity: 0
	}).promise;
	const page = await doc.getPage(1);
	const viewport = page.getViewport({ scale: dpi / 72, rotation: page.rotate });
	const width = Math.round(viewport.width);
	const height = Math.round(viewport.height);
	const canvas = createCanvas(width, height);
	const context = canvas.getContext('2d');
	context.fillStyle = '#ffffff';
	context.fillRect(0, 0, width, height);
	// A sheet fed a little crooked.
	context.translate(width / 2, height / 2);
	context.rotate((0.3 * Math.PI) / 180);
	context.translate(-width / 2, -height / 2);
	await page.render({ canvas, canvasContext: context, viewport }).promise;
	await doc.destroy();

	const image = context.getImageData(0, 0, width, height);
	const data = image.data;
	const random = noise(200);
	for (let i = 0; i < data.length; i += 4) {
		// Grey paper, a darker edge of the feed rollers, speckle.
		const ink = data[i];
		const paper = 232 - (i / 4 / width < 30 ? 40 : 0);
		const value = (ink / 255) * paper + (random() - 0.5) * 24;
		data[i] = data[i + 1] = data[i + 2] = value;
	}
	context.setTransform(1, 0, 0, 1, 0, 0);
	context.putImageData(image, 0, 0);
	const jpeg = await canvas.encode('jpeg', 80);
	canvas.width = 0;
	canvas.height = 0;

	const out = await PDFDocument.create({ updateMetadata: false });
	const embedded = await out.embedJpg(jpeg);
	const sheet = out.addPage([(width * 72) / dpi, (height * 72) / dpi]);
	sheet.drawImage(embedded, { x: 0, y: 0, width: sheet.getWidth(), height: sheet.getHeight() });
	return { bytes: await out.save(), width, height, jpegBytes: jpeg.length };
}
