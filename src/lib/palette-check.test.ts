import { describe, expect, it } from 'vitest';
import { JOINT_STATES, STATE_LOOKS } from './joint-state';
import {
	MACHADO_2009,
	closestPair,
	contrastRatio,
	deltaE2000,
	hexToRgb,
	rgbToLab,
	simulate
} from './palette-check';

describe('CIEDE2000', () => {
	// Sharma, Wu & Dalal, Color Res. Appl. 30(1) 2005, Table 1: test pairs 1, 2, 3, 7, 17, 19, 25, 34.
	const pairs: [number[], number[], number][] = [
		[[50, 2.6772, -79.7751], [50, 0, -82.7485], 2.0425],
		[[50, 3.1571, -77.2803], [50, 0, -82.7485], 2.8615],
		[[50, 2.8361, -74.02], [50, 0, -82.7485], 3.4412],
		[[50, 0, 0], [50, -1, 2], 2.3669],
		[[50, 2.5, 0], [73, 25, -18], 27.1492],
		[[50, 2.5, 0], [50, 3.1736, 0.5854], 1.0],
		[[60.2574, -34.0099, 36.2677], [60.4626, -34.1751, 39.4387], 1.2644],
		[[2.0776, 0.0795, -1.135], [0.9033, -0.0636, -0.5514], 0.9082]
	];
	it.each(pairs)('%j against %j is %f (Sharma et al. 2005)', (a, b, expected) => {
		expect(deltaE2000(a as [number, number, number], b as [number, number, number])).toBeCloseTo(
			expected,
			4
		);
		// The formula is symmetric.
		expect(deltaE2000(b as [number, number, number], a as [number, number, number])).toBeCloseTo(
			expected,
			4
		);
	});
});

describe('CIELAB from sRGB', () => {
	// IEC 61966-2-1 with D65: white is L* 100, black L* 0, and sRGB red is about (53.24, 80.09, 67.20)
	// (the value published with the sRGB standard's primaries; common practice in colour libraries).
	it('puts white, black and red where the standard does', () => {
		const white = rgbToLab([1, 1, 1]);
		expect(white[0]).toBeCloseTo(100, 2);
		expect(Math.abs(white[1]) + Math.abs(white[2])).toBeLessThan(0.01);
		expect(rgbToLab([0, 0, 0])[0]).toBeCloseTo(0, 6);
		const red = rgbToLab([1, 0, 0]);
		expect(red[0]).toBeCloseTo(53.24, 1);
		expect(red[1]).toBeCloseTo(80.09, 1);
		expect(red[2]).toBeCloseTo(67.2, 1);
	});
});

describe('the Machado 2009 simulation', () => {
	// Machado, Oliveira & Fernandes, IEEE TVCG 15(6) 2009: each matrix keeps neutral greys neutral
	// (its rows sum to 1), and with protanopia and deuteranopia red and green fall together.
	it('keeps white white and greys grey', () => {
		for (const matrix of Object.values(MACHADO_2009))
			for (const row of matrix) expect(row[0] + row[1] + row[2]).toBeCloseTo(1, 5);
		for (const deficiency of ['protanopia', 'deuteranopia', 'tritanopia'] as const) {
			const grey = simulate(hexToRgb('#808080'), deficiency);
			for (const c of grey) expect(c).toBeCloseTo(128 / 255, 3);
		}
	});

	it('makes a red and a green of equal lightness hard to tell apart, as the condition does', () => {
		const red = hexToRgb('#b05a3a');
		const green = hexToRgb('#6e7a30');
		const normal = deltaE2000(rgbToLab(red), rgbToLab(green));
		for (const deficiency of ['protanopia', 'deuteranopia'] as const) {
			const seen = deltaE2000(
				rgbToLab(simulate(red, deficiency)),
				rgbToLab(simulate(green, deficiency))
			);
			expect(seen).toBeLessThan(normal / 2);
		}
	});
});

describe('WCAG 2.x contrast', () => {
	// WCAG 2.2, "contrast ratio": black on white is 21:1; #767676 on white is 4.54:1 (the
	// lightest grey commonly quoted as passing 4.5:1).
	it('gives the published figures', () => {
		expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
		expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
		expect(contrastRatio('#ffffff', '#ffffff')).toBe(1);
	});
});

/**
 * The state palette, state by state. Threshold: CIEDE2000 ≥ 11 between every two states, with
 * normal colour vision and as simulated for protanopia and deuteranopia (Machado 2009,
 * severity 1.0) — several times a just-noticeable difference (ΔE00 ≈ 1–2), so small pins read
 * apart at a glance. Every state also has its own glyph shape (joint-state.test.ts).
 */
const MIN_DELTA_E = 11;
const palette = Object.fromEntries(JOINT_STATES.map((s) => [s, STATE_LOOKS[s].color]));

describe('the state palette', () => {
	for (const vision of ['normal', 'protanopia', 'deuteranopia'] as const) {
		it(`keeps every two states at least ΔE00 ${MIN_DELTA_E} apart (${vision})`, () => {
			for (let i = 0; i < JOINT_STATES.length; i++)
				for (let k = i + 1; k < JOINT_STATES.length; k++) {
					const [a, b] = [JOINT_STATES[i], JOINT_STATES[k]];
					const lab = (s: string) =>
						rgbToLab(
							vision === 'normal' ? hexToRgb(palette[s]) : simulate(hexToRgb(palette[s]), vision)
						);
					expect(deltaE2000(lab(a), lab(b)), `${a} / ${b}`).toBeGreaterThanOrEqual(MIN_DELTA_E);
				}
			expect(closestPair(palette, vision).deltaE).toBeGreaterThanOrEqual(MIN_DELTA_E);
		});
	}

	it('tells awaiting fit-up from ready to weld under deuteranopia (they were ΔE00 2.6 apart)', () => {
		const seen = (hex: string) => rgbToLab(simulate(hexToRgb(hex), 'deuteranopia'));
		expect(
			deltaE2000(seen(palette.awaiting_fitup), seen(palette.ready_to_weld))
		).toBeGreaterThanOrEqual(MIN_DELTA_E);
		expect(deltaE2000(seen('#5d6f86'), seen('#1d7585'))).toBeLessThan(3);
	});

	it('draws void marks at 3:1 or more against the white sheet (WCAG 2.x SC 1.4.11)', () => {
		expect(contrastRatio(STATE_LOOKS.void.color, '#ffffff')).toBeGreaterThanOrEqual(3);
	});

	it('draws every mark and its inner sign at 3:1 or more (WCAG 2.x SC 1.4.11)', () => {
		for (const state of JOINT_STATES) {
			const look = STATE_LOOKS[state];
			expect(contrastRatio(look.color, '#ffffff'), state).toBeGreaterThanOrEqual(3);
			if (look.glyph.filled)
				expect(contrastRatio(look.color, look.onColor), state).toBeGreaterThanOrEqual(3);
		}
	});
});
