import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { createRequire } from 'node:module';
import { eq } from 'drizzle-orm';
import yauzl from 'yauzl';
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { getDocument, Util } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as exports from '$lib/server/exports';
import * as pinRows from '$lib/server/pins';
import * as storage from '$lib/server/storage';
import { config } from '$lib/server/config';
import { resolve as resolveScope } from '$lib/server/export/scope';
import { buildMarkedUpSet, coverPageCount, planStamps } from '$lib/server/export/marked-up-set';
import { embedFonts } from '$lib/server/export/pdf-marks';
import { readSheetGeometry } from '$lib/server/sheet-text/reader';
import fontkit from '@pdf-lib/fontkit';
import { emptyCounts } from '$lib/state-counts';
import { JOINT_STATES, STATE_LOOKS } from '$lib/joint-state';
import { PDFDocument, degrees } from 'pdf-lib';
import { STAMP, normaliseRotation, shownToUser } from '$lib/server/export/sheet-frame';
import * as mail from '$lib/server/mail';
import type { ExportRequest } from '$lib/schemas/export';
import { damagedPdf, passwordProtectedPdf } from '../fixtures/pdfs';
import { csvNotice } from '../fixtures/csv';
import { CAUTION, CAUTION_LEAD } from '$lib/caution';
import { SUFFIX_KEY } from '$lib/server/export/cover';

const require = createRequire(import.meta.url);
const standardFontDataUrl =
	path.join(path.dirname(require.resolve('pdfjs-dist/package.json')), 'standard_fonts') + path.sep;

let lbm: number;
let turnover: { id: string; email: string; name: string | null };

beforeAll(async () => {
	await seedIfEmpty();
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
	turnover = db
		.select()
		.from(schema.users)
		.where(eq(schema.users.email, 'turnover@tacksheet.test'))
		.get()!;
}, 120_000);

function unzip(file: string): Promise<{ name: string; bytes: Buffer }[]> {
	return new Promise((resolve, reject) => {
		yauzl.open(file, { lazyEntries: true }, (error, zip) => {
			if (error || !zip) return reject(error);
			const entries: { name: string; bytes: Buffer }[] = [];
			zip.on('entry', (entry: yauzl.Entry) => {
				zip.openReadStream(entry, (err, stream) => {
					if (err || !stream) return reject(err);
					const chunks: Buffer[] = [];
					stream.on('data', (c: Buffer) => chunks.push(c));
					stream.on('end', () => {
						entries.push({ name: entry.fileName, bytes: Buffer.concat(chunks) });
						zip.readEntry();
					});
				});
			});
			zip.on('end', () => resolve(entries));
			zip.on('error', reject);
			zip.readEntry();
		});
	});
}

/**
 * Each entry's DOS date as UTC (zip APPNOTE 4.4.6: two-second resolution, no zone; the
 * writers here write UTC fields), read by yauzl.
 */
function zipDates(file: string): Promise<{ name: string; date: number }[]> {
	return new Promise((resolve, reject) => {
		yauzl.open(file, { lazyEntries: true }, (error, zip) => {
			if (error || !zip) return reject(error);
			const dates: { name: string; date: number }[] = [];
			zip.on('entry', (entry: yauzl.Entry) => {
				dates.push({
					name: entry.fileName,
					date: entry.getLastModDate({ forceDosFormat: true, timezone: 'UTC' }).getTime()
				});
				zip.readEntry();
			});
			zip.on('end', () => resolve(dates));
			zip.on('error', reject);
			zip.readEntry();
		});
	});
}

async function exportAndWait(request: ExportRequest) {
	const { id } = exports.start(lbm, request, turnover.id, 'http://tacksheet.test');
	await exports.whenSettled(id);
	const status = exports.status(id)!;
	return { id, status };
}

async function zipOf(id: number) {
	const file = exports.fileOf(id);
	const full = storage.pathOf(file.fileKey);
	expect(crypto.createHash('sha256').update(fs.readFileSync(full)).digest('hex')).toBe(file.sha256);
	return unzip(full);
}

interface Manifest {
	files: { name: string; bytes: number; sha256: string }[];
	sources: {
		drawing: string;
		revision: string;
		sha256: string;
		included: boolean;
		problem?: string;
	}[];
	app: { version: string };
	pages: number;
	exportDay: string;
	recordsAsOf: string | null;
}

const sha = (bytes: Uint8Array) => crypto.createHash('sha256').update(bytes).digest('hex');

describe('a turnover set of the demo project', () => {
	const request: ExportRequest = {
		scope: { all: true },
		includeSuperseded: false,
		acceptedOnly: false
	};
	let entries: { name: string; bytes: Buffer }[];
	let id: number;

	beforeAll(async () => {
		const done = await exportAndWait(request);
		id = done.id;
		expect(done.status.status, done.status.report.join('\n')).toBe('done');
		entries = await zipOf(id);
	}, 120_000);

	it('holds the files in a fixed order, each with its SHA-256 in the manifest', () => {
		expect(entries.map((e) => e.name)).toEqual([
			'marked-up-set.pdf',
			'weld-log.xlsx',
			'weld-log.csv',
			'inspections.csv',
			'nde-register.csv',
			'manifest.json'
		]);
		const manifest = JSON.parse(entries.at(-1)!.bytes.toString('utf8')) as Manifest;
		expect(manifest.files.map((f) => f.name)).toEqual(entries.slice(0, -1).map((e) => e.name));
		for (const file of manifest.files) {
			const entry = entries.find((e) => e.name === file.name)!;
			expect(sha(entry.bytes), file.name).toBe(file.sha256);
			expect(entry.bytes.byteLength).toBe(file.bytes);
		}
		expect(manifest.app.version).toBe(
			JSON.parse(fs.readFileSync('package.json', 'utf8')).version as string
		);
		// The manifest's time is the newest record behind the set, read here straight from the tables.
		const newest = db.$client
			.prepare(
				`select max(t) as t from (select max(updated_at) as t from joints where project_id = ?
				 union all select max(p.updated_at) from pins p join joints j on j.id = p.joint_id
				   where j.project_id = ?
				 union all select max(w.recorded_at) from welds w join joints j on j.id = w.joint_id
				   where j.project_id = ?
				 union all select max(i.inspected_at) from inspections i join joints j on j.id = i.joint_id
				   where j.project_id = ?)`
			)
			.get(lbm, lbm, lbm, lbm) as { t: number };
		expect(manifest.recordsAsOf).toBe(new Date(newest.t).toISOString());
		expect(manifest.exportDay).toMatch(/^\d{4}-\d{2}-\d{2}$/);
		const revisions = db.select().from(schema.revisions).all();
		for (const source of manifest.sources) {
			expect(source.included).toBe(true);
			expect(revisions.some((r) => r.sha256 === source.sha256 && r.label === source.revision)).toBe(
				true
			);
		}
	});

	it('carries the caution with its verdicts: manifest, cover, workbook notes, both CSV files', async () => {
		const manifest = JSON.parse(entries.at(-1)!.bytes.toString('utf8')) as { notice: string };
		expect(manifest.notice).toBe(CAUTION);
		// The cover's first lines: its heading, then the caution, before the project's title.
		const pdf = await getDocument({ data: new Uint8Array(entries[0].bytes), standardFontDataUrl })
			.promise;
		const page = await pdf.getPage(1);
		const text = (await page.getTextContent()).items
			.map((item) => ('str' in item ? item.str : ''))
			.join(' ')
			.replace(/\s+/g, ' ');
		expect(text.indexOf(CAUTION_LEAD)).toBeGreaterThan(-1);
		expect(text.indexOf(CAUTION_LEAD)).toBeLessThan(text.indexOf('LBM'));
		expect(text).toContain('WELDS IN SCOPE AND KEY');
		for (const key of SUFFIX_KEY) expect(text).toContain(key.replace(/\s+/g, ' '));
		expect(text).not.toMatch(/\bpins?\b/i);
		await pdf.destroy();
		const workbook = new ExcelJS.Workbook();
		await workbook.xlsx.load(entries[1].bytes as unknown as ArrayBuffer);
		expect(workbook.getWorksheet('Notes')?.getRow(2).getCell(1).value).toBe(CAUTION);
		for (const csv of [entries[2], entries[3]])
			expect(csvNotice(csv.bytes.toString('utf8')), csv.name).toBe(`Notice: ${CAUTION}`);
	});

	it('stamps every weld number upright, within 2 points of its pin, on rotated sheets too', async () => {
		const bytes = new Uint8Array(entries[0].bytes);
		const pdf = await getDocument({ data: bytes.slice(), standardFontDataUrl }).promise;
		const drawings = resolveScope(lbm, request);
		const revisions = drawings.flatMap((d) => d.revisions);
		const covers = coverPageCount(revisions.length);
		const sheets = revisions.reduce((n, r) => n + r.sheets.length, 0);
		expect(pdf.numPages).toBe(covers + sheets);
		// The line work of every page, to find the leaders of stamps moved off their pins.
		const lines = new Map<number, number[]>();
		await readSheetGeometry(bytes, (page) => {
			lines.set(page.pageIndex, page.segments);
		});
		const scratch = await PDFDocument.create();
		scratch.registerFontkit(fontkit);
		const fonts = await embedFonts(scratch);

		let pageNo = covers;
		let checked = 0;
		let rotatedChecked = 0;
		let ledChecked = 0;
		for (const revision of revisions) {
			const pins = pinRows.ofRevision(revision.id);
			for (const sheet of revision.sheets) {
				pageNo++;
				const page = await pdf.getPage(pageNo);
				const viewport = page.getViewport({ scale: 1 });
				const text = await page.getTextContent();
				const items = text.items.filter((i) => 'str' in i && 'transform' in i);
				const footer = items.find(
					(i) => 'str' in i && i.str === `Page ${pageNo} of ${pdf.numPages}`
				);
				expect(footer, `footer on page ${pageNo}`).toBeDefined();
				// Every sheet carries the key to its marks (a page read alone still explains them).
				const words = items.map((i) => ('str' in i ? i.str.trim() : ''));
				for (const state of JOINT_STATES)
					expect(words, `key on page ${pageNo}`).toContain(STATE_LOOKS[state].label);
				const onSheet = pins.filter((p) => p.pageIndex === sheet.pageIndex);
				const box = { ...sheet, rotation: normaliseRotation(page.rotate) };
				const { size, placements } = planStamps(box, onSheet, fonts);
				for (const [k, pin] of onSheet.entries()) {
					// The number stands above its glyph: on the pin, or moved off it with a leader.
					const placement = placements[k];
					const glyph = shownToUser(box, placement.u, placement.v);
					const [vx, vy] = viewport.convertToViewportPoint(glyph.x, glyph.y);
					const want = { x: vx, y: vy - size.labelBaseline };
					let best = Infinity;
					let upright = false;
					for (const item of items) {
						if (!('str' in item) || item.str.trim() !== pin.label) continue;
						const m = Util.transform(viewport.transform, item.transform);
						const itemSize = Math.hypot(m[2], m[3]);
						if (Math.abs(itemSize - size.labelSize) > 0.05) continue;
						const along = { x: m[0] / itemSize, y: m[1] / itemSize };
						const centre = {
							x: m[4] + (along.x * item.width) / 2,
							y: m[5] + (along.y * item.width) / 2
						};
						const distance = Math.hypot(centre.x - want.x, centre.y - want.y);
						if (distance < best) {
							best = distance;
							upright = along.x > 0.999 && Math.abs(along.y) < 0.001;
						}
					}
					expect(best, `${pin.label} on page ${pageNo}`).toBeLessThanOrEqual(2);
					expect(upright, `${pin.label} upright on page ${pageNo}`).toBe(true);
					if (placement.offset) {
						// A line drawn from the stamp ends within 2 pt of the pin's own point.
						const from = shownToUser(box, ...placement.leader!.from);
						const segments = lines.get(pageNo - 1)!;
						let led = false;
						for (let i = 0; i + 3 < segments.length && !led; i += 4) {
							const [ax, ay, bx, by] = segments.slice(i, i + 4);
							for (const [near, far] of [
								[
									[ax, ay],
									[bx, by]
								],
								[
									[bx, by],
									[ax, ay]
								]
							])
								if (
									Math.hypot(near[0] - pin.x, near[1] - pin.y) <= 2 &&
									Math.hypot(far[0] - from.x, far[1] - from.y) <= 2
								)
									led = true;
						}
						expect(led, `leader of ${pin.label} on page ${pageNo}`).toBe(true);
						ledChecked++;
					} else {
						expect(Math.hypot(glyph.x - pin.x, glyph.y - pin.y)).toBeLessThan(0.01);
					}
					checked++;
					if (page.rotate === 90) rotatedChecked++;
				}
			}
		}
		expect(checked).toBeGreaterThan(20);
		expect(rotatedChecked).toBeGreaterThan(0);
		// The demo's crowded sheets put some stamps off their pins.
		expect(ledChecked).toBeGreaterThan(0);
		await pdf.destroy();
	});

	it('writes one weld-log row per joint and every inspection record', () => {
		const jointCount = db
			.select()
			.from(schema.joints)
			.where(eq(schema.joints.projectId, lbm))
			.all().length;
		// Each CSV: the caution's line, the header, the rows.
		const csv = entries[2].bytes.toString('utf8').trim().split('\r\n');
		expect(csv[0]).toContain(CAUTION);
		expect(csv.length - 2).toBe(jointCount);
		const inspectionCount = db
			.select()
			.from(schema.inspections)
			.innerJoin(schema.joints, eq(schema.joints.id, schema.inspections.jointId))
			.where(eq(schema.joints.projectId, lbm))
			.all().length;
		const lines = entries[3].bytes.toString('utf8').trim().split('\r\n');
		expect(lines.length - 2).toBe(inspectionCount);
		expect(lines[0]).toContain(CAUTION);
		expect(lines[1]).toContain('Readings as typed');
	});

	it('gives the same files in the same order for unchanged data', async () => {
		const again = await exportAndWait(request);
		expect(again.status.status).toBe('done');
		const second = await zipOf(again.id);
		expect(second.map((e) => e.name)).toEqual(entries.map((e) => e.name));
		for (const name of entries.map((e) => e.name)) {
			expect(sha(second.find((e) => e.name === name)!.bytes), name).toBe(
				sha(entries.find((e) => e.name === name)!.bytes)
			);
		}
		// The whole zip too: the history's SHA-256 (hashed by Node's crypto above) is the same.
		expect(exports.fileOf(again.id).sha256).toBe(exports.fileOf(id).sha256);
	}, 120_000);

	it('dates the weld-log workbook and every part inside it on the export day', async () => {
		const status = exports.status(id)!;
		const exportDay = new Date(
			`${new Date(status.startedAt!).toISOString().slice(0, 10)}T00:00:00.000Z`
		);
		const xlsx = entries.find((e) => e.name === 'weld-log.xlsx')!.bytes;
		// Read back with exceljs (the registry's reader) and with yauzl, independently of the writer.
		const workbook = new ExcelJS.Workbook();
		await workbook.xlsx.load(xlsx as unknown as ArrayBuffer);
		expect(workbook.created?.getTime()).toBe(exportDay.getTime());
		expect(workbook.modified?.getTime()).toBe(exportDay.getTime());
		expect(workbook.getWorksheet('Weld log')?.rowCount).toBeGreaterThan(1);
		const file = path.join(config.uploadsDir, `weld-log-${id}.xlsx`);
		fs.writeFileSync(file, xlsx);
		const parts = await zipDates(file);
		expect(parts.length).toBeGreaterThan(5);
		for (const part of parts) expect(part.date, part.name).toBe(exportDay.getTime());
		// The turnover zip's own entries carry the same date.
		for (const part of await zipDates(storage.pathOf(exports.fileOf(id).fileKey)))
			expect(part.date, part.name).toBe(exportDay.getTime());
	});

	it('tells the person who started it, with the link', () => {
		const message = mail.latestTo(turnover.email);
		expect(message?.subject).toBe('Turnover set ready: LBM-20');
		expect(message?.text).toContain('http://tacksheet.test/api/exports/');
		expect(message?.text).toContain(`kept for ${config.exportKeepDays} days`);
	});
});

describe('a damaged or locked source', () => {
	it('fails that drawing with a clear line and completes the rest', async () => {
		const drawings = resolveScope(lbm, {
			scope: { all: true },
			includeSuperseded: false,
			acceptedOnly: false
		});
		const [damaged, locked, ...rest] = drawings;
		const keep = rest.slice(0, 2);
		const damagedRev = damaged.revisions[0];
		const lockedRev = locked.revisions[0];
		const originals = [
			await storage.readAll(damagedRev.fileKey),
			await storage.readAll(lockedRev.fileKey)
		];
		await storage.put(damagedRev.fileKey, damagedPdf());
		await storage.put(lockedRev.fileKey, passwordProtectedPdf());
		try {
			const { id, status } = await exportAndWait({
				scope: { drawings: [damaged.id, locked.id, ...keep.map((d) => d.id)] },
				includeSuperseded: false,
				acceptedOnly: false
			});
			expect(status.status).toBe('done');
			expect(status.report.find((l) => l.startsWith(`${damaged.number} rev`))).toMatch(
				/not included, the stored PDF is damaged/
			);
			expect(status.report.find((l) => l.startsWith(`${locked.number} rev`))).toMatch(
				/not included, the stored PDF is password-protected/
			);
			const entries = await zipOf(id);
			const manifest = JSON.parse(entries.at(-1)!.bytes.toString('utf8')) as Manifest;
			expect(manifest.sources.filter((s) => !s.included).map((s) => s.drawing)).toEqual([
				damaged.number,
				locked.number
			]);
			const pdf = await getDocument({ data: new Uint8Array(entries[0].bytes), standardFontDataUrl })
				.promise;
			const sheets = keep.reduce((n, d) => n + d.revisions[0].sheets.length, 0);
			expect(pdf.numPages).toBe(coverPageCount(4) + sheets);
			await pdf.destroy();
		} finally {
			await storage.put(damagedRev.fileKey, originals[0]);
			await storage.put(lockedRev.fileKey, originals[1]);
		}
	}, 120_000);
});

describe('the job', () => {
	it('refuses a second identical job while one runs, and can be cancelled', async () => {
		const request: ExportRequest = {
			scope: { all: true },
			includeSuperseded: true,
			acceptedOnly: false
		};
		const first = exports.start(lbm, request, turnover.id, 'http://tacksheet.test');
		expect(() => exports.start(lbm, request, turnover.id, 'http://tacksheet.test')).toThrow(
			expect.objectContaining({ status: 409, exportId: first.id })
		);
		const other = exports.cancel(first.id, turnover.id);
		expect(other.status).toBe('cancelled');
		await exports.whenSettled(first.id);
		expect(exports.status(first.id)).toMatchObject({ status: 'cancelled', fileUrl: undefined });
		expect(() => exports.fileOf(first.id)).toThrow(expect.objectContaining({ status: 409 }));
		const folder = path.join(config.uploadsDir, 'exports');
		const leftovers = fs.existsSync(folder)
			? fs.readdirSync(folder).filter((name) => name.endsWith('.part'))
			: [];
		expect(leftovers).toEqual([]);
		// Once it is over, the same set may be asked for again.
		const next = exports.start(lbm, request, turnover.id, 'http://tacksheet.test');
		exports.cancel(next.id, turnover.id);
		await exports.whenSettled(next.id);
	});

	it('treats the same drawings in another order as the same set', () => {
		const ids = resolveScope(lbm, {
			scope: { all: true },
			includeSuperseded: false,
			acceptedOnly: false
		})
			.slice(0, 3)
			.map((d) => d.id);
		const a = exports.start(
			lbm,
			{ scope: { drawings: ids }, includeSuperseded: false, acceptedOnly: true },
			turnover.id,
			''
		);
		expect(() =>
			exports.start(
				lbm,
				{ scope: { drawings: [...ids].reverse() }, includeSuperseded: false, acceptedOnly: true },
				turnover.id,
				''
			)
		).toThrow(expect.objectContaining({ status: 409 }));
		exports.cancel(a.id, turnover.id);
	});

	it('marks a job left running by a stopped server as failed', () => {
		const row = db
			.insert(schema.exports)
			.values({
				projectId: lbm,
				scope: { all: true },
				scopeKey: 'stale',
				status: 'running',
				requestedBy: turnover.id
			})
			.returning()
			.get();
		expect(exports.recoverInterrupted()).toBeGreaterThanOrEqual(1);
		const after = exports.status(row.id)!;
		expect(after.status).toBe('failed');
		expect(after.report.at(-1)).toMatch(/server stopped/);
	});
});

describe('keeping and removing the zip', () => {
	const DAY = 86_400_000;
	async function smallExport(drawingIndex: number) {
		const drawing = resolveScope(lbm, {
			scope: { all: true },
			includeSuperseded: false,
			acceptedOnly: false
		})[drawingIndex];
		const done = await exportAndWait({
			scope: { drawings: [drawing.id] },
			includeSuperseded: false,
			acceptedOnly: false
		});
		expect(done.status.status).toBe('done');
		return { id: done.id, file: storage.pathOf(exports.fileOf(done.id).fileKey) };
	}
	const auditOf = (id: number) =>
		db
			.select()
			.from(schema.auditEvents)
			.where(eq(schema.auditEvents.entityId, String(id)))
			.all()
			.filter((a) => a.entity === 'export' && a.action === 'export.file.remove');

	it('lets a person remove a finished zip; the record, size and SHA-256 stay', async () => {
		const { id, file } = await smallExport(0);
		const before = exports.status(id)!;
		const after = await exports.removeFile(id, turnover.id);
		expect(fs.existsSync(file)).toBe(false);
		expect(after).toMatchObject({ status: 'done', fileUrl: undefined, bytes: before.bytes });
		expect(after.sha256).toBe(before.sha256);
		expect(after.removed).toMatchObject({ by: turnover.name });
		expect(() => exports.fileOf(id)).toThrow(
			expect.objectContaining({ status: 410, message: expect.stringMatching(/removed on/) })
		);
		await expect(exports.removeFile(id, turnover.id)).rejects.toMatchObject({ status: 409 });
		const events = auditOf(id);
		expect(events).toHaveLength(1);
		expect(events[0]).toMatchObject({ userId: turnover.id });
		expect(events[0].before).toMatchObject({ sha256: before.sha256, bytes: before.bytes });
	}, 60_000);

	it('refuses to remove the file of a job that has not finished', async () => {
		const queued = exports.start(
			lbm,
			{ scope: { all: true }, includeSuperseded: true, acceptedOnly: true },
			turnover.id,
			''
		);
		await expect(exports.removeFile(queued.id, turnover.id)).rejects.toMatchObject({
			status: 409
		});
		exports.cancel(queued.id, turnover.id);
		await exports.whenSettled(queued.id);
	});

	it('removes zips past the keeping time, and only those, and says so in the audit', async () => {
		const old = await smallExport(1);
		const fresh = await smallExport(2);
		const now = Date.now();
		db.update(schema.exports)
			.set({ finishedAt: now - 31 * DAY })
			.where(eq(schema.exports.id, old.id))
			.run();
		// 0 keeps every zip.
		expect((await exports.sweep(now, 0)).expired).toBe(0);
		expect(fs.existsSync(old.file)).toBe(true);
		const swept = await exports.sweep(now, 30);
		expect(swept.expired).toBe(1);
		expect(fs.existsSync(old.file)).toBe(false);
		expect(fs.existsSync(fresh.file)).toBe(true);
		expect(exports.status(old.id)!.removed).toMatchObject({ by: null, reason: 'kept for 30 days' });
		expect(exports.status(fresh.id)!.fileUrl).toBeDefined();
		expect(auditOf(old.id)[0]).toMatchObject({ userId: null });
	}, 60_000);

	it('removes a zip no export points to once it is an hour old', async () => {
		const folder = path.join(config.uploadsDir, 'exports');
		fs.mkdirSync(folder, { recursive: true });
		const stale = path.join(folder, 'left-by-a-crash.zip.part');
		const recent = path.join(folder, 'being-written.zip.part');
		fs.writeFileSync(stale, 'x');
		fs.writeFileSync(recent, 'x');
		const twoHoursAgo = (Date.now() - 2 * 3_600_000) / 1000;
		fs.utimesSync(stale, twoHoursAgo, twoHoursAgo);
		const swept = await exports.sweep();
		expect(swept.orphans).toBe(1);
		expect(fs.existsSync(stale)).toBe(false);
		expect(fs.existsSync(recent)).toBe(true);
		fs.rmSync(recent);
	});
});

describe('stamping a sheet whose boxes do not start at zero', () => {
	it('puts each number over its pin, upright, for every rotation', async () => {
		const source = await PDFDocument.create();
		for (const rotation of [0, 90, 180, 270]) {
			const page = source.addPage([1000, 600]);
			page.setMediaBox(-50, -50, 1000, 600);
			page.setCropBox(0, 0, 800, 500);
			page.setRotation(degrees(rotation));
		}
		const bytes = await source.save();
		const box = { x0: 0, y0: 0, x1: 800, y1: 500 };
		const rotations = [0, 90, 180, 270] as const;
		const pins = rotations.flatMap((_, pageIndex) => [
			{ pageIndex, x: 80, y: 60, state: 'accepted' as const, label: 'FW-7-R1', needsReview: true },
			{ pageIndex, x: 700, y: 430, state: 'repair' as const, label: '12', needsReview: false }
		]);
		const set = await buildMarkedUpSet({
			cover: {
				projectCode: 'T-1',
				projectName: 'Boxes',
				client: '',
				scope: 'Whole project',
				options: [],
				exportDay: '2026-12-02',
				exportedBy: 'test',
				counts: emptyCounts(),
				warnings: []
			},
			drawings: [
				{
					id: 1,
					number: 'OFFSET-1',
					title: '',
					area: '',
					system: '',
					revisions: [
						{
							id: 1,
							label: '0',
							status: 'current',
							fileKey: 'x',
							sha256: '',
							bytes: 0,
							supersededBy: null,
							sheets: rotations.map((rotation, pageIndex) => ({ pageIndex, ...box, rotation }))
						}
					]
				}
			],
			pinsOf: () => pins,
			readFile: async () => bytes,
			fixedDate: new Date('2026-12-02T00:00:00Z'),
			onProgress: () => {},
			checkpoint: () => {}
		});
		const pdf = await getDocument({ data: set.bytes.slice(), standardFontDataUrl }).promise;
		expect(pdf.numPages).toBe(1 + rotations.length);
		for (const [pageIndex, rotation] of rotations.entries()) {
			const page = await pdf.getPage(2 + pageIndex);
			expect(page.rotate).toBe(rotation);
			const viewport = page.getViewport({ scale: 1 });
			const items = (await page.getTextContent()).items.filter((i) => 'str' in i);
			for (const pin of pins.filter((p) => p.pageIndex === pageIndex)) {
				const item = items.find((i) => 'str' in i && i.str === pin.label);
				if (!item || !('str' in item)) throw new Error(`${pin.label} missing at ${rotation}°`);
				const m = Util.transform(viewport.transform, item.transform);
				const [vx, vy] = viewport.convertToViewportPoint(pin.x, pin.y);
				expect(Math.abs(m[4] + item.width / 2 - vx), `${pin.label} x at ${rotation}°`).toBeLessThan(
					2
				);
				expect(
					Math.abs(m[5] - (vy - STAMP.labelBaseline)),
					`${pin.label} y at ${rotation}°`
				).toBeLessThan(2);
				expect(m[1]).toBeCloseTo(0, 3);
				expect(m[0]).toBeGreaterThan(0);
			}
			// The footer sits on the visible sheet, at its shown bottom edge.
			const footer = items.find(
				(i) => 'str' in i && i.str.startsWith('Page ') && i.str.endsWith(`of ${pdf.numPages}`)
			);
			if (!footer || !('str' in footer)) throw new Error('footer missing');
			const f = Util.transform(viewport.transform, footer.transform);
			expect(f[5]).toBeGreaterThan(viewport.height - STAMP.footerHeight);
			expect(f[5]).toBeLessThan(viewport.height);
			expect(f[4] + footer.width).toBeLessThan(viewport.width);
		}
		await pdf.destroy();
	});
});

describe('stamps on a large sheet', () => {
	// ISO 216: A1 is 594 × 841 mm, twice A3's short side; stamps grow with it.
	it('draws the weld numbers of an A1 sheet twice as large as on A3, and keeps close stamps apart', async () => {
		const a1 = { width: (841 * 72) / 25.4, height: (594 * 72) / 25.4 };
		const source = await PDFDocument.create();
		source.addPage([a1.width, a1.height]);
		const bytes = await source.save();
		const pins = [
			{ pageIndex: 0, x: 900, y: 600, state: 'accepted' as const, label: '31', needsReview: false },
			{ pageIndex: 0, x: 906, y: 604, state: 'repair' as const, label: '32', needsReview: false }
		];
		const set = await buildMarkedUpSet({
			cover: {
				projectCode: 'T-2',
				projectName: 'Large sheets',
				client: '',
				scope: 'Whole project',
				options: [],
				exportDay: '2026-12-02',
				exportedBy: 'test',
				counts: emptyCounts(),
				warnings: []
			},
			drawings: [
				{
					id: 1,
					number: 'A1-SHEET',
					title: '',
					area: '',
					system: '',
					revisions: [
						{
							id: 1,
							label: '0',
							status: 'current',
							fileKey: 'x',
							sha256: '',
							bytes: 0,
							supersededBy: null,
							sheets: [{ pageIndex: 0, x0: 0, y0: 0, x1: a1.width, y1: a1.height, rotation: 0 }]
						}
					]
				}
			],
			pinsOf: () => pins,
			readFile: async () => bytes,
			fixedDate: new Date('2026-12-02T00:00:00Z'),
			onProgress: () => {},
			checkpoint: () => {}
		});
		const pdf = await getDocument({ data: set.bytes.slice(), standardFontDataUrl }).promise;
		const page = await pdf.getPage(2);
		const items = (await page.getTextContent()).items.filter((i) => 'str' in i);
		const sizes = pins.map((pin) => {
			const item = items.find((i) => 'str' in i && i.str === pin.label);
			if (!item || !('str' in item)) throw new Error(`${pin.label} missing`);
			return Math.hypot(item.transform[2], item.transform[3]);
		});
		for (const size of sizes) expect(size).toBeCloseTo(STAMP.labelSize * 2, 1);
		// Two pins 7 pt apart: the second stamp is moved off with a leader, the numbers apart.
		const positions = pins.map((pin) => {
			const item = items.find((i) => 'str' in i && i.str === pin.label)!;
			return 'transform' in item ? [item.transform[4], item.transform[5]] : [0, 0];
		});
		expect(
			Math.hypot(positions[0][0] - positions[1][0], positions[0][1] - positions[1][1])
		).toBeGreaterThan(20);
		await pdf.destroy();
	});
});
