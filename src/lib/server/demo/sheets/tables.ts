import { drawTable, type Frame } from './frame';
import { pt, type Pen } from './pen';
import { feetInches, type Units } from './pipe-data';
import type { Rng } from '$lib/random';
import { BUBBLE } from './symbols';
import type { SheetWeld } from './page';
import type { DemoLine, DemoSheetSpec } from './types';

export interface BomLine {
	desc: string;
	size: string;
	qty: number;
	lengthMm: number;
	order: number;
}

export interface CutPiece {
	size: string;
	mm: number;
}

const BOM_ORDER = [
	'PIPE',
	'ELBOW',
	'TEE',
	'RED',
	'WELDOLET',
	'SOCKOLET',
	'NIPPLE',
	'CAP',
	'FLANGE',
	'BLIND',
	'GASKET',
	'STUD',
	'GATE',
	'HEX'
];

function rank(desc: string): number {
	const i = BOM_ORDER.findIndex((w) => desc.startsWith(w));
	return i < 0 ? BOM_ORDER.length : i;
}

export function isoNotes(spec: DemoSheetSpec, shop: boolean): string[] {
	const imperial = spec.units === 'imperial';
	const notes = [
		imperial
			? 'Dimensions are in feet and inches unless noted.'
			: 'Dimensions are in millimetres unless noted.',
		'Fabricate, examine and test to ASME B31.3 normal fluid service and the line class.',
		'Weld numbers are shown in circles. Numbers are not to be re-used; added joints take a letter suffix.',
		shop
			? 'Shop welds only. Field ends marked BE are left bevelled for site welding.'
			: 'Field welds are flagged. Field-fit welds to have ' +
				(imperial ? '6"' : '150 mm') +
				' extra length for trimming.',
		'Butt welds: 10% RT per line class. Visual examination 100%.',
		'Flange bolt holes to straddle the natural centre lines.'
	];
	return notes;
}

const WELD_TYPE: Record<SheetWeld['kind'], string> = {
	butt: 'BW',
	socket: 'SW',
	branch: 'BR',
	fillet: 'FIL'
};

/** Three weld columns side by side, so a sheet's whole weld list sits under the materials. */
export function drawWeldList(
	pen: Pen,
	x: number,
	top: number,
	width: number,
	welds: SheetWeld[],
	t: number
): number {
	const groups = 3;
	const weldRows = Math.ceil(welds.length / groups);
	const table: string[][] = [];
	for (let r = 0; r < weldRows; r++) {
		const row: string[] = [];
		for (let c = 0; c < groups; c++) {
			const wd = welds[c * weldRows + r];
			row.push(
				...(wd
					? [wd.number, WELD_TYPE[wd.kind], wd.sizeText, wd.location === 'field' ? 'FIELD' : 'SHOP']
					: ['', '', '', ''])
			);
		}
		table.push(row);
	}
	const gw = width / groups;
	const cols = [
		{ title: 'WELD', width: gw * 0.2, align: 'center' as const },
		{ title: 'TYPE', width: gw * 0.2, align: 'center' as const },
		{ title: 'SIZE', width: gw * 0.3, align: 'center' as const },
		{ title: 'S/F', width: gw * 0.3, align: 'center' as const }
	];
	return drawTable(pen, x, top, 'WELD LIST', [...cols, ...cols, ...cols], table, t);
}

/**
 * The right-hand column, top down: bill of materials, weld list, cut lengths. Whatever does not
 * fit is left off from the bottom, as a drafter would move it to a continuation sheet.
 */
export function drawIsoTables(
	pen: Pen,
	frame: Frame,
	bom: Map<string, BomLine>,
	cuts: CutPiece[],
	welds: SheetWeld[],
	units: Units,
	shop: boolean
): void {
	const { column, t } = frame;
	const w = column.w;
	const rowH = 10.5 * t;
	const head = 22 * t;
	const gap = 10 * t;
	const bottom = column.y;
	let top = column.y + column.h;
	const rows = [...bom.values()]
		.filter((r) => r.qty > 0 || r.lengthMm > 0)
		.sort((a, b) => rank(a.desc) - rank(b.desc) || a.order - b.order)
		.map((r, i) => [
			String(i + 1),
			r.lengthMm > 0
				? units === 'imperial'
					? `${(r.lengthMm / 304.8).toFixed(1)} FT`
					: `${(r.lengthMm / 1000).toFixed(1)} M`
				: String(r.qty),
			r.desc,
			r.size
		]);
	const fits = (n: number) =>
		Math.max(
			0,
			Math.floor((top - bottom - head) / rowH) >= n ? n : Math.floor((top - bottom - head) / rowH)
		);
	const bomRows = rows.slice(0, fits(rows.length));
	if (bomRows.length) {
		top -=
			drawTable(
				pen,
				column.x,
				top,
				shop ? 'BILL OF MATERIALS - SHOP' : 'BILL OF MATERIALS',
				[
					{ title: 'PT', width: w * 0.07, align: 'center' },
					{ title: 'QTY', width: w * 0.12, align: 'right' },
					{ title: 'DESCRIPTION', width: w * 0.63 },
					{ title: 'SIZE', width: w * 0.18, align: 'center' }
				],
				bomRows,
				t
			) + gap;
	}

	const weldRows = Math.ceil(welds.length / 3);
	if (weldRows && fits(weldRows) === weldRows)
		top -= drawWeldList(pen, column.x, top, w, welds, t) + gap;

	const cutRows = Math.min(Math.ceil(Math.min(cuts.length, 16) / 2), fits(8));
	if (cutRows <= 0) return;
	const pieces = cuts.slice(0, cutRows * 2);
	const table: string[][] = [];
	const cell = (p: CutPiece | undefined, n: number) =>
		p
			? [`<${n}>`, p.size, units === 'imperial' ? feetInches(p.mm / 25.4) : `${Math.round(p.mm)}`]
			: ['', '', ''];
	for (let i = 0; i < cutRows; i++)
		table.push([...cell(pieces[i], i + 1), ...cell(pieces[i + cutRows], i + cutRows + 1)]);
	const c = w / 2;
	drawTable(
		pen,
		column.x,
		top,
		units === 'imperial' ? 'CUT PIPE LENGTHS (FT-IN)' : 'CUT PIPE LENGTHS (MM)',
		[
			{ title: 'CUT', width: c * 0.24, align: 'center' },
			{ title: 'SIZE', width: c * 0.3, align: 'center' },
			{ title: 'LENGTH', width: c * 0.46, align: 'right' },
			{ title: 'CUT', width: c * 0.24, align: 'center' },
			{ title: 'SIZE', width: c * 0.3, align: 'center' },
			{ title: 'LENGTH', width: c * 0.46, align: 'right' }
		],
		table,
		t
	);
}

/** Design data and the symbol legend along the foot of the view. */
export function drawIsoStrip(
	pen: Pen,
	frame: Frame,
	spec: DemoSheetSpec,
	line: DemoLine,
	shop: boolean,
	rng: Rng,
	height: number
): void {
	const { drawing, t } = frame;
	const imperial = spec.units === 'imperial';
	const pressure = imperial ? rng.int(10, 60) * 5 : rng.int(6, 40);
	const temperature = imperial ? rng.int(12, 60) * 10 : rng.int(6, 32) * 10;
	const data = [
		['SERVICE', line.service.toUpperCase()],
		['DESIGN PRESS.', imperial ? `${pressure} PSIG` : `${pressure} BARG`],
		['DESIGN TEMP.', imperial ? `${temperature} °F` : `${temperature} °C`],
		[
			'TEST PRESS.',
			imperial
				? `${Math.round(pressure * 1.5)} PSIG HYDRO`
				: `${(pressure * 1.5).toFixed(1)} BARG HYDRO`
		],
		['MATERIAL', line.material.toUpperCase()],
		['PWHT', rng.chance(0.25) ? 'REQUIRED' : 'NOT REQUIRED'],
		['NDE (BW)', rng.pick(['RT 10%', 'RT 5%', 'RT 20%', 'RT 100%'])],
		[
			'INSULATION',
			rng.pick(['NONE', imperial ? 'HC 1-1/2"' : 'HC 40 MM', imperial ? 'PP 1"' : 'PP 25 MM'])
		]
	];
	const rows = [0, 1, 2, 3].map((i) => [data[i][0], data[i][1], data[i + 4][0], data[i + 4][1]]);
	const tableW = Math.min(430 * t, drawing.w * 0.58);
	const top = drawing.y + height - 8 * t;
	drawTable(
		pen,
		drawing.x,
		top,
		'DESIGN DATA',
		[
			{ title: 'ITEM', width: tableW * 0.2 },
			{ title: 'VALUE', width: tableW * 0.3 },
			{ title: 'ITEM', width: tableW * 0.2 },
			{ title: 'VALUE', width: tableW * 0.3 }
		],
		rows,
		t
	);
	const lx = drawing.x + tableW + 14 * t;
	const lw = Math.min(250 * t, drawing.x + drawing.w - lx);
	const lh = 12 * t + 4 * 10.5 * t;
	const ly = top - lh;
	pen.rect(lx, ly, lw, lh, { stroke: 0, width: 1.1 * t });
	pen.rect(lx, top - 12 * t, lw, 12 * t, { fill: 0.88, stroke: 0, width: 0.6 * t });
	pen.text('LEGEND', pt(lx + lw / 2, top - 6 * t), {
		size: 6.5 * t,
		bold: true,
		align: 'center',
		valign: 'middle'
	});
	const row = (i: number) => top - 12 * t - (i + 0.5) * 10.5 * t;
	const sx = lx + 14 * t;
	const tx = lx + 30 * t;
	const size = 5.6 * t;
	pen.circle(pt(sx, row(0)), BUBBLE.dot, { fill: 0 });
	pen.text('SHOP WELD', pt(tx, row(0)), { size, valign: 'middle' });
	if (!shop) {
		pen.circle(pt(sx, row(1) - 3 * t), BUBBLE.dot, { fill: 0 });
		pen.line(pt(sx, row(1) - 3 * t), pt(sx, row(1) + 5 * t), { width: 0.7 });
		pen.polygon(
			[pt(sx, row(1) + 5 * t), pt(sx + 5 * t, row(1) + 3.5 * t), pt(sx, row(1) + 2 * t)],
			{ fill: 0 }
		);
		pen.text('FIELD WELD', pt(tx, row(1)), { size, valign: 'middle' });
	} else pen.text('BE = BEVEL END FOR FIELD WELD', pt(tx, row(1)), { size, valign: 'middle' });
	pen.circle(pt(sx, row(2)), BUBBLE.radius * 0.8, { stroke: 0, width: 0.6 });
	pen.text('7', pt(sx, row(2)), { size: 5 * t, align: 'center', valign: 'middle' });
	pen.text('WELD NUMBER', pt(tx, row(2)), { size, valign: 'middle' });
	pen.line(pt(sx - 8 * t, row(3)), pt(sx + 8 * t, row(3)), { width: 2 * t });
	pen.polygon(
		[pt(sx + 4 * t, row(3)), pt(sx - 3 * t, row(3) + 3 * t), pt(sx - 3 * t, row(3) - 3 * t)],
		{ fill: 0 }
	);
	pen.text('FLOW DIRECTION', pt(tx, row(3)), { size, valign: 'middle' });
	const mx = lx + lw / 2 + 8 * t;
	pen.line(pt(mx, row(0) - 4 * t), pt(mx, row(0) + 4 * t), { width: 1.3 * t });
	pen.line(pt(mx + 3 * t, row(0) - 4 * t), pt(mx + 3 * t, row(0) + 4 * t), { width: 1.3 * t });
	pen.text('FLANGED JOINT', pt(mx + 14 * t, row(0)), { size, valign: 'middle' });
	pen.polygon(
		[
			pt(mx - 4 * t, row(1) + 3 * t),
			pt(mx - 4 * t, row(1) - 3 * t),
			pt(mx + 4 * t, row(1) + 3 * t),
			pt(mx + 4 * t, row(1) - 3 * t)
		],
		{ stroke: 0, width: 0.8 * t }
	);
	pen.text('VALVE', pt(mx + 14 * t, row(1)), { size, valign: 'middle' });
	pen.line(pt(mx, row(2) + 3 * t), pt(mx, row(2) - 3 * t), { width: 0.8 * t });
	pen.line(pt(mx - 4 * t, row(2) - 3 * t), pt(mx + 4 * t, row(2) - 3 * t), { width: 1.2 * t });
	pen.text('PIPE SUPPORT', pt(mx + 14 * t, row(2)), { size, valign: 'middle' });
	pen.text('NTS = NOT TO SCALE', pt(mx - 4 * t, row(3)), { size, valign: 'middle' });
}
