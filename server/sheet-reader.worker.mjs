// The worker thread behind src/lib/server/sheet-text/reader.ts: pdf.js parses on the thread
// that calls it, and a dense sheet takes long enough to stall every other request, so sheets
// are read here. One job at a time; each page's geometry is posted as soon as it is read.
import { parentPort } from 'node:worker_threads';
import { readSheets, renderCrops } from './sheet-reader.mjs';

if (!parentPort) throw new Error('sheet-reader.worker.mjs runs only as a worker thread');
const port = parentPort;

/** The app takes one page at a time: the next is read once it says so. */
/** @type {(() => void) | null} */
let taken = null;

port.on('message', async (/** @type {any} */ job) => {
	if (job.kind === 'next') {
		taken?.();
		return;
	}
	try {
		if (job.kind === 'read') {
			const pageCount = await readSheets(new Uint8Array(job.data), async (page) => {
				const next = new Promise((resolve) => (taken = () => resolve(undefined)));
				port.postMessage({ id: job.id, kind: 'page', page });
				await next;
				taken = null;
			});
			port.postMessage({ id: job.id, kind: 'done', pageCount });
		} else if (job.kind === 'crops') {
			const crops = await renderCrops(
				new Uint8Array(job.data),
				job.pageIndex,
				job.boxes,
				job.pxPerPt
			);
			port.postMessage(
				{ id: job.id, kind: 'done', crops },
				crops ? crops.map((c) => c.grey.buffer) : []
			);
		} else {
			throw new Error(`unknown job ${job.kind}`);
		}
	} catch (error) {
		port.postMessage({
			id: job.id,
			kind: 'error',
			name: error instanceof Error ? error.name : 'Error',
			message: error instanceof Error ? error.message : String(error)
		});
	}
});
