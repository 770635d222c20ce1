import { Clearance, type Rect } from './clearance';
import { drawFrame, drawRevisionCloud, inventInitials } from './frame';
import { numberInFlowOrder, type PageJob, type PageOutcome, type SheetWeld } from './page';
import { pt, type Pen, type Pt } from './pen';
import { createRng, mixSeed, type Rng } from './random';
import {
	drawMaterialList,
	drawStructuralViews,
	structuralNotes,
	type MaterialRow
} from './structural-views';
import {
	SECTIONS,
	chooseScale,
	filletSizes,
	flangeText,
	plate,
	plateText,
	steelLength,
	type Plate,
	type Section
} from './steel-data';
import { drawDimension, drawWeldDot, placeWeldBubble } from './symbols';
import type { Units } from './pipe-data';
import { drawWeldSymbol, symbolExtent, type WeldSymbolSpec } from './weld-symbol';

export type EndDetail = 'endPlate' | 'clip' | 'basePlate' | 'capPlate' | 'plain';
type FeatureKind = 'stiffener' | 'splice' | 'gusset' | 'lug' | 'shearTab' | 'doubler';

interface Feature {
	kind: FeatureKind;
	/** From the left end of the member, in mm. */
	x: number;
	added: boolean;
}

interface Joint {
	/** What joins what, as the weld schedule names it. */
	label: string;
	at: Pt;
	kind: SheetWeld['kind'];
	field: boolean;
	sizeText: string;
	thicknessText: string;
	added: boolean;
	symbol: WeldSymbolSpec;
	below: boolean;
}

export interface Member {
	kind: 'beam' | 'column';
	mark: string;
	section: Section;
	lengthMm: number;
	left: EndDetail;
	right: EndDetail;
	plates: Record<
		'stiffener' | 'endPlate' | 'base' | 'cap' | 'gusset' | 'lug' | 'tab' | 'doubler',
		Plate
	>;
	features: Feature[];
	basePlateCjp: boolean;
}

const END_WELDS: Record<EndDetail, number> = {
	endPlate: 3,
	clip: 2,
	basePlate: 1,
	capPlate: 1,
	plain: 0
};
const FEATURE_WELDS: Record<FeatureKind, number> = {
	stiffener: 3,
	splice: 3,
	gusset: 1,
	lug: 1,
	shearTab: 1,
	doubler: 1
};

function pieceMark(spec: PageJob['spec'], kind: Member['kind'], pageIndex: number): string {
	const digits = spec.number.match(/(\d+)\D*$/)?.[1] ?? '101';
	return `${kind === 'column' ? 'C' : 'B'}${digits.slice(-3)}${pageIndex > 0 ? String.fromCharCode(65 + pageIndex) : ''}`;
}

/** Picks the member and the details along it so that the welds add up to the page's target. */
function planMember(rng: Rng, job: PageJob): Member {
	const units = job.spec.units;
	const title = job.spec.title.toLowerCase();
	const kind: Member['kind'] = /column|post/.test(title)
		? 'column'
		: /beam|girder|rafter/.test(title)
			? 'beam'
			: rng.chance(0.5)
				? 'beam'
				: 'column';
	const section = rng.pick(SECTIONS[units]);
	const rawLength = kind === 'beam' ? rng.range(5200, 8600) : rng.range(4200, 7200);
	const lengthMm =
		units === 'imperial' ? Math.round(rawLength / 1.5875) * 1.5875 : Math.round(rawLength / 5) * 5;
	const plates: Member['plates'] = {
		stiffener: plate(units, rng.int(0, 1)),
		endPlate: plate(units, rng.int(3, 4)),
		base: plate(units, rng.int(5, 6)),
		cap: plate(units, 3),
		gusset: plate(units, rng.int(1, 2)),
		lug: plate(units, rng.int(2, 3)),
		tab: plate(units, 1),
		doubler: plate(units, 1)
	};
	let budget = job.target;
	const left: EndDetail = kind === 'column' ? 'basePlate' : rng.pick(['endPlate', 'clip'] as const);
	const right: EndDetail =
		kind === 'column' ? 'capPlate' : rng.pick(['endPlate', 'clip', 'plain'] as const);
	const basePlateCjp = kind === 'column' && budget >= 14 && rng.chance(0.5);
	budget -= END_WELDS[left] + END_WELDS[right] + (basePlateCjp ? 2 : 0);

	const slots: number[] = [];
	const lo = lengthMm * 0.1;
	const hi = lengthMm * 0.9;
	const gap = lengthMm * 0.065;
	const takeSlot = (minGap = gap): number | null => {
		for (let tries = 0; tries < 60; tries++) {
			const raw = rng.range(lo, hi);
			const x = units === 'imperial' ? Math.round(raw / 25.4) * 25.4 : Math.round(raw / 25) * 25;
			if (slots.every((s) => Math.abs(s - x) >= minGap)) {
				slots.push(x);
				return x;
			}
		}
		return null;
	};
	const features: Feature[] = [];
	// The revised issue's extra stiffener is given its place first, so nothing of the first issue moves.
	const reserved = takeSlot();
	if (reserved !== null) features.push({ kind: 'stiffener', x: reserved, added: true });
	const singles: FeatureKind[] =
		kind === 'beam'
			? ['lug', 'gusset', 'lug', 'doubler']
			: ['shearTab', 'shearTab', 'doubler', 'lug'];
	let splices = 0;
	let lugs = 0;
	let stiffeners = 0;
	while (budget > 0) {
		let choice: FeatureKind;
		if (budget >= 3 && stiffeners < (job.target >= 22 ? 6 : 4) && rng.chance(0.55))
			choice = kind === 'beam' && splices === 0 && rng.chance(0.15) ? 'splice' : 'stiffener';
		else choice = rng.pick(singles);
		if (choice === 'lug' && lugs >= 2) choice = kind === 'beam' ? 'gusset' : 'shearTab';
		if (FEATURE_WELDS[choice] > budget) continue;
		const x =
			takeSlot() ?? takeSlot(gap / 2) ?? (FEATURE_WELDS[choice] === 1 ? takeSlot(gap / 4) : null);
		if (x === null) break;
		if (choice === 'stiffener') stiffeners += 1;
		if (choice === 'splice') splices += 1;
		if (choice === 'lug') lugs += 1;
		features.push({ kind: choice, x, added: false });
		budget -= FEATURE_WELDS[choice];
	}
	return {
		kind,
		mark: pieceMark(job.spec, kind, job.pageIndex),
		section,
		lengthMm,
		left,
		right,
		plates,
		features,
		basePlateCjp
	};
}

class Elevation {
	readonly joints: Joint[] = [];
	readonly cloudPoints: Pt[] = [];
	readonly fillets: { symbol: string; text: string }[];

	constructor(
		readonly pen: Pen,
		readonly clearance: Clearance,
		readonly member: Member,
		readonly units: Units,
		readonly x0: number,
		readonly yBottom: number,
		readonly sc: number,
		readonly t: number,
		readonly variant: number
	) {
		this.fillets = filletSizes(units);
	}

	X(mm: number): number {
		return this.x0 + mm * this.sc;
	}

	Y(mm: number): number {
		return this.yBottom + mm * this.sc;
	}

	get d(): number {
		return this.member.section.d;
	}

	get tf(): number {
		return this.member.section.tf;
	}

	/** At least a hairline apart on paper, whatever the scale. */
	thin(mm: number): number {
		return Math.max(mm * this.sc, 2.2 * this.t);
	}

	outline(x: number, y: number, w: number, h: number, gray = 0, dash?: number[]): void {
		this.pen.rect(x, y, w, h, { stroke: gray, width: 0.8 * this.t, fill: 1, dash });
		this.clearance.box(x, y, w, h);
	}

	joint(j: Omit<Joint, 'added' | 'below'> & { added?: boolean; below?: boolean }): void {
		this.joints.push({ added: false, below: false, ...j });
	}

	drawMember(): void {
		const { pen, t, member } = this;
		const xL = this.X(0);
		const xR = this.X(member.lengthMm);
		pen.rect(xL, this.Y(0), xR - xL, this.Y(this.d) - this.Y(0), {
			stroke: 0,
			width: 1.2 * t,
			fill: 1
		});
		pen.line(pt(xL, this.Y(this.tf)), pt(xR, this.Y(this.tf)), { width: 0.6 * t });
		pen.line(pt(xL, this.Y(this.d - this.tf)), pt(xR, this.Y(this.d - this.tf)), {
			width: 0.6 * t
		});
		pen.line(pt(xL - 12 * t, this.Y(this.d / 2)), pt(xR + 12 * t, this.Y(this.d / 2)), {
			width: 0.3 * t,
			gray: 0.4,
			dash: [14 * t, 3 * t, 3 * t, 3 * t]
		});
		this.clearance.segment(pt(xL, this.Y(0)), pt(xR, this.Y(0)), 1.5);
		this.clearance.segment(pt(xL, this.Y(this.d)), pt(xR, this.Y(this.d)), 1.5);
		this.clearance.segment(pt(xL, this.Y(this.tf)), pt(xR, this.Y(this.tf)), 1);
		this.clearance.segment(pt(xL, this.Y(this.d - this.tf)), pt(xR, this.Y(this.d - this.tf)), 1);
		this.clearance.segment(pt(xL, this.Y(0)), pt(xL, this.Y(this.d)), 1.5);
		this.clearance.segment(pt(xR, this.Y(0)), pt(xR, this.Y(this.d)), 1.5);
	}

	/** The member seen from above at the elevation's scale: flange outline, plates edge-on, hidden parts dashed. */
	drawPlan(yc: number): void {
		const { pen, t, member } = this;
		const s = member.section;
		const half = (s.bf * this.sc) / 2;
		const xL = this.X(0);
		const xR = this.X(member.lengthMm);
		const hidden = { width: 0.5 * t, gray: 0.25, dash: [4 * t, 2 * t] };
		pen.rect(xL, yc - half, xR - xL, 2 * half, { stroke: 0, width: 1.1 * t, fill: 1 });
		const tw = Math.max((s.tw * this.sc) / 2, 0.8 * t);
		pen.line(pt(xL, yc + tw), pt(xR, yc + tw), hidden);
		pen.line(pt(xL, yc - tw), pt(xR, yc - tw), hidden);
		const edgeOn = (x: number, w: number, h: number) =>
			pen.rect(x, yc - h / 2, w, h, { stroke: 0, width: 0.8 * t, fill: 1 });
		for (const [detail, side] of [
			[member.left, 'left'],
			[member.right, 'right']
		] as const) {
			const xe = side === 'left' ? xL : xR;
			if (detail === 'endPlate' || detail === 'basePlate' || detail === 'capPlate') {
				const p =
					detail === 'endPlate'
						? member.plates.endPlate
						: detail === 'basePlate'
							? member.plates.base
							: member.plates.cap;
				const w = this.thin(p.mm);
				const h =
					(detail === 'basePlate' ? s.bf + 150 : detail === 'endPlate' ? s.bf + 25 : s.bf) *
					this.sc;
				edgeOn(side === 'left' ? xe - w : xe, w, h);
			}
			if (detail === 'clip') {
				const leg = 100 * this.sc;
				const x = side === 'left' ? xe - 12 * this.sc : xe + 12 * this.sc - leg;
				pen.rect(x, yc - tw - leg, leg, leg, {
					stroke: 0.25,
					width: 0.5 * t,
					dash: [4 * t, 2 * t]
				});
			}
		}
		for (const f of member.features) {
			if (f.added && this.variant < 1) continue;
			const x = this.X(f.x);
			switch (f.kind) {
				case 'stiffener':
					pen.rect(
						x - this.thin(member.plates.stiffener.mm) / 2,
						yc - half + 3 * this.sc,
						this.thin(member.plates.stiffener.mm),
						half - tw - 3 * this.sc,
						{ stroke: 0.25, width: 0.5 * t, dash: [3 * t, 1.5 * t] }
					);
					break;
				case 'splice':
					pen.line(pt(x, yc - half - 5 * t), pt(x, yc + half + 5 * t), {
						width: 0.9 * t,
						dash: [5 * t, 2 * t]
					});
					break;
				case 'lug':
				case 'shearTab': {
					const len = (f.kind === 'lug' ? 160 : 230) * this.sc;
					const w = this.thin((f.kind === 'lug' ? member.plates.lug : member.plates.tab).mm);
					pen.rect(x - len / 2, yc - w / 2, len, w, { stroke: 0, width: 0.8 * t, fill: 0.85 });
					break;
				}
				case 'doubler':
					pen.rect(
						x - 210 * this.sc,
						yc - tw - this.thin(member.plates.doubler.mm),
						420 * this.sc,
						this.thin(member.plates.doubler.mm),
						{ stroke: 0.25, width: 0.5 * t, dash: [3 * t, 1.5 * t] }
					);
					break;
				case 'gusset':
					pen.polygon(
						[
							pt(x - 150 * this.sc, yc - tw),
							pt(x + 150 * this.sc, yc - tw),
							pt(x + 150 * this.sc, yc + tw),
							pt(x - 150 * this.sc, yc + tw)
						],
						{ stroke: 0.25, width: 0.5 * t, dash: [3 * t, 1.5 * t] }
					);
					break;
			}
		}
		drawDimension(
			pen,
			this.clearance,
			pt(xL, yc - half),
			pt(xL, yc + half),
			pt(-1, 0),
			44 * t,
			steelLength(s.bf, this.units),
			{ t }
		);
	}

	end(detail: EndDetail, side: 'left' | 'right'): void {
		const { t, member, units } = this;
		const sign = side === 'left' ? -1 : 1;
		const xe = this.X(side === 'left' ? 0 : member.lengthMm);
		const s = member.section;
		const mid = this.Y(this.d / 2);
		const weldTail = 'E70XX';
		switch (detail) {
			case 'endPlate': {
				const p = member.plates.endPlate;
				const w = this.thin(p.mm);
				const ext = 90;
				const x = side === 'left' ? xe - w : xe;
				this.outline(x, this.Y(-ext), w, this.Y(this.d + ext) - this.Y(-ext));
				for (const yy of [-ext / 2, this.tf + 60, this.d - this.tf - 60, this.d + ext / 2])
					this.pen.line(pt(x - 3 * t, this.Y(yy)), pt(x + w + 3 * t, this.Y(yy)), {
						width: 0.4 * t,
						dash: [2 * t, 1.5 * t]
					});
				const cjp: Omit<WeldSymbolSpec, 'joint'> = {
					type: 'bevel',
					sides: 'arrow',
					size: '',
					allAround: false,
					field: false,
					tail: 'CJP TC-U4b'
				};
				this.joint({
					label: 'TOP FLG TO END PL',
					at: pt(xe, this.Y(this.d - this.tf / 2)),
					kind: 'butt',
					field: false,
					sizeText: flangeText(s, units),
					thicknessText: flangeText(s, units),
					symbol: { ...cjp, joint: pt(xe, this.Y(this.d - this.tf / 2)) }
				});
				this.joint({
					label: 'WEB TO END PL',
					at: pt(xe, mid),
					kind: 'fillet',
					field: false,
					sizeText: this.fillets[1].text,
					thicknessText: webText(s, units),
					symbol: {
						joint: pt(xe, mid),
						type: 'fillet',
						sides: 'both',
						size: this.fillets[1].symbol,
						allAround: false,
						field: false,
						tail: weldTail
					}
				});
				this.joint({
					label: 'BOT FLG TO END PL',
					at: pt(xe, this.Y(this.tf / 2)),
					kind: 'butt',
					field: false,
					sizeText: flangeText(s, units),
					thicknessText: flangeText(s, units),
					symbol: { ...cjp, joint: pt(xe, this.Y(this.tf / 2)) },
					below: true
				});
				return;
			}
			case 'clip': {
				const leg = units === 'imperial' ? 101.6 : 100;
				const thick = units === 'imperial' ? 9.525 : 10;
				const h = (this.d - 2 * this.tf) * 0.62;
				const back = 12;
				const xa = side === 'left' ? xe - back * this.sc : xe + back * this.sc - leg * this.sc;
				const y = this.Y(this.d / 2 - h / 2);
				this.outline(xa, y, leg * this.sc, h * this.sc, 0);
				const outX = side === 'left' ? xa : xa + leg * this.sc - this.thin(thick);
				this.pen.line(
					pt(outX + (side === 'left' ? this.thin(thick) : 0), y),
					pt(outX + (side === 'left' ? this.thin(thick) : 0), y + h * this.sc),
					{ width: 0.5 * t }
				);
				const toe = side === 'left' ? xa + leg * this.sc : xa;
				const thicknessText = plateText(
					{ mm: thick, label: units === 'imperial' ? '3/8' : '10' },
					units
				);
				this.joint({
					label: 'CLIP ANGLE TO WEB',
					at: pt(toe, mid),
					kind: 'fillet',
					field: false,
					sizeText: this.fillets[0].text,
					thicknessText,
					symbol: {
						joint: pt(toe, mid),
						type: 'fillet',
						sides: 'arrow',
						size: this.fillets[0].symbol,
						allAround: false,
						field: false,
						tail: '3 SIDES'
					}
				});
				const fieldAt = pt(side === 'left' ? xa : xa + leg * this.sc, y + h * this.sc * 0.25);
				this.joint({
					label: 'CLIP ANGLE TO SUPPORT',
					at: fieldAt,
					kind: 'fillet',
					field: true,
					sizeText: this.fillets[1].text,
					thicknessText,
					symbol: {
						joint: fieldAt,
						type: 'fillet',
						sides: 'arrow',
						size: this.fillets[1].symbol,
						allAround: false,
						field: true,
						tail: 'TO SUPPORT'
					},
					below: true
				});
				void sign;
				return;
			}
			case 'basePlate': {
				const p = member.plates.base;
				const w = this.thin(p.mm);
				const ext = 75;
				const x = xe - w;
				this.outline(x, this.Y(-ext), w, this.Y(this.d + ext) - this.Y(-ext));
				for (const yy of [-ext / 2, this.d + ext / 2])
					this.pen.line(pt(x - 5 * t, this.Y(yy)), pt(x + w + 3 * t, this.Y(yy)), {
						width: 0.4 * t,
						dash: [2 * t, 1.5 * t]
					});
				if (member.basePlateCjp) {
					const cjp: Omit<WeldSymbolSpec, 'joint'> = {
						type: 'bevel',
						sides: 'arrow',
						size: '',
						allAround: false,
						field: false,
						tail: 'CJP'
					};
					this.joint({
						label: 'FLG TO BASE PL',
						at: pt(xe, this.Y(this.d - this.tf / 2)),
						kind: 'butt',
						field: false,
						sizeText: flangeText(s, units),
						thicknessText: flangeText(s, units),
						symbol: { ...cjp, joint: pt(xe, this.Y(this.d - this.tf / 2)) }
					});
					this.joint({
						label: 'WEB TO BASE PL',
						at: pt(xe, mid),
						kind: 'fillet',
						field: false,
						sizeText: this.fillets[1].text,
						thicknessText: webText(s, units),
						symbol: {
							joint: pt(xe, mid),
							type: 'fillet',
							sides: 'both',
							size: this.fillets[1].symbol,
							allAround: false,
							field: false,
							tail: weldTail
						}
					});
					this.joint({
						label: 'FLG TO BASE PL',
						at: pt(xe, this.Y(this.tf / 2)),
						kind: 'butt',
						field: false,
						sizeText: flangeText(s, units),
						thicknessText: flangeText(s, units),
						symbol: { ...cjp, joint: pt(xe, this.Y(this.tf / 2)) },
						below: true
					});
				} else {
					this.joint({
						label: 'COLUMN TO BASE PL',
						at: pt(xe, mid),
						kind: 'fillet',
						field: false,
						sizeText: this.fillets[2].text,
						thicknessText: flangeText(s, units),
						symbol: {
							joint: pt(xe, mid),
							type: 'fillet',
							sides: 'arrow',
							size: this.fillets[2].symbol,
							allAround: true,
							field: false,
							tail: weldTail
						}
					});
				}
				return;
			}
			case 'capPlate': {
				const p = member.plates.cap;
				const w = this.thin(p.mm);
				this.outline(xe, this.Y(0), w, this.Y(this.d) - this.Y(0));
				this.joint({
					label: 'CAP PL TO COLUMN',
					at: pt(xe, mid),
					kind: 'fillet',
					field: false,
					sizeText: this.fillets[0].text,
					thicknessText: plateText(p, units),
					symbol: {
						joint: pt(xe, mid),
						type: 'fillet',
						sides: 'arrow',
						size: this.fillets[0].symbol,
						allAround: true,
						field: false,
						tail: weldTail
					}
				});
				return;
			}
			case 'plain':
				return;
		}
	}

	feature(f: Feature): void {
		if (f.added && this.variant < 1) return;
		const { t, member, units } = this;
		const s = member.section;
		const x = this.X(f.x);
		const before = this.joints.length;
		const fillet = (i: number) => this.fillets[Math.min(i, this.fillets.length - 1)];
		switch (f.kind) {
			case 'stiffener': {
				const p = member.plates.stiffener;
				const w = this.thin(p.mm);
				const clip = 20 * this.sc;
				const yb = this.Y(this.tf);
				const yt = this.Y(this.d - this.tf);
				this.pen.polygon(
					[
						pt(x - w / 2, yb + clip),
						pt(x - w / 2, yt - clip),
						pt(x, yt),
						pt(x + w / 2, yt),
						pt(x + w / 2, yb),
						pt(x, yb)
					],
					{ stroke: 0, width: 0.7 * t, fill: 0.85 }
				);
				this.clearance.box(x - w / 2, yb, w, yt - yb);
				const sym = (joint: Pt, sides: WeldSymbolSpec['sides']): WeldSymbolSpec => ({
					joint,
					type: 'fillet',
					sides,
					size: fillet(0).symbol,
					allAround: false,
					field: false,
					tail: 'NS'
				});
				const top = pt(x, yt - Math.min(6 * t, (yt - yb) * 0.2));
				const web = pt(x, (yb + yt) / 2);
				const bottom = pt(x, yb + Math.min(6 * t, (yt - yb) * 0.2));
				const thicknessText = plateText(p, units);
				this.joint({
					label: 'STIFF. TO TOP FLG',
					at: top,
					kind: 'fillet',
					field: false,
					sizeText: fillet(0).text,
					thicknessText,
					symbol: sym(top, 'both'),
					added: f.added
				});
				this.joint({
					label: 'STIFF. TO WEB',
					at: web,
					kind: 'fillet',
					field: false,
					sizeText: fillet(0).text,
					thicknessText,
					symbol: sym(web, 'both'),
					added: f.added
				});
				this.joint({
					label: 'STIFF. TO BOT FLG',
					at: bottom,
					kind: 'fillet',
					field: false,
					sizeText: fillet(0).text,
					thicknessText,
					symbol: sym(bottom, 'both'),
					added: f.added,
					below: true
				});
				break;
			}
			case 'splice': {
				this.pen.line(pt(x, this.Y(0) - 6 * t), pt(x, this.Y(this.d) + 6 * t), {
					width: 0.9 * t,
					dash: [5 * t, 2 * t]
				});
				const field = false;
				const cjp = (joint: Pt): WeldSymbolSpec => ({
					joint,
					type: 'bevel',
					sides: 'both',
					size: '',
					allAround: false,
					field,
					tail: 'CJP UT'
				});
				const top = pt(x, this.Y(this.d - this.tf / 2));
				const web = pt(x, this.Y(this.d / 2));
				const bottom = pt(x, this.Y(this.tf / 2));
				this.joint({
					label: 'TOP FLG SPLICE',
					at: top,
					kind: 'butt',
					field,
					sizeText: flangeText(s, units),
					thicknessText: flangeText(s, units),
					symbol: cjp(top),
					added: f.added
				});
				this.joint({
					label: 'WEB SPLICE',
					at: web,
					kind: 'butt',
					field,
					sizeText: webText(s, units),
					thicknessText: webText(s, units),
					symbol: cjp(web),
					added: f.added
				});
				this.joint({
					label: 'BOT FLG SPLICE',
					at: bottom,
					kind: 'butt',
					field,
					sizeText: flangeText(s, units),
					thicknessText: flangeText(s, units),
					symbol: cjp(bottom),
					added: f.added,
					below: true
				});
				break;
			}
			case 'gusset': {
				const p = member.plates.gusset;
				const w = 300 * this.sc;
				const h = 220 * this.sc;
				const yb = this.Y(0);
				this.pen.polygon(
					[
						pt(x - w / 2, yb),
						pt(x + w / 2, yb),
						pt(x + w * 0.15, yb - h),
						pt(x - w * 0.35, yb - h)
					],
					{ stroke: 0, width: 0.8 * t, fill: 1 }
				);
				for (const k of [-0.12, 0.08])
					this.pen.circle(pt(x + k * w, yb - h * 0.6), Math.max(1.6 * t, 11 * this.sc), {
						stroke: 0,
						width: 0.5 * t
					});
				this.clearance.box(x - w / 2, yb - h, w, h);
				const at = pt(x, yb);
				this.joint({
					label: 'GUSSET TO BOT FLG',
					at,
					kind: 'fillet',
					field: false,
					sizeText: fillet(1).text,
					thicknessText: plateText(p, units),
					symbol: {
						joint: at,
						type: 'fillet',
						sides: 'both',
						size: fillet(1).symbol,
						allAround: false,
						field: false,
						tail: 'E70XX'
					},
					added: f.added,
					below: true
				});
				break;
			}
			case 'lug':
			case 'shearTab': {
				const lug = f.kind === 'lug';
				const p = lug ? member.plates.lug : member.plates.tab;
				const w = (lug ? 160 : 230) * this.sc;
				const h = (lug ? 120 : 110) * this.sc;
				const yt = this.Y(this.d);
				if (lug) {
					const r = w / 2;
					const pts = [
						pt(x - w / 2, yt),
						...this.pen.arcPoints(pt(x, yt + h - r * 0.5), r, 180, 0).slice(0),
						pt(x + w / 2, yt)
					];
					this.pen.polygon(pts, { stroke: 0, width: 0.8 * t, fill: 1 });
					this.pen.circle(pt(x, yt + h - r * 0.5), Math.max(2 * t, r * 0.4), {
						stroke: 0,
						width: 0.6 * t
					});
				} else {
					this.pen.rect(x - w / 2, yt, w, h, { stroke: 0, width: 0.8 * t, fill: 1 });
					for (const k of [-0.3, 0, 0.3])
						this.pen.circle(pt(x + k * w, yt + h * 0.55), Math.max(1.6 * t, 11 * this.sc), {
							stroke: 0,
							width: 0.5 * t
						});
				}
				this.clearance.box(x - w / 2, yt, w, h + (lug ? w * 0.3 : 0));
				const at = pt(x, yt);
				this.joint({
					label: lug ? 'LIFTING LUG TO FLG' : 'SHEAR TAB TO FLG',
					at,
					kind: 'fillet',
					field: false,
					sizeText: fillet(1).text,
					thicknessText: plateText(p, units),
					symbol: {
						joint: at,
						type: 'fillet',
						sides: lug ? 'arrow' : 'both',
						size: fillet(1).symbol,
						allAround: lug,
						field: false,
						tail: 'E70XX'
					},
					added: f.added
				});
				break;
			}
			case 'doubler': {
				const p = member.plates.doubler;
				const w = 420 * this.sc;
				const yb = this.Y(this.tf) + 1.5 * t;
				const h = this.Y(this.d - this.tf) - 1.5 * t - yb;
				this.pen.rect(x - w / 2, yb, w, h, { stroke: 0, width: 0.7 * t, fill: 0.93 });
				this.clearance.box(x - w / 2, yb, w, h);
				const at = pt(x - w / 2, yb + h / 2);
				this.joint({
					label: 'DOUBLER PL TO WEB',
					at,
					kind: 'fillet',
					field: false,
					sizeText: fillet(0).text,
					thicknessText: plateText(p, units),
					symbol: {
						joint: at,
						type: 'fillet',
						sides: 'arrow',
						size: fillet(0).symbol,
						allAround: true,
						field: false,
						tail: 'DOUBLER'
					},
					added: f.added
				});
				break;
			}
		}
		if (f.added)
			for (const j of this.joints.slice(before))
				this.cloudPoints.push(j.at, pt(j.at.x, this.Y(-40)), pt(j.at.x, this.Y(this.d + 40)));
	}
}

function webText(s: Section, units: Units): string {
	return units === 'imperial' ? `${(s.tw / 25.4).toFixed(3)}"` : `${s.tw} mm`;
}

/** Reference lines stacked in lanes above and below the elevation so no two symbols collide. */
/** Returns the lowest reference line used, so the view title can go under it. */
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

	const dimY1 = yBottom - 34 * t;
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
	void dimY1;

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
		kg: qty * p.mm * widthMm * lengthMm * 7.85e-6
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
