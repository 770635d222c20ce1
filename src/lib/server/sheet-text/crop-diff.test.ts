import { describe, expect, it } from 'vitest';
import { hasChanged, inkChange, type GreyCrop } from './crop-diff';

function crop(draw: (set: (x: number, y: number) => void) => void, size = 80): GreyCrop {
	const grey = new Uint8Array(size * size).fill(255);
	draw((x, y) => {
		if (x >= 0 && y >= 0 && x < size && y < size) grey[y * size + x] = 0;
	});
	return { width: size, height: size, grey };
}

const circle = (cx: number, cy: number, r: number) => (set: (x: number, y: number) => void) => {
	for (let a = 0; a < 360; a += 2)
		set(
			Math.round(cx + r * Math.cos((a * Math.PI) / 180)),
			Math.round(cy + r * Math.sin((a * Math.PI) / 180))
		);
};

describe('comparing the images of two revisions around a pin', () => {
	it('sees no change in the same drawing, nor in one shifted by a pixel or two', () => {
		const a = crop(circle(40, 40, 12));
		expect(inkChange(a, a).share).toBe(0);
		const shifted = crop(circle(42, 39, 12));
		expect(hasChanged(inkChange(a, shifted))).toBe(false);
	});

	it('sees a label gone or a new stroke', () => {
		const a = crop((set) => {
			circle(40, 40, 12)(set);
			for (let x = 10; x < 70; x++) set(x, 70);
		});
		const gone = crop((set) => {
			for (let x = 10; x < 70; x++) set(x, 70);
		});
		expect(hasChanged(inkChange(a, gone))).toBe(true);
		const added = crop((set) => {
			circle(40, 40, 12)(set);
			for (let x = 10; x < 70; x++) set(x, 70);
			for (let y = 5; y < 60; y++) set(8, y);
		});
		expect(hasChanged(inkChange(a, added))).toBe(true);
	});

	it('ignores a speck of noise and an empty place', () => {
		const a = crop(circle(40, 40, 12));
		const speck = crop((set) => {
			circle(40, 40, 12)(set);
			set(5, 5);
			set(6, 5);
		});
		expect(hasChanged(inkChange(a, speck))).toBe(false);
		expect(
			inkChange(
				crop(() => {}),
				crop(() => {})
			)
		).toEqual({ share: 0, pixels: 0, ink: 0 });
	});
});
