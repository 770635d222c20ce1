/**
 * The record files of a turnover set: the weld log (through the weld-log module, so the set
 * carries exactly the log the app shows) and every inspection record in scope.
 */
import { PassThrough, type Writable } from 'node:stream';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { db, schema } from '../db';
import { csvLine } from '../csv';
import * as weldLog from '../weld-log';
import * as photos from '../photos';
import { weldLogFilter } from '$lib/schemas/weld-log';
import { COMPLETE_STATES, correctionsOf, displayWeldNumber, isComplete } from '$lib/joint-state';
import type { ExportRequest } from '$lib/schemas/export';
import type { ScopeDrawing } from './scope';
import { withEntryDates } from './zip-dates';
import { CSV_CAUTION_CELL } from '$lib/caution';
import { DECISION_LABELS, STAGE_LABELS, VERDICT_LABELS } from '$lib/domain';
import { isReadingId, readingDefinitions } from '$lib/acceptance';
import { criteriaSetTitle, yesNo } from '$lib/words';
import * as criteriaSets from '../criteria-sets';

/** A reading as the screens name it ("Root opening"); an id the engine no longer knows as stored. */
function readingName(id: string): string {
	return isReadingId(id) ? readingDefinitions[id].label : id;
}

/** Collects what a writer streams, for a zip entry whose hash goes into the manifest. */
export async function collect(write: (writable: Writable) => Promise<void>): Promise<Buffer> {
	const sink = new PassThrough();
	const chunks: Buffer[] = [];
	sink.on('data', (chunk: Buffer) => chunks.push(chunk));
	const done = new Promise<void>((resolve, reject) => {
		sink.on('end', resolve);
		sink.on('error', reject);
	});
	await write(sink);
	await done;
	return Buffer.concat(chunks);
}

/** The weld log's rows for the scope, in the log's own order (drawing, then weld number). */
export function* weldLogRows(
	projectId: number,
	request: ExportRequest,
	drawings: readonly ScopeDrawing[]
) {
	// Accepted only: on the joint's own records or by its lot's sample.
	function* keep(rows: Iterable<weldLog.WeldLogRow>) {
		for (const row of rows) if (!request.acceptedOnly || isComplete(row.state)) yield row;
	}
	if (request.scope.all) {
		yield* keep(weldLog.iterate(projectId, weldLogFilter.parse({})));
		return;
	}
	if (request.scope.area) {
		yield* keep(weldLog.iterate(projectId, weldLogFilter.parse({ area: request.scope.area })));
		return;
	}
	for (const drawing of drawings)
		yield* keep(weldLog.iterate(projectId, weldLogFilter.parse({ drawing: drawing.id })));
}

export async function weldLogCsv(rows: Iterable<weldLog.WeldLogRow>): Promise<Buffer> {
	return collect((w) => weldLog.writeCsv(rows, w));
}

/**
 * The workbook dated `fixedDate` throughout (its properties and every part in its zip), so
 * unchanged rows give the same bytes.
 */
export async function weldLogXlsx(
	rows: Iterable<weldLog.WeldLogRow>,
	fixedDate: Date
): Promise<Buffer> {
	const bytes = await collect((w) => weldLog.writeXlsx(rows, w, undefined, { fixedDate }));
	return withEntryDates(bytes, fixedDate);
}

// inspections.csv ---------------------------------------------------------------------------

/** A photo of a record in the set: its name there (under `photos/`) and its id. */
export interface PhotoFile {
	name: string;
	photoId: number;
}

const HEADERS = [
	'Drawing',
	'Weld no.',
	'Stage',
	'NDE method',
	'Repair cycle',
	'Inspector',
	'Inspected at (UTC)',
	'Readings as typed',
	'Readings (mm, degrees)',
	'Verdict',
	'Decision',
	'Against verdict',
	'Reason',
	'Report no.',
	'Technician',
	'Criteria set',
	'Record id',
	'Corrects record',
	'Stands',
	'Photos'
];

function shownValue(value: number | boolean | null, unit: string | null): string {
	if (value === null) return '';
	if (typeof value === 'boolean') return yesNo(value);
	const rounded = Math.round(value * 1000) / 1000;
	return unit === 'deg' ? `${rounded}°` : unit === 'mm' ? `${rounded} mm` : String(rounded);
}

const CHUNK = 2000;

/**
 * Every inspection record of the joints in scope, corrections included (each names the row
 * it corrects), ordered by drawing, weld number and time so the file reads as a history.
 */
export function inspectionsCsv(
	request: ExportRequest,
	drawings: readonly ScopeDrawing[],
	/** Filled with the photos of the records written, by their name in the set. */
	photoFiles: PhotoFile[] = []
): Buffer {
	const i = schema.inspections;
	const j = schema.joints;
	const lines: string[] = [csvLine([CSV_CAUTION_CELL]), csvLine(HEADERS)];
	const ids = drawings.map((d) => d.id);
	const numberOf = new Map(drawings.map((d) => [d.id, d.number]));
	for (let start = 0; start < ids.length; start += CHUNK) {
		const rows = db
			.select({
				id: i.id,
				drawingId: j.drawingId,
				projectId: j.projectId,
				number: j.number,
				sortKey: j.sortKey,
				stage: i.stage,
				method: i.method,
				repairCycle: i.repairCycle,
				readings: i.readings,
				verdict: i.verdict,
				decision: i.decision,
				againstVerdict: i.againstVerdict,
				reason: i.reason,
				reportNo: i.reportNo,
				technician: i.technician,
				criteriaSetId: i.criteriaSetId,
				criteriaSetVersion: i.criteriaSetVersion,
				inspectedAt: i.inspectedAt,
				supersedesId: i.supersedesId,
				inspector: schema.users.name,
				inspectorEmail: schema.users.email
			})
			.from(i)
			.innerJoin(j, eq(j.id, i.jointId))
			.innerJoin(schema.users, eq(schema.users.id, i.inspectorId))
			.where(
				and(
					inArray(j.drawingId, ids.slice(start, start + CHUNK)),
					request.acceptedOnly ? inArray(j.state, [...COMPLETE_STATES]) : undefined
				)
			)
			.orderBy(asc(j.drawingId), asc(j.sortKey), asc(i.inspectedAt), asc(i.id))
			.all();
		// Drawing ids follow upload order; the file follows the drawing numbers.
		const order = new Map(ids.map((id, n) => [id, n]));
		rows.sort(
			(a, b) =>
				order.get(a.drawingId)! - order.get(b.drawingId)! ||
				(a.sortKey < b.sortKey ? -1 : a.sortKey > b.sortKey ? 1 : 0) ||
				a.inspectedAt - b.inspectedAt ||
				a.id - b.id
		);
		// A drawing's joints sit in one chunk, so every correction is beside the row it names.
		const correctedBy = correctionsOf(rows);
		const photosOf = photos.byInspection(rows.map((row) => row.id));
		for (const row of rows) {
			const correction = correctedBy.get(row.id);
			const set = row.criteriaSetId
				? criteriaSets.resolve(
						row.projectId,
						row.criteriaSetId,
						row.criteriaSetVersion ?? undefined
					)
				: undefined;
			const names = (photosOf.get(row.id) ?? []).map((photo) => {
				const name = `photos/record-${row.id}-photo-${photo.id}.jpg`;
				photoFiles.push({ name, photoId: photo.id });
				return name;
			});
			lines.push(
				csvLine([
					numberOf.get(row.drawingId) ?? '',
					displayWeldNumber(row.number, row.repairCycle),
					STAGE_LABELS[row.stage].title,
					row.method ?? '',
					row.repairCycle,
					row.inspector ? `${row.inspector} <${row.inspectorEmail}>` : row.inspectorEmail,
					new Date(row.inspectedAt).toISOString(),
					row.readings.map((r) => `${readingName(r.id)}: ${r.text}`).join('; '),
					row.readings
						.filter((r) => r.value !== null)
						.map((r) => `${readingName(r.id)}: ${shownValue(r.value, r.unit)}`)
						.join('; '),
					row.verdict ? VERDICT_LABELS[row.verdict] : '',
					DECISION_LABELS[row.decision],
					yesNo(row.againstVerdict),
					row.reason ?? '',
					row.reportNo ?? '',
					row.technician ?? '',
					set
						? criteriaSetTitle({ ...set, version: row.criteriaSetVersion ?? set.version })
						: (row.criteriaSetId ?? ''),
					row.id,
					row.supersedesId ?? '',
					correction ? `No: corrected by record ${correction.id}` : 'Yes',
					names.join('; ')
				])
			);
		}
	}
	return Buffer.from('\uFEFF' + lines.join(''), 'utf8');
}
