/**
 * pdf.js on the client. The main build touches DOMMatrix as soon as it is imported, so it is
 * only ever imported dynamically, in the browser, from here. It is loaded from its own file
 * (rather than a bundle chunk) so a page can name it in its HTML and the browser fetches and
 * compiles it while the page's own script is still loading.
 */
import type { PDFDocumentLoadingTask, PDFDocumentProxy } from 'pdfjs-dist';
import pdfjsUrl from 'pdfjs-dist/build/pdf.min.mjs?url';
import workerUrl from 'pdfjs-dist/build/pdf.worker.min.mjs?url';

export type Pdfjs = typeof import('pdfjs-dist');
export type { PDFDocumentProxy, PDFPageProxy, PageViewport, RenderTask } from 'pdfjs-dist';

/** For `<link rel="modulepreload">` in a page's head. */
export const PDFJS_URL = pdfjsUrl;

let loading: Promise<Pdfjs> | null = null;

export function loadPdfjs(): Promise<Pdfjs> {
	loading ??= (import(/* @vite-ignore */ pdfjsUrl) as Promise<Pdfjs>).then((pdfjs) => {
		pdfjs.GlobalWorkerOptions.workerSrc = workerUrl;
		return pdfjs;
	});
	return loading;
}

export interface OpenedSheetFile {
	task: PDFDocumentLoadingTask;
	document: Promise<PDFDocumentProxy>;
}

/**
 * Starts fetching a revision's PDF. The file route is authenticated by the session cookie,
 * which a same-origin fetch sends; the asset folders are served by the app itself because
 * the site may have no internet (scanned sheets need the wasm decoders).
 */
export async function openSheetFile(
	url: string,
	onProgress?: (fraction: number | null) => void
): Promise<OpenedSheetFile> {
	const pdfjs = await loadPdfjs();
	const task = pdfjs.getDocument({
		url,
		cMapUrl: '/pdfjs/cmaps/',
		cMapPacked: true,
		standardFontDataUrl: '/pdfjs/standard_fonts/',
		wasmUrl: '/pdfjs/wasm/',
		iccUrl: '/pdfjs/iccs/',
		// The file route answers Range requests: a part the stream has not brought yet (the
		// sheet's objects at the end of a large file) is fetched on its own, 1 MB at a time.
		rangeChunkSize: 1 << 20,
		// The Content-Security-Policy allows no eval; saying so spares pdf.js its probe.
		isEvalSupported: false
	});
	if (onProgress) {
		task.onProgress = ({ loaded, total }: { loaded: number; total: number }) =>
			onProgress(total > 0 ? Math.min(1, loaded / total) : null);
	}
	return { task, document: task.promise };
}

/** A message a person on site can act on, from whatever pdf.js threw while opening a file. */
export function describeOpenFailure(err: unknown): string {
	const name = err instanceof Error ? err.name : '';
	const status = (err as { status?: unknown } | null)?.status;
	if (name === 'ResponseException' && typeof status === 'number') {
		if (status === 401)
			return 'Your sign-in has expired. Sign in again, then come back to this drawing.';
		if (status === 403) return 'Your role on this project does not allow opening this file.';
		if (status === 404)
			return 'The file of this revision is missing on the server. Ask the document controller to upload it again.';
		return `The server could not send the file (HTTP ${status}). Try again in a moment; if it keeps failing, tell your administrator.`;
	}
	if (name === 'InvalidPDFException')
		return 'This file is not a readable PDF. Ask the document controller to upload the revision again.';
	if (name === 'PasswordException')
		return 'This PDF is password-protected. Ask the document controller for an unprotected copy.';
	return 'The drawing could not be downloaded. Check the network connection and try again.';
}
