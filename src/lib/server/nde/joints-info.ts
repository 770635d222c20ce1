/** Joints as the lot page, the request e-mail and the register name them. */
import { and, asc, eq, inArray } from 'drizzle-orm';
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

export function jointsInfo(reader: Reader, ids: readonly number[]): Map<number, JointInfo> {
	const out = new Map<number, JointInfo>();
	const j = schema.joints;
	for (let start = 0; start < ids.length; start += 500) {
		const chunk = [...new Set(ids.slice(start, start + 500))];
		const rows = reader
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
			.leftJoin(schema.welds, and(eq(schema.welds.jointId, j.id), eq(schema.welds.repairCycle, 0)))
			.where(inArray(j.id, chunk))
			.all();
		const weldIds = rows.map((r) => r.weldId).filter((id): id is number => id != null);
		const stamps = new Map<number, { pass: string; stamp: string }[]>();
		if (weldIds.length) {
			for (const row of reader
				.select({
					weldId: schema.weldWelders.weldId,
					pass: schema.weldWelders.pass,
					stamp: schema.welders.stamp
				})
				.from(schema.weldWelders)
				.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
				.where(inArray(schema.weldWelders.weldId, weldIds))
				.orderBy(asc(schema.welders.stamp))
				.all())
				stamps.set(row.weldId, [...(stamps.get(row.weldId) ?? []), row]);
		}
		const sheets = new Map(
			reader
				.select({ jointId: schema.pins.jointId, pageIndex: schema.pins.pageIndex })
				.from(schema.pins)
				.innerJoin(schema.revisions, eq(schema.revisions.id, schema.pins.revisionId))
				.where(and(inArray(schema.pins.jointId, chunk), eq(schema.revisions.status, 'current')))
				.all()
				.map((p) => [p.jointId, p.pageIndex + 1])
		);
		for (const r of rows) {
			const passes = r.weldId != null ? (stamps.get(r.weldId) ?? []) : [];
			const order = { root: 0, fill: 1, cap: 2 } as Record<string, number>;
			const welders = [
				...new Set(
					[...passes]
						.sort((a, b) => (order[a.pass] ?? 3) - (order[b.pass] ?? 3))
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
	}
	return out;
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
