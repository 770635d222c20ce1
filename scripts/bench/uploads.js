// Server memory while a 150 MB drawing is uploaded: the upload must stream to disk, not sit
// in memory. Goal: under 64 MB above idle.
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { rssMb, startBenchServer } from './server.js';
import { signIn } from './session.js';

const MEGABYTES = 150;

/** A one-page PDF carrying about `mb` of incompressible data, as a scanned A0 sheet might. */
async function writeBigPdf(file, mb) {
	const pdf = await PDFDocument.create();
	const page = pdf.addPage([3370, 2384]);
	page.drawText('BENCH SHEET A0', {
		x: 100,
		y: 2200,
		size: 60,
		font: await pdf.embedFont(StandardFonts.Helvetica)
	});
	const filler = Buffer.alloc(mb * 1024 * 1024);
	crypto.randomFillSync(filler);
	pdf.context.register(pdf.context.stream(filler));
	fs.writeFileSync(file, await pdf.save({ useObjectStreams: false }));
}

export async function run() {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-pdf-'));
	const file = path.join(dir, 'big.pdf');
	await writeBigPdf(file, MEGABYTES);
	const bytes = fs.statSync(file).size;
	const server = await startBenchServer({ env: { UPLOAD_MAX_MB: '200' } });
	try {
		const cookie = await signIn(server.origin, 'doccon@tacksheet.test');
		// Let the first-start work settle before taking the idle figure.
		await new Promise((r) => setTimeout(r, 1500));
		const idle = rssMb(server.pid);
		let peak = idle;
		const sampler = setInterval(() => (peak = Math.max(peak, rssMb(server.pid))), 25);
		const form = new FormData();
		form.set('number', 'BENCH-A0-1');
		form.set('title', 'Bench sheet');
		form.set('kind', 'structural');
		form.set('file', await fs.openAsBlob(file, { type: 'application/pdf' }), 'big.pdf');
		const started = performance.now();
		const response = await fetch(`${server.origin}/api/projects/1/drawings`, {
			method: 'POST',
			headers: { cookie, origin: server.origin },
			body: form
		});
		const body = await response.json();
		const ms = performance.now() - started;
		clearInterval(sampler);
		if (response.status !== 201)
			throw new Error(`upload answered ${response.status}: ${JSON.stringify(body)}`);
		console.log(
			`upload of a ${(bytes / 1024 / 1024).toFixed(0)} MB PDF: ${(ms / 1000).toFixed(1)} s, answered 201 with ${body.revision.pageCount} page(s)`
		);
		console.log(
			`server memory: idle ${idle.toFixed(0)} MB, peak during upload ${peak.toFixed(0)} MB, growth ${(peak - idle).toFixed(0)} MB (goal: under 64 MB)`
		);
	} finally {
		await server.stop();
		fs.rmSync(dir, { recursive: true, force: true });
	}
}
