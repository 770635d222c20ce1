/**
 * Photos attached to inspection records. The server decodes every photo and writes its own
 * JPEG (turned upright, at most 2560 px on the long side) and a WebP thumbnail: anything that
 * does not decode as a photo is refused, and the stored file carries no EXIF data (camera,
 * GPS position) unless the project keeps location, when only the original's metadata is kept.
 */
import sharp, { type Metadata } from 'sharp';
import { asc, eq, inArray } from 'drizzle-orm';
import { db, schema } from './db';
import * as storage from './storage';
import * as audit from './audit';
import { DomainError } from './errors';
import type { StagedUpload } from './staged-uploads';
import { readFile, rm } from 'node:fs/promises';

sharp.cache(false);
sharp.concurrency(1);

/** Formats a phone or tablet camera gives, decodable here (HEVC-coded HEIC is not). */
const PHOTO_FORMATS = new Set(['jpeg', 'png', 'webp', 'heif']);
const LONG_SIDE = 2560;
const THUMB_SIDE = 320;
/** A 50 MP image at most: a bigger one is refused before it is decoded. */
const MAX_PIXELS = 50_000_000;
export const CAPTION_MAX = 200;

export interface PhotoSummary {
	id: number;
	sha256: string;
	bytes: number;
	width: number;
	height: number;
	caption: string;
	createdAt: number;
}

const notAPhoto = () =>
	new DomainError(
		'That file is not a photo Tacksheet can read. Attach a JPEG, PNG or WebP image.',
		415,
		'file'
	);

/** The photo re-encoded: a JPEG and its thumbnail, or a 415 for anything else. */
export async function encode(
	input: Uint8Array,
	keepLocation = false
): Promise<{ full: Buffer; thumb: Buffer; width: number; height: number }> {
	const image = sharp(input, { failOn: 'error', limitInputPixels: MAX_PIXELS });
	let meta: Metadata;
	try {
		meta = await image.metadata();
	} catch {
		throw notAPhoto();
	}
	if (!meta.format || !PHOTO_FORMATS.has(meta.format) || meta.compression === 'hevc')
		throw notAPhoto();
	try {
		const upright = image.clone().rotate();
		let full = upright
			.clone()
			.resize(LONG_SIDE, LONG_SIDE, { fit: 'inside', withoutEnlargement: true })
			.jpeg({ quality: 82, mozjpeg: true });
		// Kept only when the project asks: the camera's metadata, GPS position included.
		if (keepLocation) full = full.keepExif();
		const { data, info } = await full.toBuffer({ resolveWithObject: true });
		const thumb = await upright
			.clone()
			.resize(THUMB_SIDE, THUMB_SIDE, { fit: 'inside', withoutEnlargement: true })
			.webp({ quality: 70 })
			.toBuffer();
		return { full: data, thumb, width: info.width, height: info.height };
	} catch {
		throw notAPhoto();
	}
}

function inspectionOf(inspectionId: number) {
	const row = db
		.select({ id: schema.inspections.id, jointId: schema.inspections.jointId })
		.from(schema.inspections)
		.where(eq(schema.inspections.id, inspectionId))
		.get();
	if (!row) throw new DomainError('There is no such inspection record.', 404);
	const joint = db
		.select({ projectId: schema.joints.projectId })
		.from(schema.joints)
		.where(eq(schema.joints.id, row.jointId))
		.get()!;
	const project = db
		.select({ keep: schema.projects.photosKeepLocation })
		.from(schema.projects)
		.where(eq(schema.projects.id, joint.projectId))
		.get()!;
	return { ...row, projectId: joint.projectId, keepLocation: project.keep };
}

/**
 * Attach a staged upload to an inspection. The staged file is always removed; on any refusal
 * nothing is kept (no stored file, no row).
 */
export async function attach(
	inspectionId: number,
	file: StagedUpload,
	caption: string,
	userId: string
): Promise<PhotoSummary> {
	let keys: string[] = [];
	try {
		const inspection = inspectionOf(inspectionId);
		const encoded = await encode(
			new Uint8Array(await readFile(file.tempPath)),
			inspection.keepLocation
		);
		const key = storage.newKey(`photos/${inspection.projectId}`, '.jpg');
		keys = [key, `${key}.thumb.webp`];
		await storage.put(key, encoded.full);
		await storage.put(keys[1], encoded.thumb);
		const sha256 = storage.sha256(encoded.full);
		const row = db.transaction((tx) => {
			const inserted = tx
				.insert(schema.photos)
				.values({
					inspectionId,
					storageKey: key,
					sha256,
					bytes: encoded.full.length,
					width: encoded.width,
					height: encoded.height,
					thumbBytes: encoded.thumb.length,
					caption,
					keptLocation: inspection.keepLocation,
					uploadedBy: userId
				})
				.returning()
				.get();
			audit.record(
				{
					action: 'photo',
					entity: 'inspection',
					entityId: inspectionId,
					userId,
					projectId: inspection.projectId,
					after: { photoId: inserted.id, sha256, bytes: inserted.bytes, caption }
				},
				tx
			);
			return inserted;
		});
		keys = [];
		return summary(row);
	} finally {
		await rm(file.tempPath, { force: true });
		for (const key of keys) await storage.remove(key);
	}
}

function summary(row: schema.Photo): PhotoSummary {
	return {
		id: row.id,
		sha256: row.sha256,
		bytes: row.bytes,
		width: row.width,
		height: row.height,
		caption: row.caption,
		createdAt: row.createdAt
	};
}

export function get(photoId: number): schema.Photo | undefined {
	return db.select().from(schema.photos).where(eq(schema.photos.id, photoId)).get();
}

/** Photos of these inspection records, oldest first, by inspection. */
export function byInspection(inspectionIds: number[]): Map<number, PhotoSummary[]> {
	const out = new Map<number, PhotoSummary[]>();
	if (inspectionIds.length === 0) return out;
	const rows = db
		.select()
		.from(schema.photos)
		.where(inArray(schema.photos.inspectionId, inspectionIds))
		.orderBy(asc(schema.photos.createdAt), asc(schema.photos.id))
		.all();
	for (const row of rows) {
		const list = out.get(row.inspectionId) ?? [];
		list.push(summary(row));
		out.set(row.inspectionId, list);
	}
	return out;
}

export const thumbKey = (row: schema.Photo) => `${row.storageKey}.thumb.webp`;
