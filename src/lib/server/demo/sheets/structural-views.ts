import { Clearance, type Rect } from './clearance';
import { drawTable, type Frame } from './frame';
import type { SheetWeld } from './page';
import { pt, type Pen, type Pt } from './pen';
import type { Units } from './pipe-data';
import { chooseScale, steelLength, weightText } from './steel-data';
import type { Member } from './structural-plan';
import { drawDimension } from './symbols';
import { drawWeldList } from './tables';
import type { DemoSheetSpec } from './types';
import { drawWeldSymbol, type WeldSymbolSpec } from './weld-symbol';

export interface MaterialRow {
	mark: string;
	qty: number;
	description: string;
	lengthMm: number;
	kg: number;
}

export function structuralNotes(spec: DemoSheetSpec): string[] {
	const imperial = spec.units === 'imperial';
	return [
		imperial
			? 'Material: W shapes ASTM A992, plates ASTM A572 Gr. 50, angles ASTM A36 unless noted.'
			: 'Material: sections and plates EN 10025-2 S355 unless noted. Execution class EXC2 to EN 1090-2.',
		imperial
			? 'Welding to AWS D1.1, statically loaded. Electrodes E70XX low hydrogen.'
			: 'Welding to EN 1090-2 and EN ISO 3834-3. Consumables to match S355.',
		'Weld numbers are shown in circles beside each joint. Field welds are flagged.',
		imperial
			? 'Fillet sizes are leg sizes in inches. Holes 13/16" dia for 3/4" bolts unless noted.'
			: 'Fillet sizes are leg lengths in mm. Holes 22 mm dia for M20 bolts unless noted.',
		'CJP groove welds: 100% UT after visual acceptance.',
		'Shop primer, except within ' +
			(imperial ? '2"' : '50 mm') +
			' of field welds and faying surfaces.'
	];
}

/** 45° section hatching inside a rectangle. */
function hatch(
	pen: Pen,
	x: number,
	y: number,
	w: number,
	h: number,
	spacing: number,
	t: number
): void {
	for (let c = -h; c < w; c += spacing) {
		const a = pt(x + Math.max(c, 0), y + Math.max(-c, 0));
		const endX = Math.min(c + h, w);
		const b = pt(x + endX, y + (endX - c));
		if (b.x - a.x > 0.5) pen.line(a, b, { width: 0.3 * t, gray: 0.35 });
	}
}

function viewTitle(pen: Pen, centre: Pt, title: string, scale: string, t: number): void {
	const size = 8 * t;
	pen.text(title, centre, { size, bold: true, align: 'center' });
	const w = pen.textWidth(title, size, true);
	pen.line(pt(centre.x - w / 2, centre.y - 3 * t), pt(centre.x + w / 2, centre.y - 3 * t), {
		width: 0.7 * t
	});
	pen.text(`SCALE ${scale}`, pt(centre.x, centre.y - 13 * t), { size: 6 * t, align: 'center' });
}

function drawSection(pen: Pen, member: Member, units: Units, box: Rect, t: number): void {
	const s = member.section;
	const scale = chooseScale(
		units,
		Math.max(s.d, s.bf) * 1.25,
		Math.min(box.w * 0.6, box.h - 110 * t)
	);
	const k = scale.ptPerMm;
	const cx = box.x + box.w / 2;
	const cy = box.y + box.h - 30 * t - (s.d * k) / 2;
	const d = s.d * k;
	const bf = s.bf * k;
	const tf = Math.max(s.tf * k, 2 * t);
	const tw = Math.max(s.tw * k, 2 * t);
	const top = cy + d / 2;
	const bottom = cy - d / 2;
	const parts: [number, number, number, number][] = [
		[cx - bf / 2, top - tf, bf, tf],
		[cx - bf / 2, bottom, bf, tf],
		[cx - tw / 2, bottom + tf, tw, d - 2 * tf]
	];
	for (const [x, y, w, h] of parts) {
		pen.rect(x, y, w, h, { fill: 1 });
		hatch(pen, x, y, w, h, 4 * t, t);
	}
	pen.polygon(
		[
			pt(cx - bf / 2, top),
			pt(cx + bf / 2, top),
			pt(cx + bf / 2, top - tf),
			pt(cx + tw / 2, top - tf),
			pt(cx + tw / 2, bottom + tf),
			pt(cx + bf / 2, bottom + tf),
			pt(cx + bf / 2, bottom),
			pt(cx - bf / 2, bottom),
			pt(cx - bf / 2, bottom + tf),
			pt(cx - tw / 2, bottom + tf),
			pt(cx - tw / 2, top - tf),
			pt(cx - bf / 2, top - tf)
		],
		{ stroke: 0, width: 1.1 * t }
	);
	const hasStiffener = member.features.some((f) => f.kind === 'stiffener');
	if (hasStiffener) {
		const sw = bf / 2 - tw / 2 - 3 * k;
		const clip = 20 * k;
		const x = cx + tw / 2;
		const y0 = bottom + tf;
		const y1 = top - tf;
		pen.polygon(
			[
				pt(x, y0 + clip),
				pt(x + clip, y0),
				pt(x + sw, y0),
				pt(x + sw, y1),
				pt(x + clip, y1),
				pt(x, y1 - clip)
			],
			{ stroke: 0, width: 0.8 * t, fill: 0.9 }
		);
		const leg = Math.max(3 * t, 8 * k);
		for (const [p, q, r] of [
			[pt(x + clip, y1), pt(x + clip + leg, y1), pt(x + clip, y1 - leg)],
			[pt(x + clip, y0), pt(x + clip + leg, y0), pt(x + clip, y0 + leg)],
			[pt(x, (y0 + y1) / 2 + leg), pt(x, (y0 + y1) / 2 - leg), pt(x + leg, (y0 + y1) / 2)]
		] as [Pt, Pt, Pt][])
			pen.polygon([p, q, r], { fill: 0 });
		pen.text('STIFF. PL (NS)', pt(x + sw + 8 * t, (y0 + y1) / 2), {
			size: 5.6 * t,
			valign: 'middle'
		});
	}
	const c = new Clearance(box);
	drawDimension(
		pen,
		c,
		pt(cx - bf / 2, top),
		pt(cx + bf / 2, top),
		pt(0, 1),
		18 * t,
		steelLength(s.bf, units),
		{ t }
	);
	drawDimension(
		pen,
		c,
		pt(cx - bf / 2, bottom),
		pt(cx - bf / 2, top),
		pt(-1, 0),
		22 * t,
		steelLength(s.d, units),
		{ t }
	);
	const tfText = units === 'imperial' ? `tf = ${(s.tf / 25.4).toFixed(3)}"` : `tf = ${s.tf}`;
	const twText = units === 'imperial' ? `tw = ${(s.tw / 25.4).toFixed(3)}"` : `tw = ${s.tw}`;
	const labelX = cx - bf / 2 - 2 * t;
	pen.line(pt(cx - bf / 2 + 4 * t, bottom + tf / 2), pt(labelX, bottom - 11 * t), {
		width: 0.4 * t
	});
	pen.text(tfText, pt(labelX, bottom - 14 * t), { size: 5.8 * t, align: 'right' });
	pen.line(pt(cx - tw / 2, bottom + tf + (d - 2 * tf) * 0.2), pt(labelX, bottom - 21 * t), {
		width: 0.4 * t
	});
	pen.text(twText, pt(labelX, bottom - 24 * t), { size: 5.8 * t, align: 'right' });
	pen.text(`${s.name} ${s.grade}`, pt(cx, bottom - 38 * t), {
		size: 6.5 * t,
		bold: true,
		align: 'center'
	});
	viewTitle(pen, pt(cx, bottom - 62 * t), 'SECTION A-A', scale.label, t);
}

function drawPlateView(pen: Pen, member: Member, units: Units, box: Rect, t: number): void {
	const s = member.section;
	const base = member.left === 'basePlate';
	const endPlate = member.left === 'endPlate' || member.right === 'endPlate';
	if (!base && !endPlate) {
		drawClipDetail(pen, member, units, box, t);
		return;
	}
	const pw = base ? s.bf + 150 : s.bf + 25;
	const ph = base ? s.d + 150 : s.d + 180;
	const scale = chooseScale(units, Math.max(pw, ph) * 1.2, Math.min(box.w * 0.6, box.h - 110 * t));
	const k = scale.ptPerMm;
	const cx = box.x + box.w / 2;
	const cy = box.y + box.h - 40 * t - (ph * k) / 2;
	const w = pw * k;
	const h = ph * k;
	pen.rect(cx - w / 2, cy - h / 2, w, h, { stroke: 0, width: 1.1 * t, fill: 1 });
	const d = s.d * k;
	const bf = s.bf * k;
	const tf = Math.max(s.tf * k, 1.5 * t);
	const tw = Math.max(s.tw * k, 1.5 * t);
	const outline = [
		pt(cx - bf / 2, cy + d / 2),
		pt(cx + bf / 2, cy + d / 2),
		pt(cx + bf / 2, cy + d / 2 - tf),
		pt(cx + tw / 2, cy + d / 2 - tf),
		pt(cx + tw / 2, cy - d / 2 + tf),
		pt(cx + bf / 2, cy - d / 2 + tf),
		pt(cx + bf / 2, cy - d / 2),
		pt(cx - bf / 2, cy - d / 2),
		pt(cx - bf / 2, cy - d / 2 + tf),
		pt(cx - tw / 2, cy - d / 2 + tf),
		pt(cx - tw / 2, cy + d / 2 - tf),
		pt(cx - bf / 2, cy + d / 2 - tf)
	];
	pen.polygon(
		outline,
		base
			? { stroke: 0, width: 1 * t, fill: 0.9 }
			: { stroke: 0.3, width: 0.6 * t, dash: [4 * t, 2 * t] }
	);
	const hole = (base ? 36 : 22) * k;
	const holes: Pt[] = [];
	if (base) {
		const e = 45 * k;
		for (const sx of [-1, 1])
			for (const sy of [-1, 1]) holes.push(pt(cx + sx * (w / 2 - e), cy + sy * (h / 2 - e)));
	} else {
		const gauge = Math.min(140, s.bf - 50) * k;
		for (const y of [
			d / 2 + 45 * k,
			d / 2 - tf - 55 * k,
			-(d / 2 - tf - 55 * k),
			-(d / 2 + 45 * k)
		])
			for (const sx of [-1, 1]) holes.push(pt(cx + (sx * gauge) / 2, cy + y));
	}
	for (const p of holes) {
		pen.circle(p, hole / 2, { stroke: 0, width: 0.6 * t, fill: 1 });
		pen.line(pt(p.x - hole * 0.8, p.y), pt(p.x + hole * 0.8, p.y), { width: 0.25 * t, gray: 0.4 });
		pen.line(pt(p.x, p.y - hole * 0.8), pt(p.x, p.y + hole * 0.8), { width: 0.25 * t, gray: 0.4 });
	}
	const c = new Clearance(box);
	drawDimension(
		pen,
		c,
		pt(cx - w / 2, cy + h / 2),
		pt(cx + w / 2, cy + h / 2),
		pt(0, 1),
		16 * t,
		steelLength(pw, units),
		{ t }
	);
	drawDimension(
		pen,
		c,
		pt(cx + w / 2, cy - h / 2),
		pt(cx + w / 2, cy + h / 2),
		pt(1, 0),
		18 * t,
		steelLength(ph, units),
		{ t }
	);
	const p = base ? member.plates.base : member.plates.endPlate;
	const label = `${base ? 'BASE' : 'END'} PL ${p.label}${units === 'imperial' ? '"' : ''} THK`;
	pen.text(label, pt(cx, cy - h / 2 - 14 * t), { size: 6.2 * t, bold: true, align: 'center' });
	if (base) {
		const sym: WeldSymbolSpec = {
			joint: pt(cx + bf / 2, cy + d / 2 - tf / 2),
			type: 'fillet',
			sides: 'arrow',
			size: '',
			allAround: true,
			field: false,
			tail: 'TYP'
		};
		drawWeldSymbol(pen, c, sym, pt(cx + w / 2 + 30 * t, cy + h / 2 + 34 * t), 1, t);
	}
	viewTitle(
		pen,
		pt(cx, cy - h / 2 - 40 * t),
		base ? 'BASE PLATE PLAN' : 'VIEW B-B  END PLATE',
		scale.label,
		t
	);
}

function drawClipDetail(pen: Pen, member: Member, units: Units, box: Rect, t: number): void {
	const s = member.section;
	const leg = units === 'imperial' ? 101.6 : 100;
	const th = units === 'imperial' ? 9.525 : 10;
	const scale = chooseScale(units, leg * 3, Math.min(box.w * 0.5, box.h - 100 * t));
	const k = scale.ptPerMm;
	const cx = box.x + box.w / 2;
	const cy = box.y + box.h - 40 * t - leg * 1.1 * k;
	const tw = Math.max(s.tw * k, 2 * t);
	const webH = leg * 2.2 * k;
	pen.rect(cx - tw / 2, cy - webH / 2, tw, webH, { stroke: 0, width: 0.9 * t, fill: 1 });
	hatch(pen, cx - tw / 2, cy - webH / 2, tw, webH, 4 * t, t);
	const L = leg * k;
	const T = Math.max(th * k, 2 * t);
	const x = cx + tw / 2;
	pen.polygon(
		[
			pt(x, cy - L / 2),
			pt(x + T, cy - L / 2),
			pt(x + T, cy + L / 2 - T),
			pt(x + L, cy + L / 2 - T),
			pt(x + L, cy + L / 2),
			pt(x, cy + L / 2)
		],
		{ stroke: 0, width: 1 * t, fill: 0.9 }
	);
	const fl = Math.max(3 * t, 8 * k);
	pen.polygon([pt(x, cy - L / 2), pt(x, cy - L / 2 - fl), pt(x + fl, cy - L / 2)], { fill: 0 });
	pen.text(
		units === 'imperial' ? 'L4x4x3/8' : 'L100x100x10',
		pt(x + L + 8 * t, cy + L / 2 - T / 2),
		{ size: 6 * t, valign: 'middle' }
	);
	pen.text('BEAM WEB', pt(cx, cy - webH / 2 - 10 * t), { size: 5.8 * t, align: 'center' });
	viewTitle(pen, pt(cx, cy - webH / 2 - 34 * t), 'CLIP ANGLE DETAIL', scale.label, t);
}

function drawSymbolLegend(pen: Pen, units: Units, box: Rect, t: number): void {
	const w = Math.min(box.w - 20 * t, 250 * t);
	const x = box.x + (box.w - w) / 2;
	const rowH = 40 * t;
	const items: [string, Omit<WeldSymbolSpec, 'joint'>][] = [
		[
			'FILLET WELD, ARROW SIDE',
			{
				type: 'fillet',
				sides: 'arrow',
				size: units === 'imperial' ? '1/4' : '6',
				allAround: false,
				field: false
			}
		],
		[
			'FILLET WELD, BOTH SIDES',
			{
				type: 'fillet',
				sides: 'both',
				size: units === 'imperial' ? '5/16' : '8',
				allAround: false,
				field: false
			}
		],
		[
			'FILLET WELD ALL AROUND',
			{
				type: 'fillet',
				sides: 'arrow',
				size: units === 'imperial' ? '3/8' : '10',
				allAround: true,
				field: false
			}
		],
		[
			'FIELD WELD',
			{
				type: 'fillet',
				sides: 'arrow',
				size: units === 'imperial' ? '5/16' : '8',
				allAround: false,
				field: true
			}
		],
		[
			'CJP BEVEL GROOVE',
			{ type: 'bevel', sides: 'arrow', size: '', allAround: false, field: false, tail: 'CJP' }
		]
	];
	const h = 18 * t + items.length * rowH;
	const top = box.y + box.h - 20 * t;
	pen.rect(x, top - h, w, h, { stroke: 0, width: 1 * t });
	pen.rect(x, top - 14 * t, w, 14 * t, { stroke: 0, width: 0.6 * t, fill: 0.88 });
	pen.text('WELDING SYMBOLS', pt(x + w / 2, top - 7 * t), {
		size: 6.8 * t,
		bold: true,
		align: 'center',
		valign: 'middle'
	});
	const c = new Clearance({ x: box.x - 1000, y: box.y - 1000, w: box.w + 2000, h: box.h + 2000 });
	items.forEach(([label, spec], i) => {
		const y = top - 14 * t - (i + 0.62) * rowH;
		const start = pt(x + 34 * t, y);
		drawWeldSymbol(pen, c, { ...spec, joint: pt(x + 12 * t, y - 12 * t) }, start, 1, t);
		pen.text(label, pt(x + w - 6 * t, y - 12 * t), { size: 5.6 * t, align: 'right' });
	});
}

export function drawStructuralViews(
	pen: Pen,
	member: Member,
	units: Units,
	region: Rect,
	t: number
): void {
	const w = region.w / 3;
	const h = Math.min(region.h, w * 0.6 + 150 * t);
	const box: Rect = { x: region.x, y: region.y + (region.h - h) / 2, w: region.w, h };
	drawSection(pen, member, units, { x: box.x, y: box.y, w, h: box.h }, t);
	drawPlateView(pen, member, units, { x: box.x + w, y: box.y, w, h: box.h }, t);
	drawSymbolLegend(pen, units, { x: box.x + 2 * w, y: box.y, w, h: box.h }, t);
}

export interface ScheduledWeld extends SheetWeld {
	joint: string;
}

export function drawMaterialList(
	pen: Pen,
	frame: Frame,
	rows: MaterialRow[],
	welds: ScheduledWeld[],
	units: Units
): void {
	const { column, t } = frame;
	const w = column.w;
	const total = rows.reduce((s, r) => s + r.kg, 0);
	const table = rows.map((r) => [
		r.mark,
		String(r.qty),
		r.description,
		steelLength(r.lengthMm, units),
		weightText(r.kg, units)
	]);
	table.push(['', '', 'TOTAL SHIPPING WEIGHT', '', weightText(total, units)]);
	let top = column.y + column.h;
	top -=
		drawTable(
			pen,
			column.x,
			top,
			'BILL OF MATERIAL',
			[
				{ title: 'MARK', width: w * 0.1, align: 'center' },
				{ title: 'QTY', width: w * 0.08, align: 'center' },
				{ title: 'DESCRIPTION', width: w * 0.48 },
				{ title: 'LENGTH', width: w * 0.18, align: 'right' },
				{ title: 'WEIGHT', width: w * 0.16, align: 'right' }
			],
			table,
			t
		) +
		10 * t;
	const schedule = welds.map((wd) => [
		wd.number,
		wd.joint,
		wd.kind === 'butt' ? 'CJP' : 'FILLET',
		wd.kind === 'butt' ? '-' : wd.sizeText,
		wd.thicknessText,
		wd.kind === 'butt' ? 'WPS-S02' : 'WPS-S01',
		wd.kind === 'butt' ? 'UT 100%' : 'VT',
		wd.location === 'field' ? 'FIELD' : 'SHOP'
	]);
	const fits = Math.floor((top - column.y - 22 * t) / (10.5 * t));
	if (fits >= schedule.length)
		drawTable(
			pen,
			column.x,
			top,
			'WELD SCHEDULE',
			[
				{ title: 'WELD', width: w * 0.08, align: 'center' },
				{ title: 'JOINT', width: w * 0.3 },
				{ title: 'TYPE', width: w * 0.1, align: 'center' },
				{ title: 'SIZE', width: w * 0.1, align: 'center' },
				{ title: 'THK', width: w * 0.1, align: 'center' },
				{ title: 'WPS', width: w * 0.12, align: 'center' },
				{ title: 'NDE', width: w * 0.1, align: 'center' },
				{ title: 'S/F', width: w * 0.1, align: 'center' }
			],
			schedule,
			t
		);
	else if (fits >= Math.ceil(welds.length / 3)) drawWeldList(pen, column.x, top, w, welds, t);
}
