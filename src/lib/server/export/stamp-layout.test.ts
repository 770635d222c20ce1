import { describe, expect, it } from 'vitest';
import { layoutStamps, stampBox, stampScale, stampSize, type StampRequest } from './stamp-layout';
import { STAMP } from './sheet-frame';

const mm = (v: number) => (v * 72) / 25.4;

describe('stamp size from the sheet size', () => {
	// Sheet sizes: ISO 216 (A series, mm) and ASME Y14.1 (ANSI B 11 × 17 in, ANSI D 22 × 34 in).
	it('keeps the drawn size on A3, ANSI B and smaller sheets', () => {
		expect(stampScale(mm(420), mm(297))).toBe(1);
		expect(stampScale(17 * 72, 11 * 72)).toBe(1);
		expect(stampScale(mm(297), mm(210))).toBe(1);
	});

	it('grows with the short side: twice on A1, about 1.9 on ANSI D, 2.8 on A0', () => {
		expect(stampScale(mm(841), mm(594))).toBeCloseTo(2, 1);
		expect(stampScale(34 * 72, 22 * 72)).toBeCloseTo(1.88, 2);
		expect(stampScale(mm(1189), mm(841))).toBeCloseTo(2.83, 2);
	});

	it('grows for a scan saved at its pixel size, within a limit', () => {
		// An A3 scan at 300 dpi saved one point a pixel: 4961 × 3508.
		expect(stampScale(4961, 3508)).toBeCloseTo(4.17, 2);
		expect(stampScale(40_000, 30_000)).toBe(8);
	});

	it('scales the glyph, the number and its place above the glyph alike', () => {
		const a1 = stampSize(mm(841), mm(594));
		expect(a1.labelSize / STAMP.labelSize).toBeCloseTo(a1.scale);
		expect(a1.glyphScale / STAMP.glyphScale).toBeCloseTo(a1.scale);
		expect(a1.labelBaseline / STAMP.labelBaseline).toBeCloseTo(a1.scale);
	});
});

describe('stamps laid out on a sheet', () => {
	const frame = { width: 1224, height: 792, bottom: STAMP.footerHeight };
	const size = stampSize(frame.width, frame.height);

	it('puts stamps with room on their pins, no leader', () => {
		const requests = [
			{ u: 100, v: 100, labelWidth: 10 },
			{ u: 300, v: 100, labelWidth: 20 },
			{ u: 100, v: 400, labelWidth: 14 }
		];
		const placed = layoutStamps(requests, frame, size);
		placed.forEach((p, i) => {
			expect(p).toEqual({ u: requests[i].u, v: requests[i].v, offset: false, leader: null });
		});
	});

	it('on a crowded sheet: no two stamps overlap, and each leader ends on its pin', () => {
		let seed = 21;
		const random = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
		const requests: StampRequest[] = Array.from({ length: 160 }, () => ({
			u: 200 + random() * 500,
			v: 150 + random() * 400,
			labelWidth: 8 + random() * 20
		}));
		const placed = layoutStamps(requests, frame, size);
		const boxes = placed.map((p, i) => stampBox(p.u, p.v, requests[i].labelWidth, size));
		for (let i = 0; i < boxes.length; i++)
			for (let j = i + 1; j < boxes.length; j++) {
				const [a, b] = [boxes[i], boxes[j]];
				expect(a.u0 < b.u1 && b.u0 < a.u1 && a.v0 < b.v1 && b.v0 < a.v1, `${i} and ${j}`).toBe(
					false
				);
			}
		const offset = placed.filter((p) => p.offset);
		expect(offset.length).toBeGreaterThan(20);
		placed.forEach((p, i) => {
			if (!p.offset) return;
			const [u, v] = p.leader!.to;
			expect(Math.hypot(u - requests[i].u, v - requests[i].v)).toBeLessThanOrEqual(2);
			// The leader leaves from the stamp's glyph.
			const [fu, fv] = p.leader!.from;
			expect(Math.hypot(fu - p.u, fv - p.v)).toBeCloseTo(size.glyphHalf, 5);
		});
		// Every stamp on the sheet, clear of the footer.
		for (const b of boxes) {
			expect(b.u0).toBeGreaterThanOrEqual(0);
			expect(b.u1).toBeLessThanOrEqual(frame.width);
			expect(b.v0).toBeGreaterThanOrEqual(frame.bottom);
			expect(b.v1).toBeLessThanOrEqual(frame.height);
		}
	});
});
