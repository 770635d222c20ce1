/**
 * Reads an uploaded PDF from disk with pdf.js (legacy build, for Node) to check it is a PDF
 * that opens, and to record each page's view box and rotation. pdf.js reads the file by
 * ranges, so a 150 MB drawing is never held in memory whole.
 */
import { pathToFileURL } from 'node:url';
import path from 'node:path';
import { createRequire } from 'node:module';

export interface InspectedPage {
	index: number;
	/** CropBox ∩ MediaBox in PDF points, as pdf.js's page.view. */
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: 0 | 90 | 180 | 270;
}

export type Inspection =
	| { ok: true; pageCount: number; pages: InspectedPage[] }
	| { ok: false; reason: 'encrypted' | 'damaged' | 'empty'; message: string };

type PdfJs = typeof import('pdfjs-dist/legacy/build/pdf.mjs');
let pdfjs: Promise<PdfJs> | undefined;

function standardFontsUrl(): string {
	const packageJson = createRequire(import.meta.url).resolve('pdfjs-dist/package.json');
	return pathToFileURL(path.join(path.dirname(packageJson), 'standard_fonts') + path.sep).href;
}

export async function inspectPdf(file: string): Promise<Inspection> {
	pdfjs ??= import('pdfjs-dist/legacy/build/pdf.mjs');
	const { getDocument } = await pdfjs;
	const task = getDocument({
		url: pathToFileURL(file).href,
		disableAutoFetch: true,
		disableStream: true,
		isEvalSupported: false,
		standardFontDataUrl: standardFontsUrl(),
		verbosity: 0
	});
	try {
		const pdf = await task.promise;
		// An owner password opens in a viewer but the stamped export cannot rewrite the file.
		const { info } = await pdf.getMetadata();
		if ((info as { EncryptFilterName?: string | null }).EncryptFilterName) {
			return {
				ok: false,
				reason: 'encrypted',
				message:
					'The PDF is encrypted (it has a password or editing restrictions). Save an unrestricted copy and upload that.'
			};
		}
		if (pdf.numPages < 1) return { ok: false, reason: 'empty', message: 'The PDF has no pages.' };
		const pages: InspectedPage[] = [];
		for (let index = 0; index < pdf.numPages; index++) {
			const page = await pdf.getPage(index + 1);
			const [x0, y0, x1, y1] = page.view;
			pages.push({
				index,
				x0,
				y0,
				x1,
				y1,
				rotation: (((page.rotate % 360) + 360) % 360) as InspectedPage['rotation']
			});
			page.cleanup();
		}
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
