import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { inspectPdf } from '$lib/server/pdf-inspect';
import { damagedPdf, drawingPdf, passwordProtectedPdf } from '../fixtures/pdfs';

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
