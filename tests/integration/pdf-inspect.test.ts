import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { inspectPdf } from '$lib/server/pdf-inspect';
import {
	damagedPdf,
	drawingPdf,
	emptyDocumentPdf,
	handWrittenPdf,
	passwordProtectedPdf
} from '../fixtures/pdfs';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-inspect-'));
function write(name: string, bytes: Uint8Array) {
	const file = path.join(dir, name);
	fs.writeFileSync(file, bytes);
	return file;
}

describe('reading an uploaded PDF', () => {
	it('counts the pages and keeps each view box and rotation', async () => {
		const result = await inspectPdf(
			write('two.pdf', await drawingPdf({ pages: 2, rotate: 90, width: 792, height: 1224 }))
		);
		expect(result).toEqual({
			ok: true,
			pageCount: 2,
			pages: [
				{ index: 0, x0: 0, y0: 0, x1: 792, y1: 1224, rotation: 90 },
				{ index: 1, x0: 0, y0: 0, x1: 792, y1: 1224, rotation: 90 }
			]
		});
	});

	it('calls a damaged file damaged', async () => {
		const result = await inspectPdf(write('bad.pdf', damagedPdf()));
		expect(result.ok).toBe(false);
		if (!result.ok) {
			expect(result.reason).toBe('damaged');
			expect(result.message).toMatch(/damaged/);
		}
	});

	it('refuses a password-protected file and says so', async () => {
		const result = await inspectPdf(write('locked.pdf', passwordProtectedPdf()));
		expect(result).toMatchObject({ ok: false, reason: 'encrypted' });
		if (!result.ok) expect(result.message).toMatch(/password/);
	});
});

describe('what an uploaded PDF may be', () => {
	it('refuses a PDF with no pages, and one whose only page is blank', async () => {
		// pdf-lib saves a document given no pages with one blank A4 page (PDFDocument.save, addDefaultPage).
		for (const [name, bytes] of [
			['none.pdf', handWrittenPdf({ pages: 0 })],
			['blank.pdf', await emptyDocumentPdf()],
			['undrawn.pdf', handWrittenPdf({ pages: 2, drawn: false })]
		] as const) {
			const result = await inspectPdf(write(name, bytes));
			expect(result, name).toMatchObject({ ok: false, reason: 'empty' });
		}
		expect((await inspectPdf(write('drawn.pdf', handWrittenPdf({ pages: 1 })))).ok).toBe(true);
	});

	it('refuses a sheet larger than 200 in on a side, counting its UserUnit', async () => {
		// ISO 32000-1 Annex C.2: 14,400 units (200 in) is the largest page side at UserUnit 1.
		const huge = await inspectPdf(write('huge.pdf', handWrittenPdf({ width: 1e9, height: 1e9 })));
		expect(huge).toMatchObject({ ok: false, reason: 'page-size' });
		if (!huge.ok) expect(huge.message).toMatch(/at most 200 in/);
		const scaled = await inspectPdf(
			write('scaled.pdf', handWrittenPdf({ width: 1000, height: 1000, userUnit: 100 }))
		);
		expect(scaled).toMatchObject({ ok: false, reason: 'page-size' });
		// A0 landscape (ISO 216: 1189 × 841 mm) is an ordinary sheet.
		const a0 = await inspectPdf(write('a0.pdf', handWrittenPdf({ width: 3370, height: 2384 })));
		expect(a0.ok).toBe(true);
		// The largest sheet allowed, exactly.
		const edge = await inspectPdf(
			write('edge.pdf', handWrittenPdf({ width: 14_400, height: 100 }))
		);
		expect(edge.ok).toBe(true);
	});

	it('refuses more pages than the limit, naming the limit, without walking them', async () => {
		const file = write('many.pdf', handWrittenPdf({ pages: 20_000 }));
		let ticks = 0;
		const ticker = setInterval(() => ticks++, 5);
		const result = await inspectPdf(file, { maxPages: 500 });
		clearInterval(ticker);
		expect(result).toMatchObject({ ok: false, reason: 'too-many-pages' });
		if (!result.ok) expect(result.message).toMatch(/20000 pages.*at most 500/);
		// The check ran on its worker: this thread's timers kept running meanwhile.
		expect(ticks).toBeGreaterThan(0);
	});

	it('walks a large file on its worker while this thread keeps answering', async () => {
		const file = write('walk.pdf', handWrittenPdf({ pages: 1500 }));
		const inspection = inspectPdf(file, { maxPages: 5000 });
		let finished = false;
		void inspection.then(() => (finished = true));
		// A timer set after the check started fires before the check is done.
		await new Promise((r) => setTimeout(r, 20));
		expect(finished).toBe(false);
		const result = await inspection;
		expect(result).toMatchObject({ ok: true, pageCount: 1500 });
	}, 120_000);

	it('refuses a file that takes longer than the time limit to check, and checks the next', async () => {
		const slow = inspectPdf(write('slow.pdf', handWrittenPdf({ pages: 1500 })), {
			maxPages: 5000,
			timeoutMs: 50
		});
		const next = inspectPdf(write('next.pdf', handWrittenPdf({ pages: 1 })));
		expect(await slow).toMatchObject({ ok: false, reason: 'timeout' });
		expect(await next).toMatchObject({ ok: true, pageCount: 1 });
	}, 120_000);
});
