/**
 * Uploads sent together: the duplicate checks must hold while each file is being read (the
 * check of one upload awaits the PDF reader, and others run meanwhile). One lands, the rest are
 * 409, and none leaves a file behind.
 */
import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { and, count, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as drawings from '$lib/server/drawings';
import { config } from '$lib/server/config';
import type { StagedUpload } from '$lib/server/staged-uploads';
import { drawingPdf } from '../fixtures/pdfs';

function staged(bytes: Uint8Array): StagedUpload {
	const dir = path.join(config.uploadsDir, 'tmp');
	fs.mkdirSync(dir, { recursive: true });
	const tempPath = path.join(dir, `${crypto.randomUUID()}.part`);
	fs.writeFileSync(tempPath, bytes);
	return {
		tempPath,
		bytes: bytes.byteLength,
		sha256: crypto.createHash('sha256').update(bytes).digest('hex'),
		originalName: 'x.pdf',
		createdAt: Date.now()
	};
}

const fields = (number: string) => ({
	number,
	title: '',
	kind: 'isometric' as const,
	revision: '0',
	note: '',
	line: '',
	area: '',
	system: ''
});

async function outcomes(calls: Promise<unknown>[]) {
	const settled = await Promise.allSettled(calls);
	return {
		landed: settled.filter((s) => s.status === 'fulfilled').length,
		statuses: settled
			.filter((s): s is PromiseRejectedResult => s.status === 'rejected')
			.map((s) => (s.reason as { status?: number }).status ?? String(s.reason))
	};
}

function storedRevisionFiles(): string[] {
	const dir = path.join(config.uploadsDir, 'revisions');
	return fs.existsSync(dir) ? fs.readdirSync(dir) : [];
}

let userId: string;
let lbm: number;
beforeAll(async () => {
	await seedIfEmpty();
	userId = db
		.select()
		.from(schema.users)
		.where(eq(schema.users.email, 'doccon@tacksheet.test'))
		.get()!.id;
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
}, 120_000);

describe('uploads sent together', () => {
	it('one drawing number: one is registered, the others are 409', async () => {
		const files = await Promise.all(
			[1, 2, 3, 4].map(async (i) => staged(await drawingPdf({ label: `RACE-${i}` })))
		);
		const before = storedRevisionFiles().length;
		const result = await outcomes(
			files.map((file) => drawings.create(lbm, fields('LBM-20-ISO-7001'), file, userId))
		);
		expect(result).toEqual({ landed: 1, statuses: [409, 409, 409] });
		const rows = db
			.select({ n: count() })
			.from(schema.drawings)
			.where(and(eq(schema.drawings.projectId, lbm), eq(schema.drawings.number, 'LBM-20-ISO-7001')))
			.get()!.n;
		expect(rows).toBe(1);
		expect(storedRevisionFiles().length).toBe(before + 1);
		expect(files.every((f) => !fs.existsSync(f.tempPath))).toBe(true);
	});

	it('one revision label, or the identical file under other labels: one lands, the others are 409', async () => {
		const drawing = drawings.list(lbm, { ...listQuery, q: 'LBM-20-ISO-7001' }).items[0];
		const labelled = await Promise.all(
			[1, 2, 3].map(async (i) => staged(await drawingPdf({ label: `LABEL-${i}` })))
		);
		const byLabel = await outcomes(
			labelled.map((file) =>
				drawings.addRevision(lbm, drawing.id, { label: 'A', note: '' }, file, userId)
			)
		);
		expect(byLabel).toEqual({ landed: 1, statuses: [409, 409] });

		const bytes = await drawingPdf({ label: 'SAME FILE' });
		const same = ['B', 'C', 'D'].map((label) => ({ label, file: staged(bytes) }));
		const byFile = await outcomes(
			same.map(({ label, file }) =>
				drawings.addRevision(lbm, drawing.id, { label, note: '' }, file, userId)
			)
		);
		expect(byFile).toEqual({ landed: 1, statuses: [409, 409] });
		const revisions = drawings.history(drawing.id);
		expect(revisions.map((r) => r.label).sort()).toHaveLength(3);
		expect(revisions.filter((r) => r.status === 'current')).toHaveLength(1);
		expect([...labelled, ...same.map((s) => s.file)].every((f) => !fs.existsSync(f.tempPath))).toBe(
			true
		);
	});
});

const listQuery = {
	q: '',
	sort: 'number' as const,
	dir: 'asc' as const,
	page: 1,
	pageSize: 50
};
