import type { Clearance } from './clearance';
import type { SheetWeld } from './page';
import { pt, type Pen, type Pt } from './pen';
import type { Units } from './pipe-data';
import { filletSizes, flangeText, plateText, steelLength, type Section } from './steel-data';
import type { EndDetail, Feature, Member } from './structural-plan';
import { drawDimension } from './symbols';
import type { WeldSymbolSpec } from './weld-symbol';

export interface Joint {
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

/** The member in elevation: its outline, end details and fittings, and every joint on it. */
export class Elevation {
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
