/**
 * One turnover set as a zip: the marked-up set, the weld log as Excel and CSV, the inspection
 * records and a manifest with the SHA-256 of every file and of every source revision.
 *
 * Determinism: for unchanged data, the same scope and options, the same person and the same
 * UTC export day, every file and the zip itself are byte for byte the same: the zip holds its
 * entries in a fixed order, every date inside the set (PDF info, workbook properties, the
 * parts of the workbook, the zip entries) is the export day at 00:00 UTC, and the manifest
 * carries no export id or clock time of the export; its time is `recordsAsOf`, the newest
 * record behind the set, which changes only when the data does. The export day is the date the cover prints; the exact
 * time, the person and the export id stay in the export's history record beside the zip's
 * SHA-256, so two sets of the same data can be told apart by their record and recognised as
 * the same by their hash.
 */
import { CAUTION } from '$lib/caution';
import { plural } from '$lib/words';
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import crypto from 'node:crypto';
import { once } from 'node:events';
import archiver from 'archiver';
import { eq } from 'drizzle-orm';
import { db, schema } from '../db';
import * as storage from '../storage';
import * as pins from '../pins';
import * as nde from '../nde';
import { describeScope, type ExportRequest } from '$lib/schemas/export';
import { isComplete } from '$lib/joint-state';
import { buildMarkedUpSet, type IndexEntry } from './marked-up-set';
import { inspectionsCsv, weldLogCsv, weldLogRows, weldLogXlsx, type PhotoFile } from './records';
import * as photos from '../photos';
import { preview, recordsAsOf, resolve } from './scope';

export interface PackageJob {
	exportId: number;
	projectId: number;
	request: ExportRequest;
	requestedBy: { name: string | null; email: string };
	/** When the job started; its UTC day is the export date printed in the set. */
	startedAt: number;
	onProgress: (progress: number, current: string) => void;
	checkpoint: () => void;
}

export interface PackageResult {
	fileKey: string;
	bytes: number;
	sha256: string;
	report: string[];
}

function appVersion(): string {
	try {
		const pkg = JSON.parse(fs.readFileSync(path.resolve('package.json'), 'utf8')) as {
			version?: string;
		};
		return pkg.version ?? 'unknown';
	} catch {
		return 'unknown';
	}
}

function sha256(bytes: Uint8Array): string {
	return crypto.createHash('sha256').update(bytes).digest('hex');
}

function reportLine(entry: IndexEntry): string {
	const name = `${entry.drawing} rev ${entry.revision}${entry.status === 'superseded' ? ' (superseded)' : ''}`;
	if (entry.problem) return `${name}: not included, ${entry.problem}.`;
	return `${name}: ${plural(entry.sheets, 'sheet')}, ${plural(entry.pins, 'weld mark')} stamped.`;
}

function asOfTime(ms: number | null): string | null {
	return ms === null ? null : new Date(ms).toISOString();
}

/** The share of the job the sheets take; the records and the zip share the rest. */
const SHEETS_SHARE = 0.85;

export async function buildPackage(job: PackageJob): Promise<PackageResult> {
	const project = db
		.select()
		.from(schema.projects)
		.where(eq(schema.projects.id, job.projectId))
		.get();
	if (!project) throw new Error('The project no longer exists.');
	const drawings = resolve(job.projectId, job.request);
	const facts = preview(job.projectId, job.request);
	const exportDay = new Date(job.startedAt).toISOString().slice(0, 10);
	const fixedDate = new Date(`${exportDay}T00:00:00.000Z`);
	const scopeText = describeScope(job.request.scope, drawings.length);
	const options = [
		job.request.includeSuperseded ? 'superseded revisions included' : 'current revisions only',
		job.request.acceptedOnly ? 'accepted welds only' : 'welds in every state'
	];
	const warnings = [
		...(facts.notAccepted > 0
			? [`${plural(facts.notAccepted, 'weld is', 'welds are')} not accepted yet.`]
			: []),
		...(facts.pinsToReview > 0
			? [`${plural(facts.pinsToReview, 'weld mark')} still to be checked after a new revision.`]
			: [])
	];
	const who = job.requestedBy.name
		? `${job.requestedBy.name} <${job.requestedBy.email}>`
		: job.requestedBy.email;

	const set = await buildMarkedUpSet({
		cover: {
			projectCode: project.code,
			projectName: project.name,
			client: project.client,
			scope: scopeText,
			options,
			exportDay,
			exportedBy: who,
			counts: facts.joints,
			warnings
		},
		drawings,
		pinsOf: (revisionId) =>
			pins
				.ofRevision(revisionId)
				.filter((pin) => !job.request.acceptedOnly || isComplete(pin.state))
				.map((pin) => ({
					pageIndex: pin.pageIndex,
					x: pin.x,
					y: pin.y,
					state: pin.state,
					label: pin.label,
					needsReview: pin.needsReview
				})),
		readFile: (key) => storage.readAll(key),
		fixedDate,
		onProgress: (done, total, current) =>
			job.onProgress(total === 0 ? 0 : (done / total) * SHEETS_SHARE, current),
		checkpoint: job.checkpoint
	});

	job.onProgress(SHEETS_SHARE, 'Weld log');
	// Read a chunk at a time with a pause between, so a big log never holds the event loop.
	const rows = [];
	for (const row of weldLogRows(job.projectId, job.request, drawings)) {
		rows.push(row);
		if (rows.length % 500 === 0) await new Promise<void>((r) => setImmediate(r));
	}
	const xlsx = await weldLogXlsx(rows, fixedDate);
	const csv = await weldLogCsv(rows);
	job.checkpoint();
	job.onProgress(0.92, 'Inspection records');
	const photoFiles: PhotoFile[] = [];
	const inspections = inspectionsCsv(job.request, drawings, photoFiles);
	job.checkpoint();
	// The records' photos, as stored (re-encoded at upload), named as inspections.csv names them.
	const photoEntries: { name: string; bytes: Uint8Array }[] = [];
	for (const file of photoFiles) {
		const photo = photos.get(file.photoId);
		if (photo)
			photoEntries.push({ name: file.name, bytes: await storage.readAll(photo.storageKey) });
	}
	// NDE lots: every weld of each lot on these drawings, how it was selected, its report and result.
	const ndeRegister = nde.registerCsv(drawings.map((d) => d.id));
	job.checkpoint();

	const files: { name: string; bytes: Uint8Array }[] = [
		{ name: 'marked-up-set.pdf', bytes: set.bytes },
		{ name: 'weld-log.xlsx', bytes: xlsx },
		{ name: 'weld-log.csv', bytes: csv },
		{ name: 'inspections.csv', bytes: inspections },
		{ name: 'nde-register.csv', bytes: ndeRegister },
		...photoEntries
	];
	const problems = set.entries.filter((e) => e.problem);
	const manifest = {
		format: 'tacksheet-turnover-set/1',
		notice: CAUTION,
		project: { code: project.code, name: project.name, client: project.client },
		scope: {
			description: scopeText,
			...job.request.scope,
			includeSuperseded: job.request.includeSuperseded,
			acceptedOnly: job.request.acceptedOnly
		},
		exportDay,
		recordsAsOf: asOfTime(recordsAsOf(drawings.map((d) => d.id))),
		exportedBy: job.requestedBy,
		app: { name: 'tacksheet', version: appVersion() },
		determinism:
			'For unchanged data, scope, options, person and UTC export day, every file and the zip itself are byte-identical; every date inside the set is the export day, 00:00 UTC.',
		counts: { ...facts, joints: facts.joints },
		pages: set.pageCount,
		files: files.map((f) => ({ name: f.name, bytes: f.bytes.byteLength, sha256: sha256(f.bytes) })),
		sources: drawings.flatMap((drawing) =>
			drawing.revisions.map((rev) => {
				const entry = set.entries.find(
					(e) => e.drawing === drawing.number && e.revision === rev.label
				);
				return {
					drawing: drawing.number,
					title: drawing.title,
					revision: rev.label,
					status: rev.status,
					sha256: rev.sha256,
					bytes: rev.bytes,
					sheets: rev.sheets.length,
					included: !entry?.problem,
					...(entry?.problem ? { problem: entry.problem } : {})
				};
			})
		)
	};
	files.push({
		name: 'manifest.json',
		bytes: Buffer.from(JSON.stringify(manifest, null, 2) + '\n', 'utf8')
	});

	job.onProgress(0.96, 'Writing the zip');
	const fileKey = storage.newKey('exports', '.zip');
	const final = storage.pathOf(fileKey);
	const partial = `${final}.part`;
	await fsp.mkdir(path.dirname(final), { recursive: true });
	const hash = crypto.createHash('sha256');
	let size = 0;
	try {
		const archive = archiver('zip', { zlib: { level: 6 } });
		const out = fs.createWriteStream(partial);
		archive.on('data', (chunk: Buffer) => {
			hash.update(chunk);
			size += chunk.length;
		});
		const failed = new Promise<never>((_, reject) => {
			archive.on('error', reject);
			out.on('error', reject);
		});
		archive.pipe(out);
		for (const file of files)
			archive.append(Buffer.from(file.bytes), { name: file.name, date: fixedDate });
		await Promise.race([Promise.all([archive.finalize(), once(out, 'close')]), failed]);
		job.checkpoint();
		await fsp.rename(partial, final);
	} catch (error) {
		await fsp.rm(partial, { force: true });
		throw error;
	}

	const report = [
		...set.entries.map(reportLine),
		`weld-log.xlsx and weld-log.csv: ${rows.length} joint${rows.length === 1 ? '' : 's'}.`,
		`marked-up-set.pdf: ${set.pageCount} pages.`,
		...(problems.length > 0
			? [
					`${problems.length} revision${problems.length === 1 ? ' was' : 's were'} left out; the rest of the set is complete.`
				]
			: [])
	];
	return { fileKey, bytes: size, sha256: hash.digest('hex'), report };
}
