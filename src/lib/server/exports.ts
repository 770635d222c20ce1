/**
 * Turnover exports: a job per request, run off the request in an in-process queue, one at a
 * time. The `exports` row is the job's whole state (status, progress, the drawing it is on,
 * its report), so a page reload or a second tab reads the same picture. The heavy PDF work
 * hands the event loop back every ~15 ms of work (between pins, sheets and footers, and while
 * saving), so the server keeps answering. A worker thread was weighed and left out: Vite's SSR
 * build does not bundle a `worker_threads` entry, so it would need a build step of its own.
 *
 * Retention: an export's row (who, when, scope, size, SHA-256 of the zip) is kept for good.
 * Its zip is removed after `EXPORT_KEEP_DAYS`, or earlier by a person who may export; the row
 * then keeps `status: 'done'` with no file, and the audit event of the removal says when and
 * by whom, which is what the history shows.
 */
import { DomainError } from './errors';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { and, desc, eq, inArray, isNotNull, lt } from 'drizzle-orm';
import { db, schema } from './db';
import * as audit from './audit';
import * as mail from './mail';
import * as templates from './mail-templates';
import * as storage from './storage';
import { config } from './config';
import { buildPackage } from './export/package';
import { preview, resolve, scopeKey } from './export/scope';
import { describeScope, exportRequestToQuery, type ExportRequest } from '$lib/schemas/export';

export { preview };

const e = schema.exports;
const ACTIVE = ['queued', 'running'] as const;

/** Thrown between steps of a job that was cancelled meanwhile. */
class Cancelled extends Error {}

interface Runner {
	queue: number[];
	running: number | null;
	/** Where the notice links to, per job: the origin the request came in on. */
	origins: Map<number, string>;
	settled: Map<number, { promise: Promise<void>; resolve: () => void }>;
	recovered: boolean;
	cleanup: ReturnType<typeof setInterval> | null;
}

const runner: Runner = ((globalThis as { tacksheetExports?: Runner }).tacksheetExports ??= {
	queue: [] as number[],
	running: null,
	origins: new Map(),
	settled: new Map(),
	recovered: false,
	cleanup: null
});

/**
 * A job left queued or running by a stopped server can never finish: mark it failed, once
 * per process, before this module runs any job of its own.
 */
export function recoverInterrupted(): number {
	runner.recovered = true;
	const stale = db
		.select({ id: e.id, report: e.report })
		.from(e)
		.where(inArray(e.status, [...ACTIVE]))
		.all()
		.filter((row) => row.id !== runner.running && !runner.queue.includes(row.id));
	for (const row of stale) {
		db.update(e)
			.set({
				status: 'failed',
				finishedAt: Date.now(),
				report: [...row.report, 'The server stopped while this export was running; start it again.']
			})
			.where(eq(e.id, row.id))
			.run();
	}
	return stale.length;
}

/**
 * Zips a stopped server left half-written (`*.part`): nothing can finish them, and their
 * export is marked failed by `recoverInterrupted`. Run at start, before any job of this process.
 */
export async function removeUnfinished(): Promise<number> {
	const folder = path.dirname(storage.pathOf('exports/x'));
	const names = await fsp.readdir(folder).catch(() => [] as string[]);
	const partial = names.filter((name) => name.endsWith('.part'));
	for (const name of partial) await storage.remove(`exports/${name}`);
	return partial.length;
}

/** On first use, not at import: the production build imports this module without a database. */
function recoverOnce() {
	if (!runner.recovered) recoverInterrupted();
}

function settledEntry(id: number) {
	let entry = runner.settled.get(id);
	if (!entry) {
		let resolveFn = () => {};
		const promise = new Promise<void>((r) => (resolveFn = r));
		entry = { promise, resolve: resolveFn };
		runner.settled.set(id, entry);
	}
	return entry;
}

/** Resolves when the job has finished one way or another (tests, the bench). */
export function whenSettled(exportId: number): Promise<void> {
	const row = db.select({ status: e.status }).from(e).where(eq(e.id, exportId)).get();
	if (!row || !(ACTIVE as readonly string[]).includes(row.status)) return Promise.resolve();
	return settledEntry(exportId).promise;
}

/** Queue a turnover set; an identical one still queued or running is refused with 409. */
export function start(
	projectId: number,
	request: ExportRequest,
	userId: string,
	origin: string
): { id: number } {
	recoverOnce();
	if (resolve(projectId, request).length === 0)
		throw new DomainError(
			'Nothing in this project matches the scope: choose other drawings, an area or a system.',
			400
		);
	const key = scopeKey(projectId, request);
	const created = db.transaction((tx) => {
		const running = tx
			.select({ id: e.id })
			.from(e)
			.where(and(eq(e.scopeKey, key), inArray(e.status, [...ACTIVE])))
			.get();
		if (running)
			throw new DomainError(
				'The same turnover set is already being exported. Wait for it or cancel it first.',
				409,
				undefined,
				{ exportId: running.id }
			);
		const row = tx
			.insert(e)
			.values({
				projectId,
				scope: {
					...request.scope,
					includeSuperseded: request.includeSuperseded,
					acceptedOnly: request.acceptedOnly
				},
				scopeKey: key,
				requestedBy: userId
			})
			.returning({ id: e.id })
			.get();
		audit.record(
			{
				action: 'export.start',
				entity: 'export',
				entityId: row.id,
				userId,
				projectId,
				after: request
			},
			tx
		);
		return row;
	});
	runner.origins.set(created.id, origin);
	settledEntry(created.id);
	runner.queue.push(created.id);
	queueMicrotask(pump);
	return created;
}

function pump() {
	if (runner.running !== null) return;
	const next = runner.queue.shift();
	if (next === undefined) return;
	runner.running = next;
	run(next)
		.catch((error) => console.error(`Export ${next}:`, error))
		.finally(() => {
			runner.running = null;
			runner.origins.delete(next);
			runner.settled.get(next)?.resolve();
			runner.settled.delete(next);
			pump();
		});
}

function requestOf(scope: Record<string, unknown>): ExportRequest {
	const { includeSuperseded, acceptedOnly, ...rest } = scope as ExportRequest['scope'] & {
		includeSuperseded?: boolean;
		acceptedOnly?: boolean;
	};
	return { scope: rest, includeSuperseded: !!includeSuperseded, acceptedOnly: !!acceptedOnly };
}

async function run(id: number) {
	const row = db.select().from(e).where(eq(e.id, id)).get();
	if (!row || row.status !== 'queued') return;
	const startedAt = Date.now();
	db.update(e).set({ status: 'running', startedAt, progress: 0 }).where(eq(e.id, id)).run();
	const user = row.requestedBy
		? db.select().from(schema.users).where(eq(schema.users.id, row.requestedBy)).get()
		: undefined;
	const request = requestOf(row.scope);
	const checkpoint = () => {
		const now = db.select({ status: e.status }).from(e).where(eq(e.id, id)).get();
		if (now?.status !== 'running') throw new Cancelled();
	};
	try {
		const result = await buildPackage({
			exportId: id,
			projectId: row.projectId,
			request,
			requestedBy: { name: user?.name ?? null, email: user?.email ?? 'unknown' },
			startedAt,
			checkpoint,
			onProgress: (progress, current) =>
				db
					.update(e)
					.set({ progress, current })
					.where(and(eq(e.id, id), eq(e.status, 'running')))
					.run()
		});
		const finished = db
			.update(e)
			.set({
				status: 'done',
				progress: 1,
				current: null,
				report: result.report,
				fileKey: result.fileKey,
				bytes: result.bytes,
				sha256: result.sha256,
				finishedAt: Date.now()
			})
			.where(and(eq(e.id, id), eq(e.status, 'running')))
			.run();
		if (finished.changes === 0) {
			// Cancelled while the zip was being moved into place.
			await storage.remove(result.fileKey);
			return;
		}
		if (user) await notify(id, row.projectId, user.email, request, result.report);
	} catch (error) {
		if (error instanceof Cancelled) return;
		db.update(e)
			.set({
				status: 'failed',
				current: null,
				finishedAt: Date.now(),
				report: [`The export failed: ${error instanceof Error ? error.message : String(error)}`]
			})
			.where(and(eq(e.id, id), eq(e.status, 'running')))
			.run();
		throw error;
	}
}

async function notify(
	id: number,
	projectId: number,
	to: string,
	request: ExportRequest,
	report: string[]
) {
	const project = db.select().from(schema.projects).where(eq(schema.projects.id, projectId)).get();
	const origin = runner.origins.get(id) ?? process.env.ORIGIN ?? 'http://localhost:3000';
	const row = status(id);
	try {
		await mail.send(
			templates.turnoverReady(to, {
				projectCode: project?.code ?? '',
				scope: describeScope(request.scope, request.scope.drawings?.length ?? 0),
				pageUrl: `${origin}/projects/${projectId}/turnover`,
				fileUrl: `${origin}/api/exports/${id}/file`,
				bytes: row?.bytes ?? 0,
				leftOut: report.filter((line) => line.includes(': not included,')),
				keepDays: config.exportKeepDays
			})
		);
	} catch (error) {
		// The set is complete either way; the page shows it and its download link.
		console.error(`Export ${id}: the notice could not be sent:`, error);
	}
}

/** Cancel a queued or running job; its partial file is never kept. */
export function cancel(exportId: number, userId: string) {
	const row = db.select().from(e).where(eq(e.id, exportId)).get();
	if (!row) throw new DomainError('There is no such export.', 404);
	if (!(ACTIVE as readonly string[]).includes(row.status))
		throw new DomainError(
			`This export has already ${row.status === 'done' ? 'finished' : row.status}.`,
			409
		);
	db.update(e)
		.set({ status: 'cancelled', current: null, finishedAt: Date.now() })
		.where(eq(e.id, exportId))
		.run();
	runner.queue = runner.queue.filter((id) => id !== exportId);
	if (runner.running !== exportId) {
		runner.settled.get(exportId)?.resolve();
		runner.settled.delete(exportId);
	}
	audit.record({
		action: 'export.cancel',
		entity: 'export',
		entityId: exportId,
		userId,
		projectId: row.projectId
	});
	return status(exportId)!;
}

/** The public shape of a job. */
export function status(exportId: number) {
	recoverOnce();
	const row = db
		.select({
			id: e.id,
			projectId: e.projectId,
			status: e.status,
			progress: e.progress,
			current: e.current,
			report: e.report,
			scope: e.scope,
			bytes: e.bytes,
			sha256: e.sha256,
			fileKey: e.fileKey,
			createdAt: e.createdAt,
			startedAt: e.startedAt,
			finishedAt: e.finishedAt,
			requestedBy: schema.users.name,
			requestedByEmail: schema.users.email
		})
		.from(e)
		.leftJoin(schema.users, eq(schema.users.id, e.requestedBy))
		.where(eq(e.id, exportId))
		.get();
	if (!row) return undefined;
	const { fileKey, ...shown } = row;
	const request = requestOf(row.scope);
	const options = [
		request.includeSuperseded ? 'with superseded revisions' : '',
		request.acceptedOnly ? 'accepted joints only' : ''
	].filter(Boolean);
	return {
		...shown,
		scopeText: [describeScope(request.scope, request.scope.drawings?.length ?? 0), ...options].join(
			', '
		),
		current: row.current ?? undefined,
		fileUrl: row.status === 'done' && fileKey ? `/api/exports/${row.id}/file` : undefined,
		removed: row.status === 'done' && !fileKey ? removal(row.id) : undefined,
		/** The turnover page's query that previews this same set again. */
		againQuery: exportRequestToQuery(request)
	};
}

export type ExportStatus = NonNullable<ReturnType<typeof status>>;

/** Past and present exports of a project, newest first. */
export function history(projectId: number, limit = 20) {
	recoverOnce();
	const ids = db
		.select({ id: e.id })
		.from(e)
		.where(eq(e.projectId, projectId))
		.orderBy(desc(e.createdAt), desc(e.id))
		.limit(limit)
		.all();
	return ids.map((row) => status(row.id)!);
}

/** The stored zip of a finished export, and a file name safe on every system. */
export function fileOf(exportId: number) {
	const row = db
		.select({
			status: e.status,
			fileKey: e.fileKey,
			bytes: e.bytes,
			sha256: e.sha256,
			createdAt: e.createdAt,
			code: schema.projects.code
		})
		.from(e)
		.innerJoin(schema.projects, eq(schema.projects.id, e.projectId))
		.where(eq(e.id, exportId))
		.get();
	if (!row) throw new DomainError('There is no such export.', 404);
	if (row.status === 'done' && !row.fileKey) {
		const removed = removal(exportId);
		throw new DomainError(
			`The file of this export was removed${removed ? ` on ${dayOf(removed.at)}` : ''}; export the set again.`,
			410
		);
	}
	if (row.status !== 'done' || !row.fileKey)
		throw new DomainError('This export has no file: it is not finished, or it failed.', 409);
	const code =
		row.code.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+|[-.]+$/g, '') || 'project';
	const day = new Date(row.createdAt).toISOString().slice(0, 10);
	return {
		fileKey: row.fileKey,
		bytes: row.bytes ?? 0,
		sha256: row.sha256 ?? '',
		fileName: `${code}-turnover-set-${exportId}-${day}.zip`
	};
}

// Retention -----------------------------------------------------------------------------------

const DAY_MS = 86_400_000;
/** How often the clean-up looks for expired zips; it is one indexed query when there are none. */
const SWEEP_EVERY_MS = 60 * 60 * 1000;
/** A zip no row points to (a crash mid-write) is left this long before it is removed. */
const ORPHAN_AFTER_MS = 60 * 60 * 1000;
const REMOVE_ACTION = 'export.file.remove';

function dayOf(at: number): string {
	return new Date(at).toISOString().slice(0, 10);
}

/** When and by whom a finished export's file was removed, from its audit event. */
function removal(exportId: number) {
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
async function removeStored(exportId: number, userId: string | null, reason: string) {
	const key = db.transaction((tx) => {
		const row = tx.select().from(e).where(eq(e.id, exportId)).get();
		if (!row) throw new DomainError('There is no such export.', 404);
		if ((ACTIVE as readonly string[]).includes(row.status))
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

/** A person removes a finished export's zip ahead of time; the record stays. */
export async function removeFile(exportId: number, userId: string) {
	await removeStored(exportId, userId, 'removed by a person');
	return status(exportId)!;
}

/**
 * Remove zips kept longer than `keepDays` (0: none), and zips no export row points to (left by
 * a crash while one was written) once they are an hour old and no job is running. Never
 * touches a queued or running job: those have no `fileKey` until they are done.
 */
export async function sweep(now = Date.now(), keepDays = config.exportKeepDays) {
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
	if (runner.running === null && runner.queue.length === 0) {
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

/** Clean up now and then every hour, once per process; the timer never holds the process. */
export function startCleanup() {
	if (runner.cleanup) return;
	const run = () =>
		sweep()
			.then(({ expired, orphans }) => {
				if (expired + orphans > 0)
					console.log(
						`Tacksheet: removed ${expired} expired turnover zip(s), ${orphans} orphan(s).`
					);
			})
			.catch((error) => console.error('Turnover clean-up:', error));
	void run();
	runner.cleanup = setInterval(() => void run(), SWEEP_EVERY_MS);
	runner.cleanup.unref();
}
