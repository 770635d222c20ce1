import { Clearance, type Rect } from './clearance';
import { drawFrame, drawRevisionCloud, inventInitials } from './frame';
import { numberInFlowOrder, type PageJob, type PageOutcome, type SheetWeld } from './page';
import { pt, type Pen, type Pt } from './pen';
import type { Units } from './pipe-data';
import { createRng, mixSeed } from '$lib/random';
import { STEEL_KG_PER_MM3, chooseScale, steelLength, type Plate } from './steel-data';
import { Elevation } from './structural-elevation';
import { planMember, type FeatureKind, type Member } from './structural-plan';
import {
	drawMaterialList,
	drawStructuralViews,
	structuralNotes,
	type MaterialRow
} from './structural-views';
import { drawDimension, drawWeldDot, placeWeldBubble } from './symbols';
import { drawWeldSymbol, symbolExtent } from './weld-symbol';

/**
 * Reference lines stacked in lanes above and below the elevation so no two symbols collide.
 * Returns the lowest line used, so the view title can go under it.
 */
function placeSymbols(el: Elevation, area: Rect, laneTop: number, laneBottom: number): number {
	const { pen, t, clearance } = el;
	const taken: { lane: number; lo: number; hi: number; below: boolean }[] = [];
	const laneGap = 30 * t;
	let lowest = laneBottom + laneGap;
	for (const j of el.joints) {
		const extent = symbolExtent(pen, j.symbol, t);
		let chosen: { lane: number; start: Pt; dir: 1 | -1 } | null = null;
		for (let lane = 0; lane < 4 && !chosen; lane++) {
			const y = j.below ? laneBottom - lane * laneGap : laneTop + lane * laneGap;
			for (const dir of [1, -1] as const) {
				const startX = j.at.x + dir * (16 + lane * 6) * t;
				const lo = Math.min(startX, startX + dir * extent) - 6 * t;
				const hi = Math.max(startX, startX + dir * extent) + 6 * t;
				if (lo < area.x || hi > area.x + area.w) continue;
				if (taken.some((s) => s.below === j.below && s.lane === lane && hi > s.lo && lo < s.hi))
					continue;
				chosen = { lane, start: pt(startX, y), dir };
				taken.push({ lane, lo, hi, below: j.below });
				break;
			}
		}
		if (!chosen) {
			const y = j.below ? laneBottom - 4 * laneGap : laneTop + 4 * laneGap;
			chosen = { lane: 4, start: pt(j.at.x + 16 * t, y), dir: 1 };
		}
		drawWeldSymbol(pen, clearance, j.symbol, chosen.start, chosen.dir, t);
		lowest = Math.min(lowest, chosen.start.y);
	}
	return Math.min(lowest, el.Y(0) - 70 * el.t);
}

export function renderStructuralPage(job: PageJob): PageOutcome {
	const { spec, pen } = job;
	const units = spec.units;
	const rng = createRng(mixSeed(spec.seed, `steel-${job.pageIndex}`));
	const member = planMember(rng.fork('member'), job);
	const frame = drawFrame(pen, spec, job.pageIndex + 1, job.pageCount, job.width, job.height, {
		scale: 'AS NOTED',
		mark: { label: 'PIECE MARK', value: `${member.mark} (1 REQD)` },
		notes: structuralNotes(spec),
		initials: inventInitials(createRng(mixSeed(spec.seed, 'people')))
	});
	const t = frame.t;
	const area = frame.drawing;
	const clearance = new Clearance(area);

	const scale = chooseScale(units, member.lengthMm + 300, area.w - 170 * t);
	const sc = scale.ptPerMm;
	const depth = member.section.d * sc;
	const memberTop = area.y + area.h - 150 * t;
	const yBottom = memberTop - depth;
	const x0 = area.x + 80 * t;
	const el = new Elevation(pen, clearance, member, units, x0, yBottom, sc, t, job.variant);
	el.drawMember();
	el.end(member.left, 'left');
	for (const f of [...member.features].sort((a, b) => a.x - b.x)) el.feature(f);
	el.end(member.right, 'right');

	const sectionAt =
		member.features.find((f) => f.kind === 'stiffener' && !f.added)?.x ?? member.lengthMm / 2;
	drawSectionCut(pen, el.X(sectionAt) + 14 * t, yBottom - 16 * t, memberTop + 16 * t, 'A', t);
	clearance.segment(
		pt(el.X(sectionAt) + 14 * t, yBottom - 22 * t),
		pt(el.X(sectionAt) + 14 * t, memberTop + 22 * t),
		6 * t
	);
	const stations = [
		0,
		...member.features
			.filter((f) => !f.added || job.variant >= 1)
			.map((f) => f.x)
			.sort((a, b) => a - b),
		member.lengthMm
	];
	for (let i = 0; i + 1 < stations.length; i++) {
		const a = pt(el.X(stations[i]), yBottom);
		const b = pt(el.X(stations[i + 1]), yBottom);
		if (b.x - a.x < 34 * t) continue;
		drawDimension(
			pen,
			clearance,
			a,
			b,
			pt(0, -1),
			34 * t,
			steelLength(stations[i + 1] - stations[i], units),
			{ t }
		);
	}
	drawDimension(
		pen,
		clearance,
		pt(el.X(0), yBottom),
		pt(el.X(member.lengthMm), yBottom),
		pt(0, -1),
		58 * t,
		steelLength(member.lengthMm, units),
		{ t }
	);
	drawDimension(
		pen,
		clearance,
		pt(el.X(0), yBottom),
		pt(el.X(0), memberTop),
		pt(-1, 0),
		44 * t,
		steelLength(member.section.d, units),
		{ t }
	);

	const lowestLane = placeSymbols(el, area, memberTop + 44 * t, yBottom - 96 * t);

	const { labels, next } = numberInFlowOrder(
		el.joints.map((j) => j.added),
		job.firstNumber
	);
	const welds: SheetWeld[] = el.joints.map((j, i) => ({
		number: labels[i],
		kind: j.kind,
		location: j.field ? 'field' : 'shop',
		at: j.at,
		sizeText: j.sizeText,
		thicknessText: j.thicknessText
	}));
	for (const j of el.joints) clearance.circle(j.at, 3.5);
	welds.forEach((w, i) => {
		const j = el.joints[i];
		const bubble = placeWeldBubble(pen, clearance, j.at, null, w.number);
		drawWeldDot(
			pen,
			clearance,
			j.at,
			j.field,
			j.field ? pt(bubble.x > j.at.x ? -0.7 : 0.7, 0.7) : null
		);
	});

	const viewTitle = (title: string, scaleLabel: string, y: number) => {
		const cx = area.x + area.w / 2 - 120 * t;
		const w = pen.textWidth(title, 9 * t, true);
		pen.text(title, pt(cx, y), { size: 9 * t, bold: true, align: 'center' });
		pen.line(pt(cx - w / 2, y - 3 * t), pt(cx + w / 2, y - 3 * t), { width: 0.8 * t });
		pen.text(`SCALE ${scaleLabel}`, pt(cx, y - 13 * t), { size: 6.5 * t, align: 'center' });
	};
	const elevationTitleY = lowestLane - 26 * t;
	viewTitle(`ELEVATION - PIECE MARK ${member.mark}`, scale.label, elevationTitleY);

	if (job.variant >= 1 && el.cloudPoints.length) {
		const xs = el.cloudPoints.map((p) => p.x);
		const ys = el.cloudPoints.map((p) => p.y);
		const m = 22 * t;
		drawRevisionCloud(
			pen,
			{
				x: Math.min(...xs) - m,
				y: Math.min(...ys) - m,
				w: Math.max(...xs) - Math.min(...xs) + 2 * m,
				h: Math.max(...ys) - Math.min(...ys) + 2 * m
			},
			spec.revision,
			t
		);
	}

	const planCentre = elevationTitleY - 48 * t - (member.section.bf * sc) / 2;
	el.drawPlan(planCentre);
	const planTitleY = planCentre - (member.section.bf * sc) / 2 - 34 * t;
	viewTitle('PLAN', scale.label, planTitleY);

	const lowerTop = planTitleY - 30 * t;
	drawStructuralViews(
		pen,
		member,
		units,
		{ x: area.x, y: area.y, w: area.w, h: lowerTop - area.y },
		t
	);
	const rows: MaterialRow[] = materialRows(member, units, job.variant);
	drawMaterialList(
		pen,
		frame,
		rows,
		welds.map((w, i) => ({ ...w, joint: el.joints[i].label })),
		units
	);
	return { welds, nextNumber: next };
}

function drawSectionCut(
	pen: Pen,
	x: number,
	yLow: number,
	yHigh: number,
	letter: string,
	t: number
): void {
	pen.line(pt(x, yLow), pt(x, yLow + 14 * t), { width: 1.4 * t });
	pen.line(pt(x, yHigh), pt(x, yHigh - 14 * t), { width: 1.4 * t });
	pen.line(pt(x, yLow + 14 * t), pt(x, yHigh - 14 * t), {
		width: 0.3 * t,
		gray: 0.3,
		dash: [10 * t, 3 * t, 2 * t, 3 * t]
	});
	for (const y of [yLow, yHigh]) {
		pen.line(pt(x, y), pt(x - 12 * t, y), { width: 1.1 * t });
		pen.arrowHead(pt(x - 14 * t, y), pt(-1, 0), 6 * t, 2.4 * t);
		pen.text(letter, pt(x + 4 * t, y), { size: 9 * t, bold: true, valign: 'middle' });
	}
}

function materialRows(member: Member, units: Units, variant: number): MaterialRow[] {
	const s = member.section;
	const rows: MaterialRow[] = [
		{
			mark: member.mark,
			qty: 1,
			description: `${s.name} ${s.grade}`,
			lengthMm: member.lengthMm,
			kg: (s.kgPerM * member.lengthMm) / 1000
		}
	];
	const grade = units === 'imperial' ? 'A572-50' : 'S355J2';
	const plateRow = (mark: string, qty: number, p: Plate, widthMm: number, lengthMm: number) => ({
		mark,
		qty,
		description: `PL ${p.label}${units === 'imperial' ? '"' : ''} x ${steelLength(widthMm, units)} ${grade}`,
		lengthMm,
		kg: qty * p.mm * widthMm * lengthMm * STEEL_KG_PER_MM3
	});
	const count = (k: FeatureKind) =>
		member.features.filter((f) => f.kind === k && (!f.added || variant >= 1)).length;
	const inner = s.d - 2 * s.tf;
	if (count('stiffener'))
		rows.push(
			plateRow('p1', count('stiffener'), member.plates.stiffener, (s.bf - s.tw) / 2 - 3, inner)
		);
	const endPlates = [member.left, member.right].filter((e) => e === 'endPlate').length;
	if (endPlates) rows.push(plateRow('p2', endPlates, member.plates.endPlate, s.bf + 25, s.d + 180));
	const clips = [member.left, member.right].filter((e) => e === 'clip').length;
	if (clips)
		rows.push({
			mark: 'a1',
			qty: clips,
			description: units === 'imperial' ? 'L4x4x3/8 A36' : 'L100x100x10 S275JR',
			lengthMm: inner * 0.62,
			kg: (clips * ((units === 'imperial' ? 9.8 : 15.0) * inner * 0.62)) / 1000
		});
	if (member.left === 'basePlate')
		rows.push(plateRow('p3', 1, member.plates.base, s.bf + 150, s.d + 150));
	if (member.right === 'capPlate') rows.push(plateRow('p4', 1, member.plates.cap, s.bf, s.d));
	if (count('gusset')) rows.push(plateRow('p5', count('gusset'), member.plates.gusset, 300, 220));
	if (count('lug')) rows.push(plateRow('p6', count('lug'), member.plates.lug, 160, 180));
	if (count('shearTab')) rows.push(plateRow('p7', count('shearTab'), member.plates.tab, 110, 230));
	if (count('doubler'))
		rows.push(plateRow('p8', count('doubler'), member.plates.doubler, inner - 10, 420));
	return rows;
}
