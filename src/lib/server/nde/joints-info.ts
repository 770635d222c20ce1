/** Joints as the lot page, the request e-mail and the register name them. */
import { and, eq, inArray } from 'drizzle-orm';
import { schema } from '../db';
import { displayWeldNumber, STATE_LOOKS, type JointState } from '$lib/joint-state';
import type { Reader } from './rows';

export interface JointInfo {
	id: number;
	drawingId: number;
	drawing: string;
	number: string;
	/** As written on the map, with the repair suffix. */
	label: string;
	repairCycle: number;
	kind: string;
	location: string;
	size: string;
	thickness: string;
	diameterMm: number | null;
	state: JointState;
	stateLabel: string;
	voided: boolean;
	/** Stamps of the original weld's welders, root first. */
	welders: string[];
	weldedOn: string | null;
	/** 1-based sheet of the current revision where its pin is. */
	sheet: number | null;
}

const j = schema.joints;
const passOrder: Record<string, number> = { root: 0, fill: 1, cap: 2 };

function rowsQuery(reader: Reader) {
	return reader
		.select({
			id: j.id,
			drawingId: j.drawingId,
			drawing: schema.drawings.number,
			number: j.number,
			repairCycle: j.repairCycle,
			kind: j.kind,
			location: j.location,
			size: j.sizeText,
			thickness: j.thicknessText,
			diameterMm: j.diameterMm,
			state: j.state,
			voidedAt: j.voidedAt,
			weldedOn: schema.welds.weldedOn,
			weldId: schema.welds.id
		})
		.from(j)
		.innerJoin(schema.drawings, eq(schema.drawings.id, j.drawingId))
		.leftJoin(schema.welds, and(eq(schema.welds.jointId, j.id), eq(schema.welds.repairCycle, 0)));
}

type Row = Awaited<ReturnType<ReturnType<typeof rowsQuery>['all']>>[number];

function build(
	rows: Row[],
	passes: { weldId: number; pass: string; stamp: string }[],
	sheets: Map<number, number>,
	out: Map<number, JointInfo>
) {
	const stamps = new Map<number, { pass: string; stamp: string }[]>();
	for (const row of passes) {
		const list = stamps.get(row.weldId);
		if (list) list.push(row);
		else stamps.set(row.weldId, [row]);
	}
	for (const r of rows) {
		const mine = r.weldId != null ? (stamps.get(r.weldId) ?? []) : [];
		const welders = [
			...new Set(
				[...mine]
					.sort(
						(a, b) =>
							(passOrder[a.pass] ?? 3) - (passOrder[b.pass] ?? 3) || a.stamp.localeCompare(b.stamp)
					)
					.map((p) => p.stamp)
			)
		];
		out.set(r.id, {
			id: r.id,
			drawingId: r.drawingId,
			drawing: r.drawing,
			number: r.number,
			label: displayWeldNumber(r.number, r.repairCycle),
			repairCycle: r.repairCycle,
			kind: r.kind,
			location: r.location,
			size: r.size,
			thickness: r.thickness,
			diameterMm: r.diameterMm,
			state: r.state,
			stateLabel: STATE_LOOKS[r.state].label,
			voided: r.voidedAt != null,
			welders,
			weldedOn: r.weldedOn,
			sheet: sheets.get(r.id) ?? null
		});
	}
	return out;
}

const passesQuery = (reader: Reader) =>
	reader
		.select({
			weldId: schema.weldWelders.weldId,
			pass: schema.weldWelders.pass,
			stamp: schema.welders.stamp
		})
		.from(schema.weldWelders)
		.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId));

const sheetsQuery = (reader: Reader) =>
	reader
		.select({ jointId: schema.pins.jointId, pageIndex: schema.pins.pageIndex })
		.from(schema.pins)
		.innerJoin(schema.revisions, eq(schema.revisions.id, schema.pins.revisionId));

const sheetMap = (rows: { jointId: number; pageIndex: number }[]) =>
	new Map(rows.map((p) => [p.jointId, p.pageIndex + 1]));

export function jointsInfo(reader: Reader, ids: readonly number[]): Map<number, JointInfo> {
	const out = new Map<number, JointInfo>();
	for (let start = 0; start < ids.length; start += 500) {
		const chunk = [...new Set(ids.slice(start, start + 500))];
		const rows = rowsQuery(reader).where(inArray(j.id, chunk)).all();
		const weldIds = rows.map((r) => r.weldId).filter((id): id is number => id != null);
		const passes = weldIds.length
			? passesQuery(reader).where(inArray(schema.weldWelders.weldId, weldIds)).all()
			: [];
		const sheets = sheetsQuery(reader)
			.where(and(inArray(schema.pins.jointId, chunk), eq(schema.revisions.status, 'current')))
			.all();
		build(rows, passes, sheetMap(sheets), out);
	}
	return out;
}

/** Every weld of a lot, named: three reads through the lot, however many welds it holds. */
export function lotJointsInfo(reader: Reader, lotId: number): Map<number, JointInfo> {
	const m = schema.ndeLotJoints;
	const inLot = reader.select({ id: m.jointId }).from(m).where(eq(m.lotId, lotId));
	const rows = rowsQuery(reader).where(inArray(j.id, inLot)).all();
	const passes = passesQuery(reader)
		.innerJoin(schema.welds, eq(schema.welds.id, schema.weldWelders.weldId))
		.where(and(inArray(schema.welds.jointId, inLot), eq(schema.welds.repairCycle, 0)))
		.all();
	const sheets = sheetsQuery(reader)
		.where(and(inArray(schema.pins.jointId, inLot), eq(schema.revisions.status, 'current')))
		.all();
	return build(
		rows,
		passes.map(({ weldId, pass, stamp }) => ({ weldId, pass, stamp })),
		sheetMap(sheets),
		new Map()
	);
}

/** The link that opens a joint on its drawing. */
export function jointHref(
	projectId: number,
	info: Pick<JointInfo, 'drawingId' | 'number' | 'sheet'>
) {
	const query = new URLSearchParams({
		...(info.sheet ? { page: String(info.sheet) } : {}),
		weld: info.number
	});
	return `/projects/${projectId}/drawings/${info.drawingId}?${query}`;
}
