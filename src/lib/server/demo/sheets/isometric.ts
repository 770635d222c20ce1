import type { Rect } from './clearance';
import { drawFrame, drawRevisionCloud, inventInitials } from './frame';
import {
	AXIS,
	CROSS,
	isVertical,
	planRun,
	type Branch,
	type EndKind,
	type RunPlan
} from './iso-plan';
import {
	DEFAULT_LINE,
	HALF_SPAN,
	IsoSheet,
	equipmentTag,
	otherDrawing,
	type Inline,
	type LegPt
} from './iso-sheet';
import { drawIsoStrip, drawIsoTables, isoNotes } from './tables';
import {
	numberInFlowOrder,
	splitTarget,
	type PageJob,
	type PageOutcome,
	type SheetWeld
} from './page';
import {
	add,
	angleOf,
	dist,
	fromAngle,
	mul,
	perp,
	pt,
	readableAngle,
	segmentDistance,
	sub,
	unit,
	type Pt
} from './pen';
import { findPipeSize, lengthLabel, sizeLabel, wallLabel, type Units } from './pipe-data';
import { createRng, mixSeed, type Rng } from '$lib/random';
import {
	awayFrom,
	dimensionClearance,
	drawDimension,
	drawNorthArrow,
	drawWeldDot,
	placeWeldBubble
} from './symbols';
import type { DemoSheetSpec } from './types';

interface Slotting {
	legs: LegPt[];
	spans: { lo: number; hi: number }[][];
}

/** A random free position for an item of half-length `half`, anywhere it fits on the allowed legs. */
function freeSlot(
	rng: Rng,
	s: Slotting,
	half: number,
	filter: (leg: LegPt) => boolean,
	check?: (leg: LegPt, pos: number) => boolean
): { leg: LegPt; pos: number } | null {
	const options: { leg: number; lo: number; hi: number }[] = [];
	s.legs.forEach((leg, i) => {
		if (!filter(leg)) return;
		let ranges = [{ lo: half + 2, hi: leg.length - half - 2 }];
		for (const sp of s.spans[i])
			ranges = ranges
				.flatMap((r) => [
					{ lo: r.lo, hi: Math.min(r.hi, sp.lo - half) },
					{ lo: Math.max(r.lo, sp.hi + half), hi: r.hi }
				])
				.filter((r) => r.hi > r.lo);
		for (const r of ranges) options.push({ leg: i, ...r });
	});
	const total = options.reduce((sum, o) => sum + o.hi - o.lo, 0);
	for (let tries = 0; tries < 12 && total > 0; tries++) {
		let u = rng.next() * total;
		const option = options.find((o) => (u -= o.hi - o.lo) < 0) ?? options[options.length - 1];
		const pos = option.hi + u;
		const leg = s.legs[option.leg];
		if (check && !check(leg, pos)) continue;
		s.spans[option.leg].push({ lo: pos - half, hi: pos + half });
		return { leg, pos };
	}
	return null;
}

/** Drawing space per plan unit, chosen so the run fills the view with room for its notes. */
function fitPlan(plan: RunPlan, area: Rect, g: number): (p: Pt) => Pt {
	const pts: Pt[] = [];
	for (const l of plan.legs) pts.push(l.a, l.b);
	for (const b of [...plan.branches, ...(plan.addition ? [plan.addition] : [])])
		for (const l of b.legs) pts.push(l.a, l.b);
	const xs = pts.map((p) => p.x);
	const ys = pts.map((p) => p.y);
	const minX = Math.min(...xs);
	const maxX = Math.max(...xs);
	const minY = Math.min(...ys);
	const maxY = Math.max(...ys);
	const pad = 64 * g;
	const s = Math.min(
		(area.w - 2 * pad) / Math.max(1, maxX - minX),
		(area.h - 2 * pad) / Math.max(1, maxY - minY),
		80 * g
	);
	const ox = area.x + area.w / 2 - ((minX + maxX) / 2) * s;
	const oy = area.y + area.h / 2 - ((minY + maxY) / 2) * s;
	return (p) => pt(ox + p.x * s, oy + p.y * s);
}

function elevationText(mm: number, units: Units): string {
	if (units === 'imperial') return `EL. ${lengthLabel(100 * 12 * 25.4 + mm, 'imperial')}`;
	return `EL. ${mm < 0 ? '-' : '+'}${Math.abs(Math.round(mm))}`;
}

function endLabel(
	kind: EndKind,
	atStart: boolean,
	job: PageJob,
	rng: Rng,
	elevation: string
): string[] {
	const { spec, pageIndex, pageCount } = job;
	if (kind === 'continuation') {
		if (atStart)
			return pageIndex > 0
				? [`CONT. FROM SHEET ${pageIndex}`, elevation]
				: ['CONT. FROM', otherDrawing(spec.number, -1), elevation];
		return pageIndex < pageCount - 1
			? [`CONT. ON SHEET ${pageIndex + 2}`]
			: ['CONT. ON', otherDrawing(spec.number, 1)];
	}
	if (kind === 'nozzle')
		return [
			`${atStart ? 'FROM' : 'TO'} ${equipmentTag(rng, spec)}`,
			`NOZZLE N${rng.int(1, 8)}`,
			...(atStart ? [elevation] : [])
		];
	if (kind === 'bevel') return ['FIELD WELD BY OTHERS'];
	return atStart ? [elevation] : [];
}

/** Valves, flange breaks, drains, joints and supports, placed along the legs once the scale is known. */
function placeInlineItems(
	sheet: IsoSheet,
	legs: LegPt[],
	plan: RunPlan,
	job: PageJob,
	rng: Rng,
	toPt: (p: Pt) => Pt
): void {
	const { g } = sheet;
	const shop = job.spec.kind === 'shop';
	const slotting: Slotting = { legs, spans: legs.map(() => []) };
	const planSegments: [Pt, Pt][] = legs.map((l) => [l.a, l.b]);
	for (const b of [...plan.branches, ...(plan.addition ? [plan.addition] : [])])
		for (const l of b.legs) planSegments.push([toPt(l.a), toPt(l.b)]);
	legs.forEach((l, i) => {
		const e = sheet.elbowTakeout + 6 * g;
		slotting.spans[i].push(
			{ lo: -1, hi: i === 0 ? 24 * g : e },
			{ lo: l.length - (i === legs.length - 1 ? 24 * g : e), hi: l.length + 1 }
		);
	});
	const reserveBranch = (b: Branch, added: boolean): Inline => {
		const leg = legs[b.legIndex];
		const pos = (b.at / plan.legs[b.legIndex].units) * leg.length;
		const half = b.kind === 'tee' ? HALF_SPAN.branch * g : (added ? 24 : 11) * g;
		slotting.spans[b.legIndex].push({ lo: pos - half, hi: pos + half });
		return { kind: 'branch', pos, branch: b, added };
	};
	for (const b of plan.branches) legs[b.legIndex].items.push(reserveBranch(b, false));
	// The revised issue's change is reserved on every issue and drawn on the revised one only,
	// so nothing else on the sheet moves between them.
	if (plan.addition) {
		const item = reserveBranch(plan.addition, true);
		if (job.variant >= 1) legs[plan.addition.legIndex].items.push(item);
	} else {
		const slot = freeSlot(rng.fork('revision'), slotting, HALF_SPAN.flanges * g, () => true);
		if (slot && job.variant >= 1)
			slot.leg.items.push({ kind: 'flanges', pos: slot.pos, added: true });
	}

	const clearOfPlan = (a: Pt, b: Pt, min: number, host: LegPt) =>
		planSegments.every(
			([c, d], i) => i === legs.indexOf(host) || segmentDistance(a, b, c, d) >= min
		);
	const place = (
		kind: Inline['kind'],
		filter: (l: LegPt) => boolean,
		check?: (l: LegPt, pos: number) => boolean
	) => freeSlot(rng, slotting, HALF_SPAN[kind] * g, filter, check);
	const horizontal = (l: LegPt) => !isVertical(l.dir);
	const mainSize = sheet.mainSize;
	let budget = job.target - plan.committedWelds;

	if (budget >= 2 && rng.chance(shop ? 0.25 : 0.75)) {
		const stemOf = (l: LegPt) => (isVertical(l.dir) ? AXIS.E : AXIS.U);
		const slot = place(
			'valve',
			() => true,
			(l, pos) => {
				const p = add(l.a, mul(l.d, pos));
				return clearOfPlan(p, add(p, mul(stemOf(l), 22 * g)), 10 * g, l);
			}
		);
		if (slot) {
			const area = job.spec.area.replace(/\D/g, '').slice(0, 2) || '20';
			slot.leg.items.push({
				kind: 'valve',
				pos: slot.pos,
				tag: `${area}-HV-${rng.int(100, 399)}`,
				stem: stemOf(slot.leg)
			});
			budget -= 2;
		}
	}
	if (budget >= 2 && mainSize.dn >= 80 && rng.chance(0.45)) {
		const half = Math.floor((legs.length - 1) / 2);
		const slot = place('reducer', (l) => legs.indexOf(l) >= half);
		if (slot) {
			slot.leg.items.push({ kind: 'reducer', pos: slot.pos, step: rng.int(1, 2) });
			budget -= 2;
		}
	}
	if (!shop && budget >= 3 && mainSize.dn >= 50 && rng.chance(0.55)) {
		const slot = place('drain', horizontal, (l, pos) => {
			const p = add(l.a, mul(l.d, pos));
			return clearOfPlan(add(p, pt(0, -4 * g)), add(p, pt(0, -48 * g)), 24 * g, l);
		});
		if (slot) {
			slot.leg.items.push({ kind: 'drain', pos: slot.pos, down: pt(0, -1) });
			budget -= 3;
		}
	}
	if (!shop && budget >= 3 && rng.chance(0.5)) {
		const slot = place('flanges', () => true);
		if (slot) {
			slot.leg.items.push({ kind: 'flanges', pos: slot.pos });
			budget -= 2;
		}
	}
	let fieldJoints = 0;
	while (budget > 0) {
		const slot = place('joint', () => true);
		if (!slot) break;
		const field = !shop && (fieldJoints === 0 || rng.chance(0.25));
		if (field) fieldJoints += 1;
		slot.leg.items.push({ kind: 'joint', pos: slot.pos, field });
		budget -= 1;
	}
	for (let i = 0; i < 2; i++) {
		const slot = place(
			'flow',
			(l) => (i === 0 ? l === legs[0] : l !== legs[0]) && l.length > 60 * g
		);
		if (slot) slot.leg.items.push({ kind: 'flow', pos: slot.pos });
	}
	if (!shop) {
		const supports = rng.int(1, 3);
		for (let i = 0; i < supports; i++) {
			const slot = place('support', horizontal, (l, pos) => {
				const p = add(l.a, mul(l.d, pos));
				return clearOfPlan(add(p, pt(0, -3 * g)), add(p, pt(0, -28 * g)), 12 * g, l);
			});
			if (slot)
				slot.leg.items.push({ kind: 'support', pos: slot.pos, tag: `PS-${rng.int(101, 499)}` });
		}
	}
}

export function renderIsometricPage(job: PageJob): PageOutcome {
	const { spec, pen, pageIndex, pageCount } = job;
	const shop = spec.kind === 'shop';
	const rng = createRng(mixSeed(spec.seed, `page-${pageIndex}`));
	const line = spec.line ?? DEFAULT_LINE;
	const mainSize = findPipeSize(line.nps);
	const spoolMark = `${spec.number}-S${String(pageIndex + 1).padStart(2, '0')}`;
	const frame = drawFrame(pen, spec, pageIndex + 1, pageCount, job.width, job.height, {
		scale: 'NTS',
		mark: shop
			? { label: 'SPOOL', value: spoolMark }
			: { label: 'LINE NO.', value: line.lineNumber },
		notes: isoNotes(spec, shop),
		initials: inventInitials(createRng(mixSeed(spec.seed, 'people')))
	});
	const g = frame.t;
	const strip = 76 * g;
	const area: Rect = {
		x: frame.drawing.x,
		y: frame.drawing.y + strip,
		w: frame.drawing.w,
		h: frame.drawing.h - strip
	};

	const lastPage = pageIndex === pageCount - 1;
	const startKind: EndKind = shop
		? rng.pick(['flange', 'bevel'] as const)
		: pageIndex === 0
			? rng.pick(['nozzle', 'continuation'] as const)
			: 'continuation';
	const endKind: EndKind = shop
		? rng.pick(['flange', 'bevel', 'blind'] as const)
		: lastPage
			? rng.pick(['nozzle', 'continuation'] as const)
			: 'continuation';
	const plan = planRun(rng.fork('plan'), {
		target: job.target,
		start: startKind,
		end: endKind,
		shop,
		mmPerUnit: 900 + mainSize.dn * 1.5,
		imperial: spec.units === 'imperial'
	});
	const toPt = fitPlan(plan, area, g);
	const sheet = new IsoSheet(job, g, rng.fork('sheet'), line, mainSize, area);
	const legs = sheet.legsToPt(plan.legs, toPt);
	const inlineRng = rng.fork('inline');
	placeInlineItems(sheet, legs, plan, job, inlineRng, toPt);

	const startEl =
		spec.units === 'imperial' ? inlineRng.int(40, 160) * 25.4 : inlineRng.int(60, 180) * 50;
	sheet.walk(
		legs,
		startKind,
		0,
		endKind,
		mainSize,
		false,
		{
			start: endLabel(
				startKind,
				true,
				job,
				inlineRng.fork('start'),
				elevationText(startEl, spec.units)
			),
			end: endLabel(endKind, false, job, inlineRng.fork('end'), '')
		},
		toPt
	);
	legs.forEach((l) => {
		const roots = l.items
			.filter((it) => it.kind === 'branch')
			.map((it) => it.pos)
			.sort((p, q) => p - q);
		sheet.dimensionRuns.unshift({
			points: [l.a, ...roots.map((pos) => add(l.a, mul(l.d, pos))), l.b],
			dir: l.dir,
			realMm: l.realMm,
			length: l.length
		});
	});

	const northAt = pt(area.x + 30 * g, area.y + area.h - 30 * g);
	drawNorthArrow(pen, northAt, AXIS.N, g);
	sheet.clearance.circle(northAt, 40 * g);
	for (const s of sheet.strokes) {
		if (s.c) pen.curve(s.a, s.c, s.b, { width: s.width, cap: 'round' });
		else pen.line(s.a, s.b, { width: s.width, cap: 'round' });
	}
	for (const f of sheet.fittings) f();
	for (const s of sheet.sites) sheet.clearance.dot(s.at, 3.5);
	if (job.variant >= 1 && sheet.revisionBoxes.length) drawCloud(sheet, spec.revision);

	drawDimensions(sheet, spec.units);
	const { labels: numbers, next } = numberInFlowOrder(
		sheet.sites.map((s) => s.added),
		job.firstNumber
	);
	const welds: SheetWeld[] = sheet.sites.map((s, i) => ({
		number: numbers[i],
		kind: s.kind,
		location: s.field ? 'field' : 'shop',
		at: s.at,
		sizeText: sizeLabel(s.size, spec.units),
		thicknessText: wallLabel(s.size, s.schedule, spec.units)
	}));
	welds.forEach((w, i) => {
		const s = sheet.sites[i];
		const bubble = placeWeldBubble(pen, sheet.clearance, s.at, s.along, w.number);
		drawWeldDot(
			pen,
			sheet.clearance,
			s.at,
			s.field,
			s.field ? awayFrom(s.at, bubble, s.along) : null
		);
	});
	drawLabels(sheet, legs, job, shop ? spoolMark : null, startEl);
	drawIsoTables(pen, frame, sheet.bom, sheet.cutPieces, welds, spec.units, shop);
	drawIsoStrip(pen, frame, spec, line, shop, createRng(mixSeed(spec.seed, 'design')), strip);
	return { welds, nextNumber: next };
}

function drawCloud(sheet: IsoSheet, revision: string): void {
	const xs = sheet.revisionBoxes.map((p) => p.x);
	const ys = sheet.revisionBoxes.map((p) => p.y);
	const m = 28 * sheet.g;
	const box = {
		x: Math.min(...xs) - m,
		y: Math.min(...ys) - m,
		w: Math.max(...xs) - Math.min(...xs) + 2 * m,
		h: Math.max(...ys) - Math.min(...ys) + 2 * m
	};
	drawRevisionCloud(sheet.pen, box, revision, sheet.g);
	sheet.clearance.circle(
		pt(box.x + box.w + 4 * sheet.g, box.y + box.h + 4 * sheet.g),
		12 * sheet.g
	);
}

/** Chain dimensions along each leg, on whichever side of the line is clear. */
function drawDimensions(sheet: IsoSheet, units: Units): void {
	const { pen, clearance, g } = sheet;
	for (const run of sheet.dimensionRuns) {
		const offsets = CROSS[run.dir].map((d) => AXIS[d]);
		for (let k = 0; k + 1 < run.points.length; k++) {
			const a = run.points[k];
			const b = run.points[k + 1];
			const segLen = dist(a, b);
			if (segLen < 30 * g) continue;
			const text = lengthLabel((segLen / run.length) * run.realMm, units);
			// The nearest clear offset wins: a dimension far from its pipe reads as another one's.
			let best = { score: -Infinity, dir: offsets[0], off: 24 * g };
			for (const off of [24 * g, 36 * g, 48 * g]) {
				for (const dir of offsets) {
					const score = dimensionClearance(clearance, pen, a, b, dir, off, text, g);
					if (score > best.score) best = { score, dir, off };
				}
				if (best.score >= 1.5) break;
			}
			if (best.score > -1.5)
				drawDimension(pen, clearance, a, b, best.dir, best.off, text, { t: g });
		}
	}
}

function drawLabels(
	sheet: IsoSheet,
	legs: LegPt[],
	job: PageJob,
	spoolMark: string | null,
	startEl: number
): void {
	const { pen, clearance, g } = sheet;
	const units = job.spec.units;
	if (!spoolMark) {
		const label = sheet.line.lineNumber;
		const size = 6.5 * g;
		const w = pen.textWidth(label, size, true);
		[...legs]
			.sort((p, q) => q.length - p.length)
			.some((leg) => {
				if (w > leg.length * 0.8) return false;
				const angle = readableAngle(angleOf(leg.d));
				const dir = fromAngle(angle);
				for (const f of [0.5, 0.35, 0.65, 0.25, 0.75])
					for (const side of [1, -1]) {
						const centre = add(
							add(leg.a, mul(leg.d, leg.length * f)),
							mul(perp(dir), side > 0 ? 7 * g : -7 * g - size * 0.75)
						);
						const origin = sub(centre, mul(dir, w / 2));
						if (clearance.textFree(origin, w, size, angle) > 1) {
							pen.text(label, origin, { size, bold: true, angle });
							clearance.text(origin, w, size, angle);
							return true;
						}
					}
				return false;
			});
	}

	let el = startEl;
	let shown = 0;
	for (const leg of legs) {
		if (!isVertical(leg.dir)) continue;
		el += leg.dir === 'U' ? leg.realMm : -leg.realMm;
		if (shown < 4 && placeNote(sheet, leg.b, [elevationText(el, units)], null, 5.6 * g, 10 * g))
			shown += 1;
	}
	for (const label of sheet.endLabels) {
		const lines = label.lines.filter(Boolean);
		if (lines.length) placeNote(sheet, label.anchor, lines, label.out, 6 * g, 4 * g);
	}
	if (spoolMark) {
		const leg = [...legs].sort((p, q) => q.length - p.length)[0];
		placeNote(
			sheet,
			add(leg.a, mul(leg.d, leg.length * 0.5)),
			[`SPOOL ${spoolMark}`],
			null,
			8 * g,
			40 * g,
			true
		);
	}
}

/** A note near a point, on the freest side, with a leader when it stands off. */
function placeNote(
	sheet: IsoSheet,
	anchor: Pt,
	lines: string[],
	out: Pt | null,
	size: number,
	distance: number,
	boxed = false
): boolean {
	const { pen, clearance, g } = sheet;
	const lineH = size * 1.3;
	const pad = boxed ? 3 * g : 0;
	const w = Math.max(...lines.map((l) => pen.textWidth(l, size, boxed))) + 2 * pad;
	const h = lines.length * lineH + pad;
	const base = out ? angleOf(out) : 0;
	const turns = out ? [0, 30, -30, 60, -60, 90, -90] : [0, 180, 45, 135, -45, -135, 90, -90];
	let best: { score: number; box: Rect } | null = null;
	search: for (const turn of turns)
		for (const extra of [0, 12 * g, 26 * g]) {
			const dir = fromAngle(base + turn);
			const c = add(anchor, mul(dir, distance + extra));
			const box: Rect = {
				x: c.x + (dir.x > 0.3 ? 0 : dir.x < -0.3 ? -w : -w / 2),
				y: c.y + (dir.y > 0.3 ? 0 : dir.y < -0.3 ? -h : -h / 2),
				w,
				h
			};
			const score =
				Math.min(
					clearance.alongSegment(
						pt(box.x, box.y + h * 0.25),
						pt(box.x + w, box.y + h * 0.25),
						h * 0.3
					),
					clearance.alongSegment(
						pt(box.x, box.y + h * 0.75),
						pt(box.x + w, box.y + h * 0.75),
						h * 0.3
					)
				) -
				extra * 0.05;
			if (!best || score > best.score) best = { score, box };
			if (score > 2) break search;
		}
	if (!best || best.score < -3) return false;
	const { box } = best;
	const near = pt(
		Math.max(box.x, Math.min(anchor.x, box.x + box.w)),
		Math.max(box.y, Math.min(anchor.y, box.y + box.h))
	);
	if (dist(near, anchor) > 8 * g) {
		const from = add(anchor, mul(unit(sub(near, anchor)), 2 * g));
		pen.line(from, near, { width: 0.45 * g, gray: 0.2 });
		clearance.segment(from, near, 0.5);
	}
	if (boxed) pen.rect(box.x, box.y, box.w, box.h, { stroke: 0, width: 0.8 * g, fill: 1 });
	lines.forEach((l, i) => {
		const y = box.y + box.h - pad / 2 - (i + 1) * lineH + (lineH - size) * 0.5 + size * 0.15;
		pen.text(l, pt(box.x + pad, y), { size, bold: boxed });
	});
	clearance.box(box.x, box.y, box.w, box.h);
	return true;
}

export function isoTargets(spec: DemoSheetSpec, pages: number): number[] {
	return splitTarget(spec.weldCount, pages, 4, 40);
}
