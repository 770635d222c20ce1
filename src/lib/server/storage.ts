/**
 * Files kept by the app (drawing revisions, exports), behind one small interface so an
 * object store can replace the local disk later. Keys are relative paths under UPLOADS_DIR.
 */
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import crypto from 'node:crypto';
import { config } from './config';

export function pathOf(key: string): string {
	const full = path.resolve(config.uploadsDir, key);
	if (!full.startsWith(config.uploadsDir + path.sep)) throw new Error(`Bad storage key: ${key}`);
	return full;
}

export function newKey(folder: string, extension: string): string {
	return `${folder}/${crypto.randomUUID()}${extension}`;
}

export async function put(key: string, bytes: Uint8Array): Promise<void> {
	const full = pathOf(key);
	await fsp.mkdir(path.dirname(full), { recursive: true });
	const partial = `${full}.part`;
	await fsp.writeFile(partial, bytes);
	await fsp.rename(partial, full);
}

/** Move a file already on disk (an upload streamed to a temporary place) under a key. */
export async function adopt(key: string, tempPath: string): Promise<void> {
	const full = pathOf(key);
	await fsp.mkdir(path.dirname(full), { recursive: true });
	await fsp.rename(tempPath, full);
}

/** The file, or the bytes `start`…`end` of it (both inclusive). */
export function read(key: string, range?: { start: number; end: number }): fs.ReadStream {
	return fs.createReadStream(pathOf(key), range);
}

export async function readAll(key: string): Promise<Uint8Array> {
	return new Uint8Array(await fsp.readFile(pathOf(key)));
}

export async function remove(key: string): Promise<void> {
	await fsp.rm(pathOf(key), { force: true });
}

/** Remove a folder of files under a key (a sheet's tiles); gone already is fine. */
export async function removeTree(key: string): Promise<void> {
	await fsp.rm(pathOf(key), { recursive: true, force: true });
}

/** Remove a file outside the store (a temporary upload); gone already is fine. */
export async function removePath(file: string): Promise<void> {
	await fsp.rm(file, { force: true });
}

export async function exists(key: string): Promise<boolean> {
	try {
		await fsp.access(pathOf(key));
		return true;
	} catch {
		return false;
	}
}

export function sha256(bytes: Uint8Array): string {
	return crypto.createHash('sha256').update(bytes).digest('hex');
}
