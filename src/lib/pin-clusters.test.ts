import { describe, expect, it } from 'vitest';
import { PIN_SIZES, layoutPins, pickAt, type PinMark } from './pin-clusters';

interface Weld {
	id: number;
	label: string;
}

const spot = (id: number, x: number, y: number, label = String(id)) => ({
	item: { id, label },
	x,
	y,
	label
});

/** The screen box of a drawn label, as the layout reserves it. */
function labelBox(m: Extract<PinMark<Weld>, { kind: 'pin' }>) {
	const l = m.label;
	return {
		x0: m.x + l.dx - 2,
		y0: m.y + l.dy - l.height * 0.75,
		x1: m.x + l.dx + l.width + 2,
		y1: m.y + l.dy + l.height * 0.25
	};
}

function seeded(seed: number) {
	let s = seed;
	return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

describe('laying out pins at the current zoom', () => {
	it('draws pins that are well apart on their own, each with its label', () => {
		const marks = layoutPins([spot(1, 100, 100), spot(2, 300, 100), spot(3, 100, 300)]);
		expect(marks.map((m) => m.kind)).toEqual(['pin', 'pin', 'pin']);
	});

	it('gathers pins closer than a touch target into one mark with their count, at their middle', () => {
		const marks = layoutPins([spot(1, 100, 100), spot(2, 120, 100), spot(3, 400, 400)]);
		const cluster = marks.find((m) => m.kind === 'cluster');
		expect(cluster).toMatchObject({ kind: 'cluster', x: 110, y: 100 });
		expect(cluster?.kind === 'cluster' && cluster.items.map((i) => i.id).sort()).toEqual([1, 2]);
		expect(marks.filter((m) => m.kind === 'pin')).toHaveLength(1);
	});

	it('chains neighbours: three pins each within reach of the next are one cluster', () => {
		const marks = layoutPins([spot(1, 100, 100), spot(2, 140, 100), spot(3, 180, 100)]);
		expect(marks).toHaveLength(1);
		expect(marks[0].kind === 'cluster' && marks[0].items).toHaveLength(3);
	});

	it('never gathers the pin that must stay alone (the selected one)', () => {
		const marks = layoutPins(
			[spot(1, 100, 100), spot(2, 110, 100), spot(3, 120, 100)],
			PIN_SIZES,
			(w) => w.id === 2
		);
		const lone = marks.find((m) => m.kind === 'pin');
		expect(lone?.kind === 'pin' && lone.item.id).toBe(2);
		expect(marks.find((m) => m.kind === 'cluster')?.kind === 'cluster').toBe(true);
	});

	it('on a crowded sheet, keeps every pin exactly once and no two labels overlapping', () => {
		const random = seeded(14);
		const spots = Array.from({ length: 300 }, (_, i) =>
			spot(i, random() * 900, random() * 700, `FW-${i + 1}`)
		);
		const marks = layoutPins(spots, PIN_SIZES, (w) => w.id === 5);
		const seen = marks.flatMap((m) => (m.kind === 'pin' ? [m.item.id] : m.items.map((i) => i.id)));
		expect(seen.sort((a, b) => a - b)).toEqual(spots.map((s) => s.item.id));
		const labels = marks.flatMap((m) => (m.kind === 'pin' ? [labelBox(m)] : []));
		for (let i = 0; i < labels.length; i++)
			for (let j = i + 1; j < labels.length; j++) {
				const a = labels[i];
				const b = labels[j];
				expect(a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1).toBe(false);
			}
		// Pins drawn on their own are a touch target apart (the selected one excepted).
		const singles = marks.filter((m) => m.kind === 'pin' && m.item.id !== 5);
		for (let i = 0; i < singles.length; i++)
			for (let j = i + 1; j < singles.length; j++)
				expect(
					Math.hypot(singles[i].x - singles[j].x, singles[i].y - singles[j].y)
				).toBeGreaterThanOrEqual(PIN_SIZES.target);
	});
});

describe('what a tap means', () => {
	it('is the pin nearest the touch point, whatever is drawn on top', () => {
		// 13 pins in a tight row at the selected pin's side: each is kept alone so none gathers,
		// and a tap on each centre must open that weld and no other.
		const spots = Array.from({ length: 13 }, (_, i) => spot(i, 100 + i * 26, 200 + (i % 2) * 9));
		const marks = layoutPins(spots, PIN_SIZES, () => true);
		for (const s of spots) {
			const hit = pickAt(marks, s.x, s.y);
			expect(hit?.kind === 'pin' && hit.item.id).toBe(s.item.id);
		}
		// Half-way between two pins, the nearer one.
		const hit = pickAt(marks, 100 + 26 * 3 + 9, 200 + 9);
		expect(hit?.kind === 'pin' && hit.item.id).toBe(3);
	});

	it('is the cluster for a tap inside it, the pin for a tap on its label, nothing on bare sheet', () => {
		const marks = layoutPins([spot(1, 100, 100), spot(2, 115, 105), spot(3, 400, 300, 'FW-12')]);
		expect(pickAt(marks, 108, 103)?.kind).toBe('cluster');
		const lone = marks.find((m) => m.kind === 'pin')!;
		if (lone.kind !== 'pin') throw new Error('expected a pin');
		const labelMiddle = {
			x: lone.x + lone.label.dx + lone.label.width / 2,
			y: lone.y + lone.label.dy - 4
		};
		expect(pickAt(marks, labelMiddle.x, labelMiddle.y)).toBe(lone);
		expect(pickAt(marks, 700, 600)).toBeNull();
	});
});
