// The upload check of a PDF, on a worker thread: pdf.js in Node parses on the thread that calls
// it, and walking the pages of a large file there would stall every other request. Started by
// src/lib/server/pdf-inspect.ts, one file at a time; plain ESM with packages from
// `dependencies` only, as the SvelteKit build does not bundle worker entries.
import path from 'node:path';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { parentPort } from 'node:worker_threads';

const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
const { getDocument, OPS } = pdfjs;

/** File-system path with a trailing separator: what pdf.js in Node takes for its font data. */
const standardFontDataUrl =
	path.join(
		path.dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json')),
		'standard_fonts'
	) + path.sep;

/** Operators that put marks on the page (paths that are painted, text, images, shadings). */
const MARKING = new Set(
	Object.entries(OPS)
		.filter(([name]) =>
			/^(paint|show|nextLine.*Show|shadingFill|stroke|fill|eoFill|closeStroke|closeFill|closeEOFill)/.test(
				name
			)
		)
		.map(([, code]) => code)
);

/** @param {{ fnArray: number[], argsArray: unknown[] }} list */
function marks(list) {
	return list.fnArray.some((op, i) => {
		if (op === OPS.constructPath) {
			const args = /** @type {unknown[] | null} */ (list.argsArray[i]);
			return Array.isArray(args) && args[0] !== OPS.endPath;
		}
		return MARKING.has(op);
	});
}

/**
 * @typedef {{ file: string, bytes: number, maxPages: number, maxSidePt: number, blankCheckBytes: number, blankCheckPages: number }} Job
 * @param {Job} job
 */
async function inspect(job) {
	const task = getDocument({
		url: pathToFileURL(job.file).href,
		disableAutoFetch: true,
		disableStream: true,
		isEvalSupported: false,
		standardFontDataUrl,
		verbosity: 0
	});
	try {
		const pdf = await task.promise;
		// An owner password opens in a viewer but the stamped export cannot rewrite the file.
		const { info } = await pdf.getMetadata();
		if (/** @type {{ EncryptFilterName?: string | null }} */ (info).EncryptFilterName) {
			return {
				ok: false,
				reason: 'encrypted',
				message:
					'The PDF is encrypted (it has a password or editing restrictions). Save an unrestricted copy and upload that.'
			};
		}
		if (!(pdf.numPages >= 1))
			return {
				ok: false,
				reason: 'empty',
				message: 'The PDF has no pages: there is no sheet to show.'
			};
		if (pdf.numPages > job.maxPages)
			return {
				ok: false,
				reason: 'too-many-pages',
				message: `The PDF has ${pdf.numPages} pages; a drawing may have at most ${job.maxPages} (UPLOAD_MAX_PAGES). Split it, or ask your administrator to raise the limit.`
			};
		const pages = [];
		let blank = job.bytes <= job.blankCheckBytes && pdf.numPages <= job.blankCheckPages;
		for (let index = 0; index < pdf.numPages; index++) {
			const page = await pdf.getPage(index + 1);
			const [x0, y0, x1, y1] = page.view;
			const unit = page.userUnit || 1;
			const width = (x1 - x0) * unit;
			const height = (y1 - y0) * unit;
			if (![x0, y0, x1, y1, width, height].every(Number.isFinite) || width < 1 || height < 1) {
				return {
					ok: false,
					reason: 'page-size',
					message: `Sheet ${index + 1} of the PDF has no usable size. Export the drawing again.`
				};
			}
			if (width > job.maxSidePt || height > job.maxSidePt) {
				const metres = (pt) => ((pt / 72) * 0.0254).toFixed(pt > 72 * 400 ? 0 : 2);
				return {
					ok: false,
					reason: 'page-size',
					message: `Sheet ${index + 1} of the PDF is ${metres(width)} × ${metres(height)} m; a sheet may be at most ${Math.round(job.maxSidePt / 72)} in (${metres(job.maxSidePt)} m) on a side. Export the drawing at its real size.`
				};
			}
			// A small file whose every page draws nothing is an empty document, not a drawing.
			if (blank && marks(await page.getOperatorList())) blank = false;
			pages.push({
				index,
				x0,
				y0,
				x1,
				y1,
				rotation: ((page.rotate % 360) + 360) % 360
			});
			page.cleanup();
		}
		if (blank)
			return {
				ok: false,
				reason: 'empty',
				message: 'The PDF has no drawing on it: every page is blank. Upload the exported drawing.'
			};
		return { ok: true, pageCount: pdf.numPages, pages };
	} catch (error) {
		const name = error instanceof Error ? error.name : '';
		if (name === 'PasswordException') {
			return {
				ok: false,
				reason: 'encrypted',
				message: 'The PDF is protected with a password. Save an unprotected copy and upload that.'
			};
		}
		return {
			ok: false,
			reason: 'damaged',
			message: `The PDF is damaged and cannot be read (${error instanceof Error ? error.message : String(error)}). Export it again from the drawing system.`
		};
	} finally {
		await task.destroy();
	}
}

parentPort?.on('message', async (/** @type {{ id: number, job: Job }} */ { id, job }) => {
	const result = await inspect(job).catch((error) => ({
		ok: false,
		reason: 'damaged',
		message: `The PDF could not be read (${error instanceof Error ? error.message : String(error)}).`
	}));
	parentPort?.postMessage({ id, result });
});
