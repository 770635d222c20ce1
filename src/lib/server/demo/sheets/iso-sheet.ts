import { Clearance, type Rect } from './clearance';
import type { BomLine, CutPiece } from './tables';
import { AXIS, isVertical, type Branch, type Dir, type EndKind, type Leg } from './iso-plan';
import type { PageJob } from './page';
import { add, angleOf, dist, mul, perp, pt, sub, unit, type Pen, type Pt } from './pen';
import {
	findPipeSize,
	materialFamily,
	scheduleLabel,
	scheduleOf,
	sizeLabel,
	smallerSize,
	type MaterialFamily,
	type PipeSize,
	type ScheduleName,
	type Units
} from './pipe-data';
import type { Rng } from '$lib/random';
import type { DemoLine, DemoSheetSpec, DemoWeld } from './types';

export interface LegPt {
	dir: Dir;
	a: Pt;
	b: Pt;
	d: Pt;
	length: number;
	realMm: number;
	items: Inline[];
	/** Pipe ends along the leg, for the cut list: 'after' opens a piece, 'before' closes it. */
	marks: { pos: number; role: 'after' | 'before' }[];
}

export type Inline =
	| { kind: 'joint'; pos: number; field: boolean }
	| { kind: 'flanges'; pos: number; added?: boolean }
	| { kind: 'valve'; pos: number; tag: string; stem: Pt }
	| { kind: 'reducer'; pos: number; step: number }
	| { kind: 'drain'; pos: number; down: Pt }
	| { kind: 'support'; pos: number; tag: string }
	| { kind: 'flow'; pos: number }
	| { kind: 'branch'; pos: number; branch: Branch; added: boolean };

export interface Site {
	at: Pt;
	along: Pt | null;
	kind: DemoWeld['kind'];
	field: boolean;
	size: PipeSize;
	schedule: ScheduleName;
	added: boolean;
}

export interface EndLabel {
	anchor: Pt;
	out: Pt;
	lines: string[];
}

export const HALF_SPAN: Record<Inline['kind'], number> = {
	joint: 7,
	flanges: 13,
	valve: 27,
	reducer: 15,
	drain: 10,
	support: 8,
	flow: 9,
	branch: 16
};

export const DEFAULT_LINE: DemoLine = {
	lineNumber: '6"-P-1101-A1A',
	nps: '6',
	schedule: 'SCH 40',
	material: 'ASTM A106 Gr. B',
	service: 'PROCESS WATER'
};

export function otherDrawing(number: string, delta: number): string {
	const m = /(\d+)(\D*)$/.exec(number);
	if (!m) return `${number}-${delta}`;
	const digits = m[1];
	const value = String(Math.max(0, Number(digits) + delta)).padStart(digits.length, '0');
	return number.slice(0, m.index) + value + m[2];
}

export function pipeWidth(size: PipeSize, g: number): number {
	return (size.dn >= 200 ? 2.7 : size.dn >= 100 ? 2.3 : size.dn >= 50 ? 1.8 : 1.3) * g;
}

export function tickAxis(dir: Dir): Pt {
	return isVertical(dir) ? AXIS.N : AXIS.U;
}

export class IsoSheet {
	readonly pen: Pen;
	readonly clearance: Clearance;
	readonly units: Units;
	readonly family: MaterialFamily;
	readonly schedule: ScheduleName;
	readonly rating: string;
	readonly sites: Site[] = [];
	readonly strokes: { a: Pt; c?: Pt; b: Pt; width: number }[] = [];
	readonly fittings: (() => void)[] = [];
	readonly endLabels: EndLabel[] = [];
	readonly bom = new Map<string, BomLine>();
	readonly cutPieces: CutPiece[] = [];
	readonly dimensionRuns: { points: Pt[]; dir: Dir; realMm: number; length: number }[] = [];
	readonly elbowTakeout: number;
	readonly revisionBoxes: Pt[] = [];

	constructor(
		readonly job: PageJob,
		readonly g: number,
		readonly rng: Rng,
		readonly line: DemoLine,
		readonly mainSize: PipeSize,
		area: Rect
	) {
		this.pen = job.pen;
		this.clearance = new Clearance(area);
		this.units = job.spec.units;
		this.family = materialFamily(line.material);
		this.schedule = scheduleOf(mainSize, line.schedule);
		this.rating =
			this.units === 'imperial'
				? rng.pick(['CL150', 'CL150', 'CL300'])
				: rng.pick(['PN16', 'PN16', 'PN40']);
		this.elbowTakeout = 14 * this.g;
	}

	get shop(): boolean {
		return this.job.spec.kind === 'shop';
	}

	count(desc: string, size: string, qty = 1, lengthMm = 0): void {
		const key = `${desc}|${size}`;
		const row = this.bom.get(key) ?? { desc, size, qty: 0, lengthMm: 0, order: this.bom.size };
		row.qty += qty;
		row.lengthMm += lengthMm;
		this.bom.set(key, row);
	}

	site(
		at: Pt,
		along: Pt | null,
		kind: Site['kind'],
		field: boolean,
		size: PipeSize,
		added: boolean,
		schedule?: ScheduleName
	): void {
		this.sites.push({
			at,
			along,
			kind,
			field: field && !this.shop,
			size,
			schedule: schedule ?? this.schedule,
			added
		});
	}

	pipe(a: Pt, b: Pt, size: PipeSize, leg: LegPt | null): void {
		if (dist(a, b) < 0.5) return;
		const width = pipeWidth(size, this.g);
		this.strokes.push({ a, b, width });
		this.clearance.segment(a, b, width / 2 + 1, 'line');
		if (leg)
			this.count(
				`PIPE SMLS BE ${scheduleLabel(size, this.schedule, this.units)} ${this.line.material}`,
				sizeLabel(size, this.units),
				0,
				(dist(a, b) / leg.length) * leg.realMm
			);
	}

	bend(a: Pt, corner: Pt, b: Pt, size: PipeSize): void {
		const width = pipeWidth(size, this.g);
		this.strokes.push({ a, c: corner, b, width });
		this.clearance.segment(a, corner, width / 2 + 1, 'line');
		this.clearance.segment(corner, b, width / 2 + 1, 'line');
		this.count(
			`ELBOW 90 LR BW ${scheduleLabel(size, this.schedule, this.units)} ${this.family.fitting}`,
			sizeLabel(size, this.units)
		);
	}

	tick(at: Pt, axis: Pt, half: number, width = 1.3): void {
		const a = add(at, mul(axis, half));
		const b = sub(at, mul(axis, half));
		this.fittings.push(() => this.pen.line(a, b, { width: width * this.g, cap: 'butt' }));
		this.clearance.segment(a, b, 1);
	}

	flangeJoint(size: PipeSize, count = 1): void {
		const s = sizeLabel(size, this.units);
		this.count(`GASKET ${this.family.gasket} ${this.rating}`, s, count);
		const bolts = size.dn <= 80 ? 4 : size.dn <= 200 ? 8 : size.dn <= 300 ? 12 : 16;
		this.count(`STUD BOLT ${this.family.bolting}, 2 NUTS EACH`, s, bolts * count);
	}

	weldNeck(size: PipeSize): void {
		this.count(
			`FLANGE WN RF ${this.rating} ${scheduleLabel(size, this.schedule, this.units)} ${this.family.flange}`,
			sizeLabel(size, this.units)
		);
	}

	flangeHalf(size: PipeSize): number {
		return (size.dn >= 150 ? 7.5 : size.dn >= 50 ? 6 : 4.5) * this.g;
	}

	/** A run's free end: its flange, cap or break, the weld behind it, and the label beyond it. */
	end(
		e: Pt,
		out: Pt,
		kind: EndKind,
		size: PipeSize,
		leg: LegPt,
		atStart: boolean,
		added: boolean,
		labelHint: string[]
	): void {
		const g = this.g;
		const axis = tickAxis(leg.dir);
		const half = this.flangeHalf(size);
		const inward = mul(out, -1);
		const along = unit(inward);
		const pos = (d: number) => (atStart ? d : leg.length - d);
		const mark = (d: number) => leg.marks.push({ pos: pos(d), role: atStart ? 'after' : 'before' });
		switch (kind) {
			case 'nozzle': {
				this.tick(add(e, mul(inward, 1.8 * g)), axis, half);
				this.tick(add(e, mul(out, 1.8 * g)), axis, half);
				const stubEnd = add(e, mul(out, 16 * g));
				this.fittings.push(() =>
					this.pen.line(add(e, mul(out, 1.8 * g)), stubEnd, { width: 1.1 * g, gray: 0.35 })
				);
				this.fittings.push(() =>
					this.pen.line(add(stubEnd, mul(axis, half * 1.8)), sub(stubEnd, mul(axis, half * 1.8)), {
						width: 0.6 * g,
						gray: 0.35,
						dash: [3 * g, 2 * g]
					})
				);
				this.clearance.segment(e, stubEnd, 2);
				this.site(add(e, mul(inward, 9 * g)), along, 'butt', this.rng.chance(0.6), size, added);
				mark(9 * g);
				this.weldNeck(size);
				this.flangeJoint(size);
				this.endLabels.push({ anchor: add(stubEnd, mul(out, 4 * g)), out, lines: labelHint });
				return;
			}
			case 'flange': {
				this.tick(e, axis, half);
				this.site(add(e, mul(inward, 7 * g)), along, 'butt', false, size, added);
				mark(7 * g);
				this.weldNeck(size);
				if (labelHint.length)
					this.endLabels.push({ anchor: add(e, mul(out, 6 * g)), out, lines: labelHint });
				return;
			}
			case 'blind': {
				this.tick(add(e, mul(inward, 1.6 * g)), axis, half);
				const bA = add(add(e, mul(out, 1.6 * g)), mul(axis, half));
				const bB = sub(add(e, mul(out, 1.6 * g)), mul(axis, half));
				this.fittings.push(() => this.pen.line(bA, bB, { width: 2.6 * g, cap: 'butt' }));
				this.clearance.segment(bA, bB, 2);
				this.site(add(e, mul(inward, 9 * g)), along, 'butt', false, size, added);
				mark(9 * g);
				this.weldNeck(size);
				this.count(
					`BLIND FLANGE RF ${this.rating} ${this.family.flange}`,
					sizeLabel(size, this.units)
				);
				this.flangeJoint(size);
				this.endLabels.push({
					anchor: add(e, mul(out, 6 * g)),
					out,
					lines: ['BLIND', ...labelHint]
				});
				return;
			}
			case 'cap': {
				const r = half * 0.6;
				const base = angleOf(out);
				const pts = this.pen.arcPoints(e, r, base - 90, base + 90);
				this.fittings.push(() => this.pen.polyline(pts, { width: 1.2 * g }));
				this.site(add(e, mul(inward, 6 * g)), along, 'butt', false, size, added);
				mark(6 * g);
				this.count(
					`CAP BW ${scheduleLabel(size, this.schedule, this.units)} ${this.family.fitting}`,
					sizeLabel(size, this.units)
				);
				this.endLabels.push({ anchor: add(e, mul(out, 6 * g)), out, lines: ['CAP', ...labelHint] });
				return;
			}
			case 'continuation': {
				const s = perp(along);
				const z = 5 * g;
				const p1 = add(add(e, mul(s, z)), mul(along, -2 * g));
				const p2 = add(add(e, mul(s, -z)), mul(along, 2 * g));
				this.fittings.push(() => {
					this.pen.line(p1, p2, { width: 0.8 * g });
					this.pen.line(add(p1, mul(along, 3 * g)), add(p2, mul(along, 3 * g)), { width: 0.8 * g });
				});
				this.clearance.segment(p1, p2, 2);
				mark(0);
				this.endLabels.push({ anchor: add(e, mul(out, 6 * g)), out, lines: labelHint });
				return;
			}
			case 'bevel': {
				mark(0);
				this.endLabels.push({ anchor: add(e, mul(out, 5 * g)), out, lines: ['BE', ...labelHint] });
				return;
			}
		}
	}

	legsToPt(legs: Leg[], toPt: (p: Pt) => Pt): LegPt[] {
		return legs.map((l) => {
			const a = toPt(l.a);
			const b = toPt(l.b);
			return {
				dir: l.dir,
				a,
				b,
				d: unit(sub(b, a)),
				length: dist(a, b),
				realMm: l.realMm,
				items: [],
				marks: []
			};
		});
	}

	/** Walks a run in the direction of flow, drawing pipe and fittings and listing welds in order. */
	walk(
		legs: LegPt[],
		start: EndKind | 'fitting',
		startOffset: number,
		end: EndKind,
		size: PipeSize,
		added: boolean,
		labels: { start: string[]; end: string[] },
		toPt: (p: Pt) => Pt
	): void {
		let current = size;
		const e = this.elbowTakeout;
		legs.forEach((leg, i) => {
			const last = i === legs.length - 1;
			if (i === 0 && start !== 'fitting')
				this.end(leg.a, mul(leg.d, -1), start, current, leg, true, added, labels.start);
			if (i === 0 && start === 'fitting') leg.marks.push({ pos: startOffset, role: 'after' });
			if (i > 0) {
				this.site(add(leg.a, mul(leg.d, e)), leg.d, 'butt', false, current, added);
				leg.marks.push({ pos: e, role: 'after' });
			}
			let from = i === 0 ? (start === 'fitting' ? startOffset : 0) : e;
			for (const item of [...leg.items].sort((p, q) => p.pos - q.pos)) {
				const p = add(leg.a, mul(leg.d, item.pos));
				if (item.kind === 'reducer') {
					const next = smallerSize(current, item.step);
					const h = 8 * this.g;
					this.pipe(add(leg.a, mul(leg.d, from)), sub(p, mul(leg.d, h)), current, leg);
					this.reducer(p, leg, current, next, added);
					current = next;
					from = item.pos + h;
					continue;
				}
				this.inline(item, p, leg, current, added, toPt);
			}
			const to = last ? leg.length : leg.length - e;
			this.pipe(add(leg.a, mul(leg.d, from)), add(leg.a, mul(leg.d, to)), current, leg);
			if (!last) {
				const next = legs[i + 1];
				const inlet = sub(leg.b, mul(leg.d, e));
				this.site(inlet, leg.d, 'butt', false, current, added);
				leg.marks.push({ pos: leg.length - e, role: 'before' });
				this.bend(inlet, leg.b, add(next.a, mul(next.d, e)), current);
			} else {
				this.end(leg.b, leg.d, end, current, leg, false, added, labels.end);
				if (end === 'continuation' || end === 'bevel')
					leg.marks.push({ pos: leg.length, role: 'before' });
			}
			this.collectCuts(leg, current);
		});
	}

	collectCuts(leg: LegPt, size: PipeSize): void {
		const marks = [...leg.marks].sort((p, q) => p.pos - q.pos);
		let open: number | null = null;
		for (const m of marks) {
			if (m.role === 'after') open = m.pos;
			else if (open !== null) {
				const mm = ((m.pos - open) / leg.length) * leg.realMm;
				if (mm > 20)
					this.cutPieces.push({ size: sizeLabel(size, this.units), mm: Math.max(50, mm - 3) });
				open = null;
			}
		}
	}

	reducer(p: Pt, leg: LegPt, from: PipeSize, to: PipeSize, added: boolean): void {
		const g = this.g;
		const h = 8 * g;
		const n = perp(leg.d);
		const w1 = 5.5 * g;
		const w2 = Math.max(2.4 * g, w1 * (to.odIn / from.odIn));
		const a = sub(p, mul(leg.d, h));
		const b = add(p, mul(leg.d, h));
		const poly = [add(a, mul(n, w1)), add(b, mul(n, w2)), sub(b, mul(n, w2)), sub(a, mul(n, w1))];
		this.fittings.push(() => this.pen.polygon(poly, { fill: 1, stroke: 0, width: 1 * g }));
		this.clearance.segment(a, b, w1 + 1);
		this.site(sub(p, mul(leg.d, 11.5 * g)), leg.d, 'butt', false, from, added);
		this.site(add(p, mul(leg.d, 11.5 * g)), leg.d, 'butt', false, to, added);
		leg.marks.push(
			{ pos: dist(leg.a, p) - 11.5 * g, role: 'before' },
			{ pos: dist(leg.a, p) + 11.5 * g, role: 'after' }
		);
		this.count(
			`RED CONC BW ${scheduleLabel(from, this.schedule, this.units)} ${this.family.fitting}`,
			`${sizeLabel(from, this.units)} x ${sizeLabel(to, this.units)}`
		);
	}

	inline(
		item: Inline,
		p: Pt,
		leg: LegPt,
		size: PipeSize,
		added: boolean,
		toPt: (q: Pt) => Pt
	): void {
		const g = this.g;
		const d = leg.d;
		const at = item.pos;
		switch (item.kind) {
			case 'joint': {
				this.site(p, d, 'butt', item.field, size, added);
				leg.marks.push({ pos: at, role: 'before' }, { pos: at, role: 'after' });
				return;
			}
			case 'flanges': {
				const revised = added || item.added === true;
				if (item.added) {
					this.revisionBoxes.push(sub(p, mul(d, 14 * g)), add(p, mul(d, 14 * g)));
				}
				const axis = tickAxis(leg.dir);
				const half = this.flangeHalf(size);
				this.tick(sub(p, mul(d, 1.7 * g)), axis, half);
				this.tick(add(p, mul(d, 1.7 * g)), axis, half);
				this.site(sub(p, mul(d, 9 * g)), d, 'butt', false, size, revised);
				this.site(add(p, mul(d, 9 * g)), d, 'butt', false, size, revised);
				leg.marks.push({ pos: at - 9 * g, role: 'before' }, { pos: at + 9 * g, role: 'after' });
				this.weldNeck(size);
				this.weldNeck(size);
				this.flangeJoint(size);
				return;
			}
			case 'valve': {
				const axis = tickAxis(leg.dir);
				const half = this.flangeHalf(size);
				const body = 11 * g;
				const hw = half * 1.1;
				const a = sub(p, mul(d, body));
				const b = add(p, mul(d, body));
				const stemTop = add(p, mul(item.stem, 14 * g));
				const wheel = perp(item.stem);
				this.fittings.push(() => {
					this.pen.polygon([add(a, mul(axis, hw)), sub(a, mul(axis, hw)), p], {
						fill: 1,
						stroke: 0,
						width: 1 * g
					});
					this.pen.polygon([add(b, mul(axis, hw)), sub(b, mul(axis, hw)), p], {
						fill: 1,
						stroke: 0,
						width: 1 * g
					});
					this.pen.line(p, stemTop, { width: 0.9 * g });
					this.pen.line(add(stemTop, mul(wheel, 6 * g)), sub(stemTop, mul(wheel, 6 * g)), {
						width: 1.4 * g
					});
				});
				for (const s of [-1, 1]) {
					this.tick(add(p, mul(d, s * (body + 1.2 * g))), axis, half);
					this.tick(add(p, mul(d, s * (body + 4 * g))), axis, half);
				}
				this.clearance.segment(a, b, hw + 1);
				this.clearance.segment(p, stemTop, 2);
				this.clearance.segment(
					add(stemTop, mul(wheel, 6 * g)),
					sub(stemTop, mul(wheel, 6 * g)),
					1.5
				);
				this.endLabels.push({
					anchor: add(stemTop, mul(item.stem, 4 * g)),
					out: item.stem,
					lines: [item.tag]
				});
				this.site(sub(p, mul(d, body + 11 * g)), d, 'butt', false, size, added);
				this.site(add(p, mul(d, body + 11 * g)), d, 'butt', false, size, added);
				leg.marks.push(
					{ pos: at - body - 11 * g, role: 'before' },
					{ pos: at + body + 11 * g, role: 'after' }
				);
				this.weldNeck(size);
				this.weldNeck(size);
				this.flangeJoint(size, 2);
				this.count(
					`GATE VALVE ${this.rating} RF, ${this.family.flange.includes('F316') ? 'A351 CF8M' : 'A216 WCB'}, TAG ${item.tag}`,
					sizeLabel(size, this.units)
				);
				return;
			}
			case 'drain': {
				const dd = item.down;
				const small = findPipeSize('3/4');
				const sw: ScheduleName = 'SCH 160';
				const body = add(p, mul(dd, 5 * g));
				const valveC = add(p, mul(dd, 21 * g));
				const n = perp(dd);
				const tipEnd = add(p, mul(dd, 31 * g));
				this.fittings.push(() => {
					this.pen.polygon(
						[
							add(p, mul(n, 3.2 * g)),
							add(body, mul(n, 2.2 * g)),
							sub(body, mul(n, 2.2 * g)),
							sub(p, mul(n, 3.2 * g))
						],
						{ fill: 0 }
					);
					this.pen.line(body, tipEnd, { width: 1.1 * g });
					const v1 = sub(valveC, mul(dd, 4.5 * g));
					const v2 = add(valveC, mul(dd, 4.5 * g));
					this.pen.polygon([add(v1, mul(n, 3.5 * g)), sub(v1, mul(n, 3.5 * g)), valveC], {
						fill: 1,
						stroke: 0,
						width: 0.8 * g
					});
					this.pen.polygon([add(v2, mul(n, 3.5 * g)), sub(v2, mul(n, 3.5 * g)), valveC], {
						fill: 1,
						stroke: 0,
						width: 0.8 * g
					});
					this.pen.line(add(tipEnd, mul(n, 2.5 * g)), sub(tipEnd, mul(n, 2.5 * g)), {
						width: 1.8 * g
					});
				});
				this.clearance.segment(p, tipEnd, 4 * g);
				this.site(add(p, mul(dd, 2.6 * g)), dd, 'branch', false, small, added, sw);
				this.site(add(p, mul(dd, 8 * g)), dd, 'socket', false, small, added, sw);
				this.site(add(p, mul(dd, 15 * g)), dd, 'socket', false, small, added, sw);
				this.endLabels.push({
					anchor: add(tipEnd, mul(dd, 4 * g)),
					out: dd,
					lines: [`${sizeLabel(small, this.units)} DRAIN`]
				});
				const s = sizeLabel(small, this.units);
				this.count(`SOCKOLET 3000# ${this.family.flange}`, `${sizeLabel(size, this.units)} x ${s}`);
				this.count(`NIPPLE SCH 160 PBE 100 LG ${this.line.material}`, s);
				this.count(`GATE VALVE 800# SW, FORGED, BOLTED BONNET`, s);
				this.count(`HEX HEAD PLUG 3000# THRD ${this.family.flange}`, s);
				return;
			}
			case 'support': {
				const down = pt(0, -1);
				const foot = add(p, mul(down, 12 * g));
				const side = pt(1, 0);
				this.fittings.push(() => {
					this.pen.line(add(p, mul(down, 2 * g)), foot, { width: 0.9 * g });
					this.pen.line(add(foot, mul(side, 6 * g)), sub(foot, mul(side, 6 * g)), {
						width: 1.3 * g
					});
					for (let k = -2; k <= 2; k++) {
						const base = add(foot, mul(side, k * 2.6 * g));
						this.pen.line(base, add(base, pt(-2.2 * g, -2.6 * g)), { width: 0.4 * g });
					}
				});
				this.clearance.segment(p, foot, 2);
				this.clearance.segment(add(foot, mul(side, 7 * g)), sub(foot, mul(side, 7 * g)), 2.5 * g);
				this.endLabels.push({ anchor: add(foot, mul(down, 3 * g)), out: down, lines: [item.tag] });
				return;
			}
			case 'flow': {
				const n = perp(d);
				const tip = add(p, mul(d, 7 * g));
				const base = sub(p, mul(d, 5 * g));
				this.fittings.push(() =>
					this.pen.polygon([tip, add(base, mul(n, 3.6 * g)), sub(base, mul(n, 3.6 * g))], {
						fill: 0
					})
				);
				this.clearance.segment(base, tip, 3.6 * g, 'line');
				return;
			}
			case 'branch':
				this.branch(item.branch, p, leg, size, item.added || added, toPt);
				return;
		}
	}

	branchSize(b: Branch, run: PipeSize): PipeSize {
		const s = smallerSize(run, b.sizeStep);
		return s.dn < 20 ? findPipeSize('3/4') : s;
	}

	branch(
		b: Branch,
		root: Pt,
		host: LegPt,
		run: PipeSize,
		added: boolean,
		toPt: (q: Pt) => Pt
	): void {
		const g = this.g;
		const legs = this.legsToPt(b.legs, toPt);
		legs[0].a = root;
		legs[0].length = dist(root, legs[0].b);
		const bd = legs[0].d;
		const size = this.branchSize(b, run);
		const endLabel = this.branchEndLabel(b);
		if (b.kind === 'tee') {
			const pos = dist(host.a, root);
			this.site(sub(root, mul(host.d, 12 * g)), host.d, 'butt', false, run, added);
			host.marks.push({ pos: pos - 12 * g, role: 'before' });
			this.site(add(root, mul(bd, 12 * g)), bd, 'butt', false, size, added);
			this.walk(legs, 'fitting', 12 * g, b.end, size, added, { start: [], end: endLabel }, toPt);
			this.site(add(root, mul(host.d, 12 * g)), host.d, 'butt', false, run, added);
			host.marks.push({ pos: pos + 12 * g, role: 'after' });
			const equal = size === run;
			this.count(
				`${equal ? 'TEE EQUAL' : 'TEE RED'} BW ${scheduleLabel(run, this.schedule, this.units)} ${this.family.fitting}`,
				equal
					? sizeLabel(run, this.units)
					: `${sizeLabel(run, this.units)} x ${sizeLabel(size, this.units)}`
			);
		} else {
			const top = add(root, mul(bd, 7 * g));
			const n = perp(bd);
			const w = pipeWidth(run, g);
			this.fittings.push(() =>
				this.pen.polygon(
					[
						add(root, mul(n, w * 1.9)),
						add(top, mul(n, w * 1.1)),
						sub(top, mul(n, w * 1.1)),
						sub(root, mul(n, w * 1.9))
					],
					{ fill: 0.55, stroke: 0, width: 0.7 * g }
				)
			);
			this.clearance.segment(root, top, w * 1.9);
			this.site(add(root, mul(bd, 2.8 * g)), bd, 'branch', false, size, added);
			this.site(add(root, mul(bd, 10 * g)), bd, 'butt', false, size, added);
			this.walk(legs, 'fitting', 7 * g, b.end, size, added, { start: [], end: endLabel }, toPt);
			this.count(
				`WELDOLET BW ${scheduleLabel(size, this.schedule, this.units)} ${this.family.flange}`,
				`${sizeLabel(run, this.units)} x ${sizeLabel(size, this.units)}`
			);
		}
		for (const l of legs)
			this.dimensionRuns.push({
				points: [l.a, l.b],
				dir: l.dir,
				realMm: l.realMm,
				length: l.length
			});
		if (added) for (const l of legs) this.revisionBoxes.push(l.a, l.b);
	}

	branchEndLabel(b: Branch): string[] {
		const r = this.rng.fork(`branch-end-${b.legIndex}-${b.at}`);
		switch (b.end) {
			case 'nozzle':
				return [`TO ${equipmentTag(r, this.job.spec)}`, `NOZZLE N${r.int(1, 6)}`];
			case 'continuation':
				return [`CONT. ON`, otherDrawing(this.job.spec.number, r.int(2, 9) * 10)];
			case 'flange':
				return this.shop ? [] : [`TIE-IN TP-${r.int(10, 99)}`];
			default:
				return [];
		}
	}
}

export function equipmentTag(rng: Rng, spec: DemoSheetSpec): string {
	const digits = (spec.area.match(/\d+/)?.[0] ?? '20').slice(0, 2).padStart(2, '0');
	return `${rng.pick(['P', 'E', 'V', 'T', 'C'])}-${digits}${rng.int(10, 99)}${rng.pick(['', 'A', 'B'])}`;
}
