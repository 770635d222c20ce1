/**
 * The weld log: every joint of a project with its drawing and current revision, welders,
 * fit-up, visual and NDE results, filtered, sorted and paged in SQL. This module is also the
 * shared interface for anything that writes the log out, the turnover export among them:
 * `iterate(projectId, filter)` yields every matching row in the log's order, fetched a
 * chunk at a time so memory stays flat; `COLUMNS` names each column (id, header,
 * value(row)); `writeCsv(rows, writable)` and `writeXlsx(rows, writable)` stream those rows
 * as RFC 4180 CSV or as an Excel workbook written row by row, so 100,000 joints never sit
 * in memory. `list` serves one page to the API and the grid; `summary` and `progress`
 * count joints for the overview and the progress chart.
 */
import type { Writable } from 'node:stream';
import { once } from 'node:events';
import ExcelJS from 'exceljs';
import { csvLine, csvRows } from './csv';
import { and, asc, count, desc, eq, inArray, ne, or, sql, type SQL } from 'drizzle-orm';
import type { AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { db, schema } from './db';
import * as nde from './nde';
import { stateRank } from './db/schema';
import {
	COMPLETE_STATES,
	displayWeldNumber,
	effectiveInspections,
	type Decision
} from '$lib/joint-state';
import { standingSql } from './inspections';
import * as counting from './state-counts';
import { COLUMNS, type WeldLogRow } from '$lib/weld-log';
import { CAUTION, CSV_CAUTION_CELL } from '$lib/caution';
import type { WeldLogFilter, WeldLogQuery } from '$lib/schemas/weld-log';

export { COLUMNS, type WeldLogRow };

const j = schema.joints;
const d = schema.drawings;
const r = schema.revisions;
const w = schema.welds;
const i = schema.inspections;

/** Rows fetched per round trip by `iterate`: big enough to be quick, small enough to stay flat. */
const CHUNK = 1000;

/** Sorts that read the drawing's own columns, and so join it. */
const BY_DRAWING = new Set<WeldLogFilter['sort']>(['drawing', 'area']);

function drawingsWhere(projectId: number, condition: SQL) {
	return db
		.select({ id: d.id })
		.from(d)
		.where(and(eq(d.projectId, projectId), condition));
}

/**
 * The filter, shaped for SQLite's planner: with the drawing joined, the project is asked of
 * the drawing, so the plan walks drawings in number order and each drawing's joints in weld
 * number order off indexes; without it, of the joint, so a joints index serves state, age
 * and number sorts and the count. The drawing's columns are then asked through a subquery.
 */
function whereOf(projectId: number, filter: WeldLogFilter, joined: boolean): SQL | undefined {
	const pattern = `%${filter.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
	const like = (column: AnySQLiteColumn) => sql`${column} like ${pattern} escape '\\'`;
	return and(
		// One drawing is asked by its id, checked to be the project's: asked of the joint, the
		// project would lead the planner to walk every joint in the sort's index instead.
		filter.drawing
			? and(
					eq(j.drawingId, filter.drawing),
					inArray(j.drawingId, drawingsWhere(projectId, eq(d.id, filter.drawing)))
				)
			: joined
				? eq(d.projectId, projectId)
				: eq(j.projectId, projectId),
		filter.state ? eq(j.state, filter.state) : undefined,
		filter.area
			? joined
				? eq(d.area, filter.area)
				: inArray(j.drawingId, drawingsWhere(projectId, eq(d.area, filter.area)))
			: undefined,
		// Any weld of the joint, repairs and the welds they replaced among them: a welder's
		// record covers every joint they put metal in.
		filter.welder
			? inArray(
					j.id,
					db
						.select({ jointId: w.jointId })
						.from(schema.weldWelders)
						.innerJoin(w, eq(w.id, schema.weldWelders.weldId))
						.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
						.where(
							and(eq(schema.welders.projectId, projectId), eq(schema.welders.stamp, filter.welder))
						)
				)
			: undefined,
		filter.againstVerdict
			? inArray(
					j.id,
					db
						.select({ jointId: i.jointId })
						.from(i)
						.where(and(sql`${i.againstVerdict} = 1`, standingSql()))
				)
			: undefined,
		filter.q
			? or(
					like(j.number),
					like(j.line),
					inArray(j.drawingId, drawingsWhere(projectId, like(d.number)))
				)
			: undefined,
		// NDE lots: selected how, in which lot, on which report.
		nde.logWhere(projectId, j.id, filter)
	);
}

function orderOf(filter: WeldLogFilter): SQL[] {
	const dir = filter.dir === 'desc' ? desc : asc;
	// The joint's id breaks every tie, so paging never shows a row twice.
	switch (filter.sort) {
		case 'number':
			return [dir(j.sortKey), dir(j.id)];
		case 'state':
			// In workflow order, and within a state the joint waiting longest first: what the
			// site chases. The same expression as the index joints_project_rank.
			return [dir(stateRank), dir(j.stateSince), dir(j.id)];
		case 'age':
			return [dir(j.stateSince), dir(j.id)];
		case 'weldedOn':
			return [dir(w.weldedOn), dir(j.id)];
		case 'area':
			return [dir(d.area), dir(d.number), dir(j.sortKey), dir(j.id)];
		default:
			return [dir(d.number), dir(j.sortKey), dir(j.id)];
	}
}

/** The ids of the matching joints in the log's order; the light half of every read. */
function idsQuery(projectId: number, filter: WeldLogFilter) {
	const joined = BY_DRAWING.has(filter.sort);
	const base = db.select({ id: j.id }).from(j).$dynamic();
	const withDrawing = joined ? base.innerJoin(d, eq(d.id, j.drawingId)) : base;
	const withWeld =
		filter.sort === 'weldedOn'
			? withDrawing.leftJoin(w, and(eq(w.jointId, j.id), eq(w.repairCycle, j.repairCycle)))
			: withDrawing;
	return withWeld.where(whereOf(projectId, filter, joined)).orderBy(...orderOf(filter));
}

export function countOf(projectId: number, filter: WeldLogFilter): number {
	return (
		db
			.select({ n: count() })
			.from(j)
			.where(whereOf(projectId, filter, false))
			.get()?.n ?? 0
	);
}

/** The full rows of the given joints, in the order of `ids`. */
function rowsOf(ids: number[]): WeldLogRow[] {
	if (ids.length === 0) return [];
	const base = db
		.select({
			id: j.id,
			drawingId: j.drawingId,
			drawing: d.number,
			revision: r.label,
			pageIndex: schema.pins.pageIndex,
			number: j.number,
			repairCycle: j.repairCycle,
			kind: j.kind,
			location: j.location,
			size: j.sizeText,
			thickness: j.thicknessText,
			material: j.material,
			wps: j.wps,
			weldWps: w.wps,
			// The register's WPS the joint names, as number and revision.
			registerWps: sql<
				string | null
			>`(select ${schema.wps.number} || ' rev ' || ${schema.wps.revision} from ${schema.wps} where ${schema.wps.id} = ${j.wpsId})`,
			jointLine: j.line,
			drawingLine: d.line,
			area: d.area,
			system: d.system,
			state: j.state,
			stateSince: j.stateSince,
			weldId: w.id,
			weldedOn: w.weldedOn,
			ndeRequired: j.ndeRequired,
			voidReason: j.voidReason
		})
		.from(j)
		.innerJoin(d, eq(d.id, j.drawingId))
		.leftJoin(r, and(eq(r.drawingId, d.id), eq(r.status, 'current')))
		.leftJoin(schema.pins, and(eq(schema.pins.jointId, j.id), eq(schema.pins.revisionId, r.id)))
		.leftJoin(w, and(eq(w.jointId, j.id), eq(w.repairCycle, j.repairCycle)))
		.where(inArray(j.id, ids))
		.all();

	const weldIds = base.map((row) => row.weldId).filter((id) => id != null);
	const stamps = weldIds.length
		? db
				.select({
					weldId: schema.weldWelders.weldId,
					pass: schema.weldWelders.pass,
					stamp: schema.welders.stamp
				})
				.from(schema.weldWelders)
				.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
				.where(inArray(schema.weldWelders.weldId, weldIds))
				.orderBy(asc(schema.welders.stamp))
				.all()
		: [];

	// Every record, in the order signed; the standing rule then puts each correction in the
	// place of the row it names, exactly as the joint's state reads them.
	const records = db
		.select({
			id: i.id,
			supersedesId: i.supersedesId,
			jointId: i.jointId,
			stage: i.stage,
			method: i.method,
			repairCycle: i.repairCycle,
			decision: i.decision,
			reportNo: i.reportNo,
			inspectedAt: i.inspectedAt,
			againstVerdict: i.againstVerdict,
			inspector: schema.users.name
		})
		.from(i)
		.leftJoin(schema.users, eq(schema.users.id, i.inspectorId))
		.where(inArray(i.jointId, ids))
		.orderBy(asc(i.inspectedAt), asc(i.id))
		.all();

	const stampsOf = new Map<number, { root: string[]; fillCap: string[] }>();
	for (const s of stamps) {
		const entry = stampsOf.get(s.weldId) ?? { root: [], fillCap: [] };
		const list = s.pass === 'root' ? entry.root : entry.fillCap;
		if (!list.includes(s.stamp)) list.push(s.stamp);
		stampsOf.set(s.weldId, entry);
	}
	const ndeFields = nde.logFields(ids);
	const recordsOf = new Map<number, typeof records>();
	for (const rec of records)
		recordsOf.set(rec.jointId, [...(recordsOf.get(rec.jointId) ?? []), rec]);

	const byId = new Map(
		base.map((row) => {
			const own = effectiveInspections(recordsOf.get(row.id) ?? []);
			const fitup = own.findLast((rec) => rec.stage === 'fitup');
			const visual = own.findLast(
				(rec) => rec.stage === 'visual' && rec.repairCycle === row.repairCycle
			);
			const nde = own.filter((rec) => rec.stage === 'nde' && rec.repairCycle === row.repairCycle);
			const welders = row.weldId != null ? stampsOf.get(row.weldId) : undefined;
			const item: WeldLogRow = {
				id: row.id,
				drawingId: row.drawingId,
				drawing: row.drawing,
				revision: row.revision,
				sheet: row.pageIndex == null ? null : row.pageIndex + 1,
				number: row.number,
				weldNumber: displayWeldNumber(row.number, row.repairCycle),
				kind: row.kind,
				location: row.location,
				size: row.size,
				thickness: row.thickness,
				material: row.material,
				wps: row.weldWps || row.registerWps || row.wps,
				line: row.jointLine || row.drawingLine,
				area: row.area,
				system: row.system,
				state: row.state,
				stateSince: row.stateSince,
				rootWelders: welders?.root ?? [],
				fillCapWelders: welders?.fillCap ?? [],
				weldedOn: row.weldedOn,
				fitupAt: fitup?.inspectedAt ?? null,
				fitupInspector: fitup?.inspector ?? null,
				fitupResult: fitup?.decision ?? null,
				visualAt: visual?.inspectedAt ?? null,
				visualInspector: visual?.inspector ?? null,
				visualResult: visual?.decision ?? null,
				ndeRequired: row.ndeRequired,
				ndeMethods: [...new Set(nde.map((rec) => rec.method).filter((m) => m != null))]
					.sort()
					.join('+'),
				ndeReports: [...new Set(nde.map((rec) => rec.reportNo).filter((n) => n))].join(' '),
				ndeResult: ndeResult(nde.map((rec) => rec.decision)),
				ndeAt: nde.length ? Math.max(...nde.map((rec) => rec.inspectedAt)) : null,
				repairCount: row.repairCycle,
				voidReason: row.voidReason,
				againstVerdict: own.some((rec) => rec.againstVerdict),
				ndeLot: ndeFields.get(row.id)?.ndeLot ?? '',
				ndeSelection: ndeFields.get(row.id)?.ndeSelection ?? '',
				ndeTracerOf: ndeFields.get(row.id)?.ndeTracerOf ?? ''
			};
			return [row.id, item] as const;
		})
	);
	return ids.map((id) => byId.get(id)).filter((row) => row !== undefined);
}

/** A reject on the current weld stands until a repair starts a new cycle. */
function ndeResult(decisions: Decision[]): Decision | null {
	if (decisions.length === 0) return null;
	return decisions.includes('reject') ? 'reject' : 'accept';
}

/** One page of the log, for the API and the grid. */
export function list(projectId: number, query: WeldLogQuery) {
	const ids = idsQuery(projectId, query)
		.limit(query.pageSize)
		.offset((query.page - 1) * query.pageSize)
		.all()
		.map((row) => row.id);
	return {
		items: rowsOf(ids),
		total: countOf(projectId, query),
		page: query.page,
		pageSize: query.pageSize,
		notice: CAUTION
	};
}

/**
 * Every matching row in the log's order. The ordered ids are read once (a few bytes a
 * joint, so a sort is never repeated per chunk), then the rows a chunk at a time.
 */
export function* iterate(projectId: number, filter: WeldLogFilter): Generator<WeldLogRow> {
	const ids = idsQuery(projectId, filter)
		.all()
		.map((row) => row.id);
	for (let start = 0; start < ids.length; start += CHUNK)
		yield* rowsOf(ids.slice(start, start + CHUNK));
}

async function write(writable: Writable, text: string): Promise<void> {
	if (!writable.write(text)) await once(writable, 'drain');
}

/** RFC 4180 CSV (CRLF line ends, with a header row), written as fast as the reader takes it. */
export async function writeCsv(
	rows: Iterable<WeldLogRow>,
	writable: Writable,
	columns: readonly { header: string; value: (row: WeldLogRow) => string | number }[] = COLUMNS
): Promise<void> {
	// A byte-order mark, so a spreadsheet opened by double-click reads the file as UTF-8; then
	// the caution on a line of its own above the header row.
	await write(
		writable,
		'\uFEFF' + csvLine([CSV_CAUTION_CELL]) + csvLine(columns.map((c) => c.header))
	);
	let batch: (string | number)[][] = [];
	for (const row of rows) {
		batch.push(columns.map((c) => c.value(row)));
		if (batch.length === 500) {
			await write(writable, csvRows(batch));
			batch = [];
		}
	}
	if (batch.length > 0) await write(writable, csvRows(batch));
	writable.end();
	await once(writable, 'finish');
}

/**
 * exceljs's streaming sheet hands its XML on to the zip without waiting (its write always
 * answers true), so 100,000 rows would pile up unzipped in memory. Wait while the zip's
 * entry stream holds more than it can take, then give the event loop a turn. A reader that
 * went away (the download was cancelled) ends the wait, and the workbook with it.
 */
async function sheetDrained(sheet: object, writable: Writable): Promise<void> {
	type Entry = Writable & { _writableState?: { needDrain?: boolean } };
	const entry = (sheet as { stream?: { pipes?: Entry[] } }).stream?.pipes?.[0];
	// archiver's entry is a readable-stream PassThrough, older than `writableNeedDrain`.
	while (entry?._writableState?.needDrain && !writable.destroyed) {
		const settled = new AbortController();
		const { signal } = settled;
		await Promise.race([once(entry, 'drain', { signal }), once(writable, 'close', { signal })]);
		settled.abort();
	}
	if (writable.destroyed) throw new Error('The download was cancelled.');
	await new Promise((resolve) => setImmediate(resolve));
}

/**
 * An Excel workbook of one sheet, each row committed (and so flushed) as it is written.
 * With `fixedDate`, the workbook's created and modified dates are that date instead of now
 * (turnover sets, which need the same bytes for unchanged rows).
 */
export async function writeXlsx(
	rows: Iterable<WeldLogRow>,
	writable: Writable,
	columns: readonly {
		header: string;
		value: (row: WeldLogRow) => string | number;
		width?: number;
	}[] = COLUMNS,
	{ fixedDate }: { fixedDate?: Date } = {}
): Promise<void> {
	const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({
		stream: writable,
		useStyles: true,
		useSharedStrings: false,
		...(fixedDate ? { created: fixedDate, modified: fixedDate } : {})
	});
	const sheet = workbook.addWorksheet('Weld log', {
		views: [{ state: 'frozen', ySplit: 1 }],
		// Printed pages carry the caution too.
		headerFooter: { oddFooter: `&L&8${CAUTION.replaceAll('&', '&&')}`, evenFooter: '' }
	});
	sheet.columns = columns.map((c) => ({
		header: c.header,
		width: c.width ?? Math.max(10, c.header.length + 2)
	}));
	sheet.getRow(1).font = { bold: true };
	sheet.getRow(1).commit();
	let n = 0;
	for (const row of rows) {
		sheet.addRow(columns.map((c) => c.value(row))).commit();
		// Let the zip stream drain now and then; the rows themselves come synchronously.
		if (++n % 200 === 0) await sheetDrained(sheet, writable);
	}
	// Filter buttons on the header over every row: the first thing a QC manager reaches for.
	sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: n + 1, column: columns.length } };
	sheet.commit();
	notesSheet(workbook);
	await workbook.commit();
}

/** The workbook's Notes sheet: the caution, and how to read the log. */
function notesSheet(workbook: ExcelJS.stream.xlsx.WorkbookWriter): void {
	const notes = workbook.addWorksheet('Notes');
	notes.columns = [{ header: 'Notes', width: 110 }];
	notes.getRow(1).font = { bold: true };
	notes.getRow(1).commit();
	const lines = [
		CAUTION,
		'Fit-up, Visual and NDE give the standing result of each stage: Accept or Reject; empty where none is recorded.',
		'Against verdict: Yes where the inspector decided against the verdict the criteria gave.',
		'Dates are UTC days (YYYY-MM-DD).'
	];
	lines.forEach((line, n) => {
		const row = notes.addRow([line]);
		if (n === 0) row.font = { bold: true };
		row.commit();
	});
	notes.commit();
}

/** A file name safe on every system: `LBM-20-weld-log-2026-12-02.csv`. */
export function fileName(projectCode: string, extension: 'csv' | 'xlsx', at = new Date()): string {
	const code =
		projectCode.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^[-.]+|[-.]+$/g, '') || 'project';
	return `${code}-weld-log-${at.toISOString().slice(0, 10)}.${extension}`;
}

/** Joints per state for the project and each area (each drawing's when asked): the kept counts. */
export function summary(projectId: number, { drawings = false } = {}) {
	return counting.summary(projectId, { drawings });
}

const DAY_MS = 86_400_000;
/** A chart of more days than this would be unreadable; older days fold into the first. */
const MAX_DAYS = 1000;

/**
 * Joints accepted per UTC day and the running total, against the live joints in scope.
 * A joint counts on the day it reached `accepted`, as long as it still is: a repair takes
 * it out again, so the last cumulative figure is always today's accepted count.
 */
export function progress(projectId: number, area?: string) {
	const scope = and(
		eq(j.projectId, projectId),
		area
			? inArray(
					j.drawingId,
					db
						.select({ id: d.id })
						.from(d)
						.where(and(eq(d.projectId, projectId), eq(d.area, area)))
				)
			: undefined
	);
	const day = sql<number>`cast(${j.stateSince} / ${sql.raw(String(DAY_MS))} as integer)`;
	const perDay = db
		.select({ day, n: count() })
		.from(j)
		.where(and(scope, inArray(j.state, [...COMPLETE_STATES])))
		.groupBy(day)
		.orderBy(day)
		.all();
	const total =
		db
			.select({ n: count() })
			.from(j)
			.where(and(scope, ne(j.state, 'void')))
			.get()?.n ?? 0;
	const days: { day: string; accepted: number; cumulative: number }[] = [];
	if (perDay.length > 0) {
		const last = perDay.at(-1)!.day;
		const first = Math.max(perDay[0].day, last - MAX_DAYS + 1);
		const counts = new Map<number, number>();
		for (const row of perDay) {
			const key = Math.max(row.day, first);
			counts.set(key, (counts.get(key) ?? 0) + row.n);
		}
		let cumulative = 0;
		for (let n = first; n <= last; n++) {
			const accepted = counts.get(n) ?? 0;
			cumulative += accepted;
			days.push({ day: new Date(n * DAY_MS).toISOString().slice(0, 10), accepted, cumulative });
		}
	}
	return { area: area ?? null, total, accepted: days.at(-1)?.cumulative ?? 0, days };
}

/** What the log's filters offer: the project's areas and welder stamps (drawings are searched). */
export function filterOptions(projectId: number) {
	return {
		areas: db
			.selectDistinct({ area: d.area })
			.from(d)
			.where(and(eq(d.projectId, projectId), ne(d.area, '')))
			.orderBy(asc(d.area))
			.all()
			.map((row) => row.area),
		welders: db
			.select({ stamp: schema.welders.stamp, name: schema.welders.name })
			.from(schema.welders)
			.where(eq(schema.welders.projectId, projectId))
			.orderBy(asc(schema.welders.stamp))
			.all()
	};
}
