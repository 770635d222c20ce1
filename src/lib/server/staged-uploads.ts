/**
 * Files the upload middleware (server/upload-stage.js) streamed to disk before the request
 * reached SvelteKit, handed over by a single-use token. The middleware and the app share
 * one process, and so this registry.
 */
import fs from 'node:fs';

export interface StagedUpload {
	tempPath: string;
	bytes: number;
	sha256: string;
	originalName: string;
	createdAt: number;
}

function registry(): Map<string, StagedUpload> {
	const holder = globalThis as { tacksheetStagedUploads?: Map<string, StagedUpload> };
	holder.tacksheetStagedUploads ??= new Map();
	return holder.tacksheetStagedUploads;
}

/** The staged file for a token, leaving it staged (for the fingerprint of a write). */
export function peek(token: unknown): StagedUpload | undefined {
	return typeof token === 'string' ? registry().get(token) : undefined;
}

/** The staged file for a token, once: the caller must adopt or discard it. */
export function take(token: unknown): StagedUpload | undefined {
	if (typeof token !== 'string') return undefined;
	const staged = registry().get(token);
	registry().delete(token);
	return staged;
}

export function discard(staged: StagedUpload): void {
	fs.rmSync(staged.tempPath, { force: true });
}

/** For tests: stage a file already on disk as the middleware would. */
export function stage(token: string, staged: StagedUpload): void {
	registry().set(token, staged);
}
