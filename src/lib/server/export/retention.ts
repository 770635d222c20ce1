/**
 * Retention of turnover zips: an export's row (who, when, scope, size, SHA-256 of the zip) is
 * kept for good. Its zip is removed after `EXPORT_KEEP_DAYS`, or earlier by a person who may
 * export; the row then keeps `status: 'done'` with no file, and the audit event of the removal
 * says when and by whom, which is what the history shows. The clean-up also removes zips no
 * row points to (left by a crash while one was written).
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { and, desc, eq, isNotNull, lt } from 'drizzle-orm';
import { DomainError } from '../errors';
import { db, schema } from '../db';
import * as audit from '../audit';
import * as storage from '../storage';
import { config } from '../config';

const e = schema.exports;
const DAY_MS = 86_400_000;
/** How often the clean-up looks for expired zips; it is one indexed query when there are none. */
const SWEEP_EVERY_MS = 60 * 60 * 1000;
/** A zip no row points to (a crash mid-write) is left this long before it is removed. */
const ORPHAN_AFTER_MS = 60 * 60 * 1000;
const REMOVE_ACTION = 'export.file.remove';

export function dayOf(at: number): string {
	return new Date(at).toISOString().slice(0, 10);
}

/** When and by whom a finished export's file was removed, from its audit event. */
export function removal(exportId: number) {
	const row = db
		.select({
			at: schema.auditEvents.at,
			by: schema.users.name,
			byEmail: schema.users.email,
			after: schema.auditEvents.after
		})
		.from(schema.auditEvents)
		.leftJoin(schema.users, eq(schema.users.id, schema.auditEvents.userId))
		.where(
			and(
				eq(schema.auditEvents.entity, 'export'),
				eq(schema.auditEvents.entityId, String(exportId)),
				eq(schema.auditEvents.action, REMOVE_ACTION)
			)
		)
		.orderBy(desc(schema.auditEvents.id))
		.get();
	if (!row) return undefined;
	const reason = (row.after as { reason?: string } | null)?.reason ?? '';
	return { at: row.at, by: row.by ?? row.byEmail ?? null, reason };
}

/**
 * Remove a finished export's zip and keep its record. `userId` null is the clean-up; the
 * audit event carries the reason, the size and the SHA-256 the file had.
 */
export async function removeStored(exportId: number, userId: string | null, reason: string) {
	const key = db.transaction((tx) => {
		const row = tx.select().from(e).where(eq(e.id, exportId)).get();
		if (!row) throw new DomainError('There is no such export.', 404);
		if (row.status === 'queued' || row.status === 'running')
			throw new DomainError(
				'This export is still running: cancel it instead; its partial file is never kept.',
				409
			);
		if (row.status !== 'done')
			throw new DomainError(
				`This export ${row.status === 'failed' ? 'failed' : 'was cancelled'} and has no file.`,
				409
			);
		if (!row.fileKey) {
			const removed = removal(exportId);
			throw new DomainError(
				`The file of this export was already removed${removed ? ` on ${dayOf(removed.at)}` : ''}.`,
				409
			);
		}
		tx.update(e).set({ fileKey: null }).where(eq(e.id, exportId)).run();
		audit.record(
			{
				action: REMOVE_ACTION,
				entity: 'export',
				entityId: exportId,
				userId,
				projectId: row.projectId,
				before: { fileKey: row.fileKey, bytes: row.bytes, sha256: row.sha256 },
				after: { reason }
			},
			tx
		);
		return row.fileKey;
	});
	// The record says removed either way; a file that cannot be removed now is an orphan the
	// next clean-up removes.
	await storage.remove(key).catch((error) => console.error(`Export ${exportId}:`, error));
}

/**
 * Remove zips kept longer than `keepDays` (0: none), and zips no export row points to (left by
 * a crash while one was written) once they are an hour old, while `jobsIdle()` says no job is
 * queued or running. Never touches a queued or running job: those have no `fileKey` until
 * they are done.
 */
export async function sweep(now: number, keepDays: number, jobsIdle: () => boolean) {
	let expired = 0;
	if (keepDays > 0) {
		const due = db
			.select({ id: e.id })
			.from(e)
			.where(
				and(eq(e.status, 'done'), isNotNull(e.fileKey), lt(e.finishedAt, now - keepDays * DAY_MS))
			)
			.all();
		for (const row of due) {
			try {
				await removeStored(row.id, null, `kept for ${keepDays} day${keepDays === 1 ? '' : 's'}`);
				expired++;
			} catch (error) {
				// Removed by a person meanwhile: nothing left to do.
				if (!(error instanceof DomainError)) throw error;
			}
		}
	}
	let orphans = 0;
	if (jobsIdle()) {
		const folder = storage.pathOf('exports/x');
		const known = new Set(
			db
				.select({ key: e.fileKey })
				.from(e)
				.where(isNotNull(e.fileKey))
				.all()
				.map((row) => row.key)
		);
		const names = await fsp.readdir(path.dirname(folder)).catch(() => [] as string[]);
		for (const name of names) {
			const key = `exports/${name}`;
			if (known.has(key)) continue;
			const stat = await fsp.stat(storage.pathOf(key)).catch(() => null);
			if (!stat?.isFile() || now - stat.mtimeMs < ORPHAN_AFTER_MS) continue;
			await storage.remove(key);
			audit.record({
				action: 'export.file.orphan',
				entity: 'export',
				after: { file: key, bytes: stat.size }
			});
			orphans++;
		}
	}
	return { expired, orphans };
}

const timer = globalThis as { tacksheetExportCleanup?: ReturnType<typeof setInterval> };

/**
 * Clean up now and then every hour, once per process; the timer never holds the process.
 * `jobsIdle` tells whether the export queue is empty (orphans are only looked for then).
 */
export function startCleanup(jobsIdle: () => boolean) {
	if (timer.tacksheetExportCleanup) return;
	const run = () =>
		sweep(Date.now(), config.exportKeepDays, jobsIdle)
			.then(({ expired, orphans }) => {
				if (expired + orphans > 0)
					console.log(
						`Tacksheet: removed ${expired} expired turnover zip(s), ${orphans} orphan(s).`
					);
			})
			.catch((error) => console.error('Turnover clean-up:', error));
	void run();
	timer.tacksheetExportCleanup = setInterval(() => void run(), SWEEP_EVERY_MS);
	timer.tacksheetExportCleanup.unref();
}
