/**
 * NDE figures and records: repair rate per welder and per lot on the joint and the length
 * basis, the weld log's NDE columns and filters, and the turnover set's `nde-register.csv`.
 */
import { and, asc, eq, inArray, isNull, sql, type SQL } from 'drizzle-orm';
import { db, schema } from '../db';
import {
	JOINT_BASIS,
	LENGTH_BASIS,
	repairRate,
	type ExaminedWeld,
	type RepairRate
} from '$lib/nde/repair-rate';
import { REASON_WORDS, SAMPLE_REASONS, type SelectionReason } from '$lib/nde/sampling';
import { displayWeldNumber, STATE_LOOKS } from '$lib/joint-state';
import { SELECTION_FILTERS, type SelectionFilter } from '$lib/nde/log';

const i = schema.inspections;

/** An NDE row no later row corrects. */
const standing = sql`not exists (select 1 from ${i} as later where later.supersedes_id = ${i.id})`;

interface WeldRow {
	weldKey: string;
	diameterMm: number | null;
	rejected: number;
	rejectedMm: number | null;
}

/**
 * Each weld (joint and repair cycle) examined by NDE, by the given method or any, with
 * whether any result in force rejected it and the lengths of the indications rejected.
 */
function examinedWelds(where: SQL, method?: string) {
	return db.all<WeldRow & { groupId: number }>(sql`
		select w.joint_id || '/' || w.repair_cycle as weldKey, g.group_id as groupId,
			j.diameter_mm as diameterMm,
			max(case when ${i.decision} = 'reject' then 1 else 0 end) as rejected,
			(select sum(x.length_mm) from ${schema.ndeIndications} x
				join ${i} as r on r.id = x.inspection_id
				where r.joint_id = w.joint_id and r.repair_cycle = w.repair_cycle and r.stage = 'nde'
					and x.rejected = 1 ${method ? sql`and r.method = ${method}` : sql``}) as rejectedMm
		from ${schema.welds} w
		join ${schema.joints} j on j.id = w.joint_id
		join ${i} on ${i.jointId} = w.joint_id and ${i.repairCycle} = w.repair_cycle and ${i.stage} = 'nde'
			${method ? sql`and ${i.method} = ${method}` : sql``} and ${standing}
		join (${where}) g on g.weld_id = w.id
		group by w.id, g.group_id`);
}

function rates(rows: (WeldRow & { groupId: number })[]): Map<number, RepairRate> {
	const byGroup = new Map<number, ExaminedWeld[]>();
	for (const row of rows) {
		const list = byGroup.get(row.groupId) ?? [];
		list.push({
			diameterMm: row.diameterMm,
			rejected: row.rejected === 1,
			indicationLengthsMm: row.rejectedMm ? [row.rejectedMm] : []
		});
		byGroup.set(row.groupId, list);
	}
	return new Map([...byGroup].map(([id, welds]) => [id, repairRate(welds)]));
}

/** Repair rate of each welder of the project, over every weld they put metal in. */
export function welderRates(projectId: number): Map<number, RepairRate> {
	return rates(
		examinedWelds(sql`select distinct ww.weld_id, ww.welder_id as group_id
			from ${schema.weldWelders} ww join ${schema.welders} wr on wr.id = ww.welder_id
			where wr.project_id = ${projectId}`)
	);
}

/** The whole project's repair rate. */
export function projectRate(projectId: number): RepairRate {
	return (
		rates(
			examinedWelds(sql`select w2.id as weld_id, 0 as group_id from ${schema.welds} w2
				join ${schema.joints} j2 on j2.id = w2.joint_id where j2.project_id = ${projectId}`)
		).get(0) ?? repairRate([])
	);
}

/** Repair rate of each lot, by the lot's method, over every weld and repair of its welds. */
export function lotRates(projectId: number) {
	const lots = db
		.select({ id: schema.ndeLots.id, label: schema.ndeLots.label, method: schema.ndeLots.method })
		.from(schema.ndeLots)
		.where(eq(schema.ndeLots.projectId, projectId))
		.orderBy(asc(schema.ndeLots.label))
		.all();
	const out: { id: number; label: string; method: string; rate: RepairRate }[] = [];
	for (const method of [...new Set(lots.map((l) => l.method))]) {
		const byLot = rates(
			examinedWelds(
				sql`select w3.id as weld_id, m.lot_id as group_id from ${schema.welds} w3
					join ${schema.ndeLotJoints} m on m.joint_id = w3.joint_id
					join ${schema.ndeLots} l3 on l3.id = m.lot_id
					where l3.project_id = ${projectId} and l3.method = ${method}`,
				method
			)
		);
		for (const lot of lots.filter((l) => l.method === method)) {
			const rate = byLot.get(lot.id);
			if (rate) out.push({ ...lot, rate });
		}
	}
	return out.sort((a, b) => a.label.localeCompare(b.label));
}

// The weld log ------------------------------------------------------------------------------

export interface LogFields {
	/** Lots the weld is in, by name. */
	ndeLot: string;
	/** How it was selected (Random, Tracer, 100 % …), or "Not selected" in a lot; '' in none. */
	ndeSelection: string;
	/** The weld whose reject called this tracer: `LBM-20-ISO-1102 7`. */
	ndeTracerOf: string;
}

const EMPTY_FIELDS: LogFields = { ndeLot: '', ndeSelection: '', ndeTracerOf: '' };

/** The weld log's NDE columns for the given joints. */
export function logFields(jointIds: readonly number[]): Map<number, LogFields> {
	const out = new Map<number, LogFields>();
	if (jointIds.length === 0) return out;
	const lots = db
		.select({ jointId: schema.ndeLotJoints.jointId, label: schema.ndeLots.label })
		.from(schema.ndeLotJoints)
		.innerJoin(schema.ndeLots, eq(schema.ndeLots.id, schema.ndeLotJoints.lotId))
		.where(inArray(schema.ndeLotJoints.jointId, [...jointIds]))
		.orderBy(asc(schema.ndeLots.label))
		.all();
	const tracerOf = schema.joints;
	const selections = db
		.select({
			jointId: schema.ndeSelections.jointId,
			reason: schema.ndeSelections.reason,
			method: schema.ndeSelections.method,
			tracerOfNumber: tracerOf.number,
			tracerOfDrawing: schema.drawings.number
		})
		.from(schema.ndeSelections)
		.leftJoin(tracerOf, eq(tracerOf.id, schema.ndeSelections.tracerOfJointId))
		.leftJoin(schema.drawings, eq(schema.drawings.id, tracerOf.drawingId))
		.where(
			and(
				inArray(schema.ndeSelections.jointId, [...jointIds]),
				isNull(schema.ndeSelections.cancelledAt)
			)
		)
		.orderBy(asc(schema.ndeSelections.id))
		.all();
	for (const row of lots) {
		const fields = out.get(row.jointId) ?? { ...EMPTY_FIELDS };
		fields.ndeLot = fields.ndeLot ? `${fields.ndeLot}; ${row.label}` : row.label;
		fields.ndeSelection = 'Not selected';
		out.set(row.jointId, fields);
	}
	for (const row of selections) {
		const fields = out.get(row.jointId) ?? { ...EMPTY_FIELDS };
		const words = `${REASON_WORDS[row.reason]} (${row.method})`;
		fields.ndeSelection =
			fields.ndeSelection && fields.ndeSelection !== 'Not selected'
				? `${fields.ndeSelection}; ${words}`
				: words;
		if (row.tracerOfNumber)
			fields.ndeTracerOf = `${row.tracerOfDrawing ?? ''} ${row.tracerOfNumber}`.trim();
		out.set(row.jointId, fields);
	}
	return out;
}

export { SELECTION_FILTERS, type SelectionFilter };

const REASONS_OF: Record<Exclude<SelectionFilter, 'not-selected'>, readonly SelectionReason[]> = {
	selected: ['random', 'swap', 'client', 'tracer', 'full', 'required'],
	sample: SAMPLE_REASONS,
	tracer: ['tracer'],
	full: ['full']
};

/** The weld log's NDE filters as conditions on `joints.id`. */
export function logWhere(
	projectId: number,
	jointId: SQL.Aliased | SQL | typeof schema.joints.id,
	filter: { selection?: SelectionFilter; lot?: number; report?: string }
): SQL | undefined {
	const parts: SQL[] = [];
	const s = schema.ndeSelections;
	if (filter.selection === 'not-selected') {
		parts.push(sql`${jointId} in (select m.joint_id from ${schema.ndeLotJoints} m
			join ${schema.ndeLots} l on l.id = m.lot_id where l.project_id = ${projectId})`);
		parts.push(sql`${jointId} not in (select ${s.jointId} from ${s}
			where ${s.projectId} = ${projectId} and ${s.cancelledAt} is null)`);
	} else if (filter.selection) {
		const reasons = REASONS_OF[filter.selection];
		parts.push(sql`${jointId} in (select ${s.jointId} from ${s}
			where ${s.projectId} = ${projectId} and ${s.cancelledAt} is null
			and ${s.reason} in (${sql.join(
				reasons.map((r) => sql`${r}`),
				sql`, `
			)}))`);
	}
	if (filter.lot)
		parts.push(
			sql`${jointId} in (select m.joint_id from ${schema.ndeLotJoints} m where m.lot_id = ${filter.lot})`
		);
	if (filter.report) {
		const pattern = `%${filter.report.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
		parts.push(sql`${jointId} in (select ${i.jointId} from ${i}
			where ${i.stage} = 'nde' and ${i.reportNo} like ${pattern} escape '\\')`);
	}
	return parts.length ? and(...parts) : undefined;
}

// nde-register.csv ---------------------------------------------------------------------------

function csvField(value: string | number): string {
	const text = String(value);
	return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

const REGISTER_HEADERS = [
	'Lot',
	'Method',
	'Extent %',
	'Lot status',
	'Drawing',
	'Weld no.',
	'Welders',
	'Selected as',
	'Tracer of',
	'Report no.',
	'Result',
	'Examined (UTC)',
	'Joint state'
];

/**
 * One row per weld of each lot on the given drawings: how it was selected (or not), the
 * report and result of its NDE by the lot's method, and where it stands. RFC 4180, CRLF,
 * in the order lot, drawing, weld number, so unchanged data gives the same bytes.
 */
export function registerCsv(drawingIds: readonly number[]): Buffer {
	const lines: { key: [string, string, string]; line: string }[] = [];
	const j = schema.joints;
	for (let start = 0; start < drawingIds.length; start += 500) {
		const chunk = drawingIds.slice(start, start + 500);
		const rows = db
			.select({
				lotId: schema.ndeLots.id,
				lot: schema.ndeLots.label,
				method: schema.ndeLots.method,
				percent: schema.ndeLots.percent,
				status: schema.ndeLots.status,
				jointId: j.id,
				drawing: schema.drawings.number,
				number: j.number,
				repairCycle: j.repairCycle,
				state: j.state,
				sortKey: j.sortKey
			})
			.from(schema.ndeLotJoints)
			.innerJoin(schema.ndeLots, eq(schema.ndeLots.id, schema.ndeLotJoints.lotId))
			.innerJoin(j, eq(j.id, schema.ndeLotJoints.jointId))
			.innerJoin(schema.drawings, eq(schema.drawings.id, j.drawingId))
			.where(inArray(j.drawingId, chunk))
			.orderBy(asc(schema.ndeLots.label), asc(schema.drawings.number), asc(j.sortKey))
			.all();
		if (rows.length === 0) continue;
		const ids = [...new Set(rows.map((r) => r.jointId))];
		const selections = db
			.select({
				lotId: schema.ndeSelections.lotId,
				jointId: schema.ndeSelections.jointId,
				reason: schema.ndeSelections.reason,
				tracerOf: schema.ndeSelections.tracerOfJointId,
				welderId: schema.ndeSelections.welderId
			})
			.from(schema.ndeSelections)
			.where(
				and(inArray(schema.ndeSelections.jointId, ids), isNull(schema.ndeSelections.cancelledAt))
			)
			.all();
		const tracerOf = new Map(
			db
				.select({ id: j.id, number: j.number, drawing: schema.drawings.number })
				.from(j)
				.innerJoin(schema.drawings, eq(schema.drawings.id, j.drawingId))
				.where(
					inArray(
						j.id,
						selections.map((s) => s.tracerOf).filter((x): x is number => x != null)
					)
				)
				.all()
				.map((r) => [r.id, `${r.drawing} ${r.number}`])
		);
		const results = db
			.select({
				jointId: i.jointId,
				method: i.method,
				repairCycle: i.repairCycle,
				decision: i.decision,
				reportNo: i.reportNo,
				at: i.inspectedAt
			})
			.from(i)
			.where(and(inArray(i.jointId, ids), eq(i.stage, 'nde'), standing))
			.orderBy(asc(i.inspectedAt), asc(i.id))
			.all();
		const welders = new Map<number, string[]>();
		for (const row of db
			.select({ jointId: schema.welds.jointId, stamp: schema.welders.stamp })
			.from(schema.welds)
			.innerJoin(schema.weldWelders, eq(schema.weldWelders.weldId, schema.welds.id))
			.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
			.where(and(inArray(schema.welds.jointId, ids), eq(schema.welds.repairCycle, 0)))
			.orderBy(asc(schema.welders.stamp))
			.all()) {
			const list = welders.get(row.jointId) ?? [];
			if (!list.includes(row.stamp)) list.push(row.stamp);
			welders.set(row.jointId, list);
		}
		const stampOf = new Map(
			db
				.select({ id: schema.welders.id, stamp: schema.welders.stamp })
				.from(schema.welders)
				.where(
					inArray(
						schema.welders.id,
						selections.map((x) => x.welderId).filter((x): x is number => x != null)
					)
				)
				.all()
				.map((w) => [w.id, w.stamp])
		);
		for (const row of rows) {
			const selection = selections.find((s) => s.lotId === row.lotId && s.jointId === row.jointId);
			const own = results.filter((r) => r.jointId === row.jointId && r.method === row.method);
			const last = own.at(-1);
			const selectedAs = !selection
				? 'Not selected'
				: selection.reason === 'full'
					? `100 % of ${stampOf.get(selection.welderId ?? 0) ?? 'welder'}'s work`
					: REASON_WORDS[selection.reason];
			lines.push({
				key: [row.lot, row.drawing, row.sortKey],
				line: [
					row.lot,
					row.method,
					row.percent,
					row.status,
					row.drawing,
					displayWeldNumber(row.number, row.repairCycle),
					(welders.get(row.jointId) ?? []).join(' '),
					selectedAs,
					selection?.tracerOf ? (tracerOf.get(selection.tracerOf) ?? '') : '',
					[...new Set(own.map((r) => r.reportNo).filter((n) => n))].join(' '),
					last ? (last.decision === 'accept' ? 'Accept' : 'Reject') : '',
					last ? new Date(last.at).toISOString().slice(0, 10) : '',
					STATE_LOOKS[row.state].label
				]
					.map(csvField)
					.join(',')
			});
		}
	}
	const order = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
	lines.sort(
		(a, b) => order(a.key[0], b.key[0]) || order(a.key[1], b.key[1]) || order(a.key[2], b.key[2])
	);
	const text = [REGISTER_HEADERS.join(','), ...lines.map((l) => l.line)].join('\r\n');
	return Buffer.from('\uFEFF' + text + '\r\n', 'utf8');
}

/** The project's welders by id, for naming them beside their figures. */
export function welderStamps(projectId: number) {
	return db
		.select({ id: schema.welders.id, stamp: schema.welders.stamp, name: schema.welders.name })
		.from(schema.welders)
		.where(eq(schema.welders.projectId, projectId))
		.orderBy(asc(schema.welders.stamp))
		.all();
}

/** Every repair-rate figure of the project, each with its basis named, for the pages and the API. */
export function repairRates(projectId: number) {
	const names = new Map(welderStamps(projectId).map((w) => [w.id, w]));
	return {
		bases: { joint: JOINT_BASIS, length: LENGTH_BASIS },
		project: projectRate(projectId),
		welders: [...welderRates(projectId)]
			.map(([id, rate]) => ({
				stamp: names.get(id)?.stamp ?? String(id),
				name: names.get(id)?.name ?? '',
				...rate
			}))
			.sort((a, b) => a.stamp.localeCompare(b.stamp)),
		lots: lotRates(projectId)
	};
}
