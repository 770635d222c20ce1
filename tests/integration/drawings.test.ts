import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { and, count, eq, ne } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as drawings from '$lib/server/drawings';
import { config } from '$lib/server/config';
import { drawingListQuery } from '$lib/schemas/drawing';
import type { StagedUpload } from '$lib/server/staged-uploads';
import { drawingPdf } from '../fixtures/pdfs';

async function staged(bytes: Uint8Array): Promise<StagedUpload> {
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

const query = (q: Record<string, string> = {}) => drawingListQuery.parse(q);
let inspectorId: string;
let lbm: number;

beforeAll(async () => {
	await seedIfEmpty();
	inspectorId = db
		.select()
		.from(schema.users)
		.where(eq(schema.users.email, 'doccon@tacksheet.test'))
		.get()!.id;
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
}, 120_000);

describe('drawing register', () => {
	it('searches number and title, filters and pages in SQL', () => {
		const all = drawings.list(lbm, query());
		expect(all.total).toBe(7);
		expect(all.items.map((d) => d.number)).toEqual([...all.items.map((d) => d.number)].sort());
		expect(drawings.list(lbm, query({ q: 'effluent' })).items.map((d) => d.number)).toEqual([
			'LBM-20-ISO-1102',
			'LBM-20-SP-1102-03'
		]);
		expect(drawings.list(lbm, query({ q: '1103' })).items.map((d) => d.number)).toEqual([
			'LBM-20-ISO-1103'
		]);
		expect(drawings.list(lbm, query({ kind: 'structural' })).items.map((d) => d.number)).toEqual([
			'LBM-20-STR-2001'
		]);
		expect(drawings.list(lbm, query({ area: 'Area 21' })).total).toBe(2);
		const page2 = drawings.list(lbm, query({ pageSize: '3', page: '2' }));
		expect(page2.items).toHaveLength(3);
		expect(page2.total).toBe(7);
		// A % in the search is a character, not a wildcard.
		expect(drawings.list(lbm, query({ q: '%' })).total).toBe(0);
	});

	it('knows which drawings have pins to review and which are complete', () => {
		const review = drawings.list(lbm, query({ status: 'review' })).items.map((d) => d.number);
		expect(review).toContain('LBM-20-ISO-1101');
		const open = drawings.list(lbm, query({ status: 'open' })).items;
		for (const d of open)
			expect(d.counts.accepted).toBeLessThan(
				Object.values(d.counts).reduce((a, b) => a + b, 0) - d.counts.void
			);
	});

	it('counts joints per state for each drawing, agreeing with a plain count', () => {
		for (const item of drawings.list(lbm, query()).items) {
			const direct = db
				.select({ n: count() })
				.from(schema.joints)
				.where(eq(schema.joints.drawingId, item.id))
				.get()!.n;
			expect(Object.values(item.counts).reduce((a, b) => a + b, 0)).toBe(direct);
		}
	});
});

describe('a new revision', () => {
	it('supersedes the current one and carries every live pin to it, flagged for review', async () => {
		const drawing = drawings.list(lbm, query({ q: 'LBM-20-ISO-1104' })).items[0];
		const before = drawings.currentRevisionId(drawing.id)!;
		const livePins = db
			.select({ n: count() })
			.from(schema.pins)
			.innerJoin(schema.joints, eq(schema.joints.id, schema.pins.jointId))
			.where(and(eq(schema.pins.revisionId, before), ne(schema.joints.state, 'void')))
			.get()!.n;
		const file = await staged(await drawingPdf({ label: 'ISO-1104 rev 1' }));
		const result = await drawings.addRevision(
			lbm,
			drawing.id,
			{ label: '1', note: 'Support moved' },
			file,
			inspectorId
		);
		expect(result).toMatchObject({ superseded: '0', pinsCarried: livePins });
		expect(fs.existsSync(file.tempPath)).toBe(false);
		expect(drawings.revision(before)!.status).toBe('superseded');
		const created = drawings.revision(result.revisionId)!;
		expect(created).toMatchObject({ status: 'current', label: '1', pageCount: 1 });
		const carried = db
			.select()
			.from(schema.pins)
			.where(eq(schema.pins.revisionId, result.revisionId))
			.all();
		expect(carried).toHaveLength(livePins);
		expect(carried.every((p) => p.needsReview)).toBe(true);
		const old = db.select().from(schema.pins).where(eq(schema.pins.revisionId, before)).all();
		for (const pin of carried) {
			const source = old.find((o) => o.jointId === pin.jointId)!;
			expect([pin.x, pin.y]).toEqual([source.x, source.y]);
		}
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.action, 'supersede'))
			.all();
		expect(audit.at(-1)?.entityId).toBe(String(drawing.id));
	});

	it('refuses a duplicate number, label or file with 409, removing the staged file', async () => {
		const bytes = await drawingPdf({ label: 'dup' });
		const a = await staged(bytes);
		await expect(
			drawings.create(
				lbm,
				{
					number: 'LBM-20-ISO-1105',
					title: '',
					kind: 'isometric',
					revision: '0',
					note: '',
					line: '',
					area: '',
					system: ''
				},
				a,
				inspectorId
			)
		).rejects.toMatchObject({ status: 409 });
		expect(fs.existsSync(a.tempPath)).toBe(false);
		const drawing = drawings.list(lbm, query({ q: 'LBM-20-ISO-1105' })).items[0];
		const b = await staged(bytes);
		await expect(
			drawings.addRevision(lbm, drawing.id, { label: '0', note: '' }, b, inspectorId)
		).rejects.toMatchObject({ status: 409 });
		expect(fs.existsSync(b.tempPath)).toBe(false);
		const stored = fs.readFileSync(
			path.join(config.uploadsDir, drawings.revision(drawing.revisionId!)!.fileKey)
		);
		const c = await staged(new Uint8Array(stored));
		await expect(
			drawings.addRevision(lbm, drawing.id, { label: '7', note: '' }, c, inspectorId)
		).rejects.toThrow(/already stored as revision 0/);
		expect(fs.existsSync(c.tempPath)).toBe(false);
	});
});
