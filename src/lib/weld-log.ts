/**
 * The weld log's row and its columns, pure so the grid in the browser, the CSV and Excel
 * writers and the turnover export all name and read the columns the same way.
 */
import { STATE_LOOKS, type JointState, type Decision } from './joint-state';
import { yesNo } from './words';
import { JOINT_KIND_LABELS, type JointKind } from './domain';

export interface WeldLogRow {
	id: number;
	drawingId: number;
	drawing: string;
	/** Label of the drawing's current revision; null while none is uploaded. */
	revision: string | null;
	/** 1-based sheet of the current revision the joint's pin is on, if it has one. */
	sheet: number | null;
	number: string;
	/** As written on the map, with the repair suffix: `12-R1`. */
	weldNumber: string;
	kind: string;
	location: string;
	size: string;
	thickness: string;
	material: string;
	wps: string;
	line: string;
	area: string;
	system: string;
	state: JointState;
	stateSince: number;
	rootWelders: string[];
	fillCapWelders: string[];
	/** `YYYY-MM-DD` of the latest weld (the current repair cycle). */
	weldedOn: string | null;
	fitupAt: number | null;
	fitupInspector: string | null;
	fitupResult: Decision | null;
	visualAt: number | null;
	visualInspector: string | null;
	visualResult: Decision | null;
	ndeRequired: string;
	/** NDE methods recorded on the current weld, e.g. `RT+MT`. */
	ndeMethods: string;
	ndeReports: string;
	ndeResult: Decision | null;
	ndeAt: number | null;
	repairCount: number;
	voidReason: string | null;
	/** A standing fit-up, visual or NDE decision of this joint goes against the verdict. */
	againstVerdict: boolean;
	/** NDE lots: the lots the weld is in, how it was selected there, the reject a tracer traces. */
	ndeLot: string;
	ndeSelection: string;
	ndeTracerOf: string;
}

export interface WeldLogColumn {
	id: string;
	header: string;
	value: (row: WeldLogRow) => string | number;
	/** Shown in the grid until the user chooses otherwise. */
	shown: boolean;
	/** The `sort` value of the API that orders by this column, if any. */
	sort?: WeldLogSort;
	/** Width in characters in the Excel workbook, where the header's own is too narrow. */
	width?: number;
}

export const WELD_LOG_SORTS = ['drawing', 'number', 'state', 'age', 'weldedOn', 'area'] as const;
export type WeldLogSort = (typeof WELD_LOG_SORTS)[number];

/** A UTC day, as the log and its exports print dates: unambiguous on any site. */
export function utcDay(ms: number | null): string {
	return ms == null ? '' : new Date(ms).toISOString().slice(0, 10);
}

const result = (decision: Decision | null) =>
	decision === 'accept' ? 'Accept' : decision === 'reject' ? 'Reject' : '';

export const COLUMNS: readonly WeldLogColumn[] = [
	{
		id: 'drawing',
		header: 'Drawing',
		value: (r) => r.drawing,
		shown: true,
		width: 18,
		sort: 'drawing'
	},
	{ id: 'revision', header: 'Rev', value: (r) => r.revision ?? '', shown: true },
	{ id: 'weldNumber', header: 'Weld no.', value: (r) => r.weldNumber, shown: true, sort: 'number' },
	{
		id: 'kind',
		header: 'Joint type',
		value: (r) => JOINT_KIND_LABELS[r.kind as JointKind] ?? r.kind,
		shown: true
	},
	{
		id: 'location',
		header: 'Shop / field',
		value: (r) => (r.location === 'field' ? 'Field' : r.location === 'shop' ? 'Shop' : r.location),
		shown: false
	},
	{ id: 'size', header: 'Size', value: (r) => r.size, shown: true },
	{ id: 'thickness', header: 'Thickness', value: (r) => r.thickness, shown: false },
	{ id: 'material', header: 'Material', value: (r) => r.material, shown: false, width: 16 },
	{ id: 'wps', header: 'WPS', value: (r) => r.wps, shown: false, width: 22 },
	{ id: 'line', header: 'Line', value: (r) => r.line, shown: false, width: 18 },
	{ id: 'area', header: 'Area', value: (r) => r.area, shown: true, sort: 'area' },
	{ id: 'system', header: 'System', value: (r) => r.system, shown: false, width: 12 },
	{
		id: 'state',
		header: 'State',
		value: (r) => STATE_LOOKS[r.state].label,
		shown: true,
		width: 16,
		sort: 'state'
	},
	{
		id: 'stateSince',
		header: 'In state since',
		value: (r) => utcDay(r.stateSince),
		shown: true,
		width: 13,
		sort: 'age'
	},
	{
		id: 'rootWelders',
		header: 'Root welder',
		value: (r) => r.rootWelders.join(' '),
		shown: true,
		width: 12
	},
	{
		id: 'fillCapWelders',
		header: 'Fill / cap welder',
		value: (r) => r.fillCapWelders.join(' '),
		shown: false,
		width: 16
	},
	{
		id: 'weldedOn',
		header: 'Welded',
		value: (r) => r.weldedOn ?? '',
		shown: true,
		width: 12,
		sort: 'weldedOn'
	},
	{
		id: 'fitupAt',
		header: 'Fit-up date',
		value: (r) => utcDay(r.fitupAt),
		shown: false,
		width: 12
	},
	{
		id: 'fitupInspector',
		header: 'Fit-up inspector',
		value: (r) => r.fitupInspector ?? '',
		shown: false,
		width: 18
	},
	{ id: 'fitupResult', header: 'Fit-up', value: (r) => result(r.fitupResult), shown: true },
	{
		id: 'visualAt',
		header: 'Visual date',
		value: (r) => utcDay(r.visualAt),
		shown: false,
		width: 12
	},
	{
		id: 'visualInspector',
		header: 'Visual inspector',
		value: (r) => r.visualInspector ?? '',
		shown: false,
		width: 18
	},
	{ id: 'visualResult', header: 'Visual', value: (r) => result(r.visualResult), shown: true },
	{ id: 'ndeRequired', header: 'NDE required', value: (r) => r.ndeRequired, shown: false },
	{ id: 'ndeLot', header: 'NDE lot', value: (r) => r.ndeLot, shown: false, width: 30 },
	{
		id: 'ndeSelection',
		header: 'NDE selection',
		value: (r) => r.ndeSelection,
		shown: true,
		width: 18
	},
	{ id: 'ndeTracerOf', header: 'Tracer of', value: (r) => r.ndeTracerOf, shown: false, width: 22 },
	{ id: 'ndeMethods', header: 'NDE done', value: (r) => r.ndeMethods, shown: false },
	{ id: 'ndeReports', header: 'NDE report', value: (r) => r.ndeReports, shown: false, width: 16 },
	{ id: 'ndeResult', header: 'NDE', value: (r) => result(r.ndeResult), shown: true },
	{ id: 'ndeAt', header: 'NDE date', value: (r) => utcDay(r.ndeAt), shown: false, width: 12 },
	{
		id: 'againstVerdict',
		header: 'Against verdict',
		value: (r) => yesNo(r.againstVerdict),
		shown: true
	},
	{ id: 'repairCount', header: 'Repairs', value: (r) => r.repairCount, shown: false },
	{
		id: 'voidReason',
		header: 'Void reason',
		value: (r) => r.voidReason ?? '',
		shown: false,
		width: 40
	}
];
