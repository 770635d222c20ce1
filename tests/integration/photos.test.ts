import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { eq } from 'drizzle-orm';
import sharp from 'sharp';
import yauzl from 'yauzl';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as exports from '$lib/server/exports';
import * as photos from '$lib/server/photos';
import * as storage from '$lib/server/storage';
import { config } from '$lib/server/config';
import { DomainError } from '$lib/server/errors';
import { readCsv } from '../fixtures/csv';

let lbm: number;
let turnoverId: string;
let inspectorId: string;

beforeAll(async () => {
	await seedIfEmpty();
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
	const user = (email: string) =>
		db.select().from(schema.users).where(eq(schema.users.email, email)).get()!.id;
	turnoverId = user('turnover@tacksheet.test');
	inspectorId = user('inspector@tacksheet.test');
}, 120_000);

/** A real JPEG with a camera make and a GPS position in its EXIF. */
function cameraJpeg(width = 1200, height = 900): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: '#7a5a3c' } })
		.withExif({
			IFD0: { Make: 'FieldCam' },
			IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' }
		})
		.jpeg()
		.toBuffer();
}

function stagedFile(bytes: Uint8Array) {
	const tempPath = path.join(config.uploadsDir, 'tmp', `${crypto.randomUUID()}.part`);
	fs.mkdirSync(path.dirname(tempPath), { recursive: true });
	fs.writeFileSync(tempPath, bytes);
	return {
		tempPath,
		bytes: bytes.length,
		sha256: '',
		originalName: 'p.jpg',
		createdAt: Date.now()
	};
}

function unzip(file: string): Promise<Map<string, Buffer>> {
	return new Promise((resolve, reject) => {
		yauzl.open(file, { lazyEntries: true }, (error, zip) => {
			if (error || !zip) return reject(error);
			const entries = new Map<string, Buffer>();
			zip.on('entry', (entry: yauzl.Entry) => {
				zip.openReadStream(entry, (err, stream) => {
					if (err || !stream) return reject(err);
					const chunks: Buffer[] = [];
					stream.on('data', (c: Buffer) => chunks.push(c));
					stream.on('end', () => {
						entries.set(entry.fileName, Buffer.concat(chunks));
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

function firstInspectionOf(projectId: number) {
	return db
		.select({ id: schema.inspections.id, drawingId: schema.joints.drawingId })
		.from(schema.inspections)
		.innerJoin(schema.joints, eq(schema.joints.id, schema.inspections.jointId))
		.where(eq(schema.joints.projectId, projectId))
		.orderBy(schema.inspections.id)
		.get()!;
}

describe('encoding a photo', () => {
	it('turns a camera JPEG upright into a JPEG without EXIF, and keeps EXIF only when asked', async () => {
		const original = await cameraJpeg(3000, 2000);
		const plain = await photos.encode(original);
		expect(Math.max(plain.width, plain.height)).toBe(2560);
		expect((await sharp(plain.full).metadata()).exif).toBeUndefined();
		expect((await sharp(plain.thumb).metadata()).format).toBe('webp');
		const kept = await photos.encode(original, true);
		expect((await sharp(kept.full).metadata()).exif).toBeDefined();
	});

	it('refuses text, a PDF and an SVG with 415', async () => {
		for (const bytes of [
			Buffer.from('not a photo\n'.repeat(40)),
			Buffer.from('%PDF-1.7\n%âãÏÓ\n1 0 obj\n<<>>\nendobj\n'),
			Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"/>')
		]) {
			const refused = await photos.encode(bytes).catch((error: unknown) => error);
			expect(refused).toBeInstanceOf(DomainError);
			expect((refused as DomainError).status).toBe(415);
		}
	});
});

describe('photos in the turnover set', () => {
	it('go under photos/, each in the manifest, named in inspections.csv', async () => {
		const inspection = firstInspectionOf(lbm);
		const photo = await photos.attach(
			inspection.id,
			stagedFile(await cameraJpeg()),
			'Spatter near the root',
			inspectorId
		);
		const { id } = exports.start(
			lbm,
			{
				scope: { drawings: [inspection.drawingId] },
				includeSuperseded: false,
				acceptedOnly: false
			},
			turnoverId,
			'http://tacksheet.test'
		);
		await exports.whenSettled(id);
		expect(exports.status(id)!.status).toBe('done');
		const entries = await unzip(storage.pathOf(exports.fileOf(id).fileKey));
		const name = `photos/record-${inspection.id}-photo-${photo.id}.jpg`;
		const bytes = entries.get(name)!;
		expect(bytes).toBeDefined();
		expect(crypto.createHash('sha256').update(bytes).digest('hex')).toBe(photo.sha256);
		const manifest = JSON.parse(entries.get('manifest.json')!.toString('utf8'));
		expect(manifest.files).toContainEqual({ name, bytes: photo.bytes, sha256: photo.sha256 });
		const rows = readCsv(
			entries
				.get('inspections.csv')!
				.toString('utf8')
				.replace(/^\uFEFF/, '')
		);
		const header = rows[0];
		const row = rows.find((r) => r[header.indexOf('Record id')] === String(inspection.id))!;
		expect(row[header.indexOf('Photos')]).toBe(name);
	}, 120_000);
});
