import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { expect, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, DATA_DIR, readDatabase, signedInClient } from '../support';

/** Photos on inspection records: decoded and re-encoded by the server, refusals leave nothing. */

let inspector: APIRequestContext;
let inspectionId: number;

test.beforeAll(async () => {
	inspector = await signedInClient('inspector@tacksheet.test');
	inspectionId = readDatabase(
		(db) =>
			(
				db
					.prepare(
						'select i.id from inspections i join joints j on j.id = i.joint_id where j.project_id = 1 order by i.id limit 1'
					)
					.get() as { id: number }
			).id
	);
});
test.afterAll(async () => inspector.dispose());

function photoRows(): number {
	return readDatabase(
		(db) => (db.prepare('select count(*) as n from photos').get() as { n: number }).n
	);
}

/** Files under the uploads folder's photos and tmp folders. */
function storedFiles(): string[] {
	const out: string[] = [];
	for (const folder of ['photos', 'tmp']) {
		const root = path.join(DATA_DIR, 'uploads', folder);
		if (!fs.existsSync(root)) continue;
		for (const entry of fs.readdirSync(root, { recursive: true, withFileTypes: true }))
			if (entry.isFile()) out.push(path.join(entry.parentPath, entry.name));
	}
	return out;
}

/** A real 1600×1200 JPEG made here, with a camera make and a GPS position in its EXIF. */
async function cameraJpeg(): Promise<Buffer> {
	return sharp({
		create: { width: 1600, height: 1200, channels: 3, background: { r: 120, g: 90, b: 60 } }
	})
		.withExif({
			IFD0: { Make: 'FieldCam', Model: 'Test 1' },
			IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' }
		})
		.jpeg({ quality: 90 })
		.toBuffer();
}

function upload(
	client: APIRequestContext,
	file: { name: string; mimeType: string; buffer: Buffer },
	headers: Record<string, string> = {}
) {
	return client.post(`/api/inspections/${inspectionId}/photos`, {
		multipart: { file, caption: 'Undercut at 3 o’clock' },
		headers: { origin: BASE_URL, ...headers }
	});
}

test('a JPEG is stored re-encoded without its EXIF, with a thumbnail, and shown to readers', async () => {
	const original = await cameraJpeg();
	expect((await sharp(original).metadata()).exif).toBeDefined();
	const response = await upload(inspector, {
		name: 'IMG_0042.jpg',
		mimeType: 'image/jpeg',
		buffer: original
	});
	expect(response.status(), await response.text()).toBe(201);
	const { photo } = await response.json();
	expect(photo).toMatchObject({ width: 1600, height: 1200 });
	expect(photo.sha256).toMatch(/^[0-9a-f]{64}$/);

	const viewer = await signedInClient('viewer@tacksheet.test');
	const file = await viewer.get(`/api/photos/${photo.id}`);
	expect(file.status()).toBe(200);
	expect(file.headers()['content-type']).toBe('image/jpeg');
	const bytes = await file.body();
	expect(bytes.length).toBe(photo.bytes);
	const stored = await sharp(bytes).metadata();
	expect(stored.format).toBe('jpeg');
	// Dropped: the camera's EXIF, GPS position included (the project does not keep location).
	expect(stored.exif).toBeUndefined();
	const thumb = await viewer.get(`/api/photos/${photo.id}/thumbnail`);
	expect(thumb.headers()['content-type']).toBe('image/webp');
	const thumbMeta = await sharp(await thumb.body()).metadata();
	expect(Math.max(thumbMeta.width!, thumbMeta.height!)).toBe(320);

	const listed = await (await viewer.get(`/api/inspections/${inspectionId}/photos`)).json();
	expect(listed.photos.map((p: { id: number }) => p.id)).toContain(photo.id);
	// Viewers read photos but may not attach them.
	const refused = await upload(viewer, { name: 'x.jpg', mimeType: 'image/jpeg', buffer: original });
	expect(refused.status()).toBe(403);
	await viewer.dispose();
});

test('a text file named .jpg → 415 and an oversize photo → 413, with nothing left behind', async () => {
	const rows = photoRows();
	const files = storedFiles().length;
	const text = await upload(inspector, {
		name: 'defect.jpg',
		mimeType: 'image/jpeg',
		buffer: Buffer.from('This is a note, not a photo.\n'.repeat(50))
	});
	expect(text.status()).toBe(415);
	expect((await text.json()).error).toMatch(/not a photo/);

	// PHOTO_MAX_MB is 2 on the test server.
	const big = await upload(inspector, {
		name: 'huge.jpg',
		mimeType: 'image/jpeg',
		buffer: Buffer.alloc(3 * 1024 * 1024, 0xff)
	});
	expect(big.status()).toBe(413);
	expect((await big.json()).error).toMatch(/2 MB limit/);

	expect(photoRows()).toBe(rows);
	expect(storedFiles()).toHaveLength(files);
});

test('a photo sent twice with its Idempotency-Key is stored once', async () => {
	const buffer = await cameraJpeg();
	const rows = photoRows();
	const key = crypto.randomUUID();
	const file = { name: 'again.jpg', mimeType: 'image/jpeg', buffer };
	const first = await upload(inspector, file, { 'idempotency-key': key });
	expect(first.status()).toBe(201);
	const second = await upload(inspector, file, { 'idempotency-key': key });
	expect(second.status()).toBe(201);
	expect(await second.json()).toEqual(await first.json());
	expect(photoRows()).toBe(rows + 1);
});
