/**
 * How the state colours read for people with red-green colour vision deficiency, and how far
 * apart they stay. Pure, used by the palette test.
 *
 * - Simulation: Machado, Oliveira & Fernandes, "A Physiologically-based Model for Simulation
 *   of Color Vision Deficiency", IEEE TVCG 15(6):1291–1298, 2009; their matrices for
 *   severity 1.0 (protanopia, deuteranopia, tritanopia), applied to linear sRGB.
 * - Colour difference: CIEDE2000 (CIE 142-2001; ISO/CIE 11664-6:2014), implemented as in
 *   Sharma, Wu & Dalal, "The CIEDE2000 Color-Difference Formula: Implementation Notes,
 *   Supplementary Test Data, and Mathematical Observations", Color Res. Appl. 30(1), 2005.
 * - Contrast: WCAG 2.x relative luminance and contrast ratio (WCAG 2.2, definitions of
 *   "relative luminance" and "contrast ratio"; SC 1.4.11 asks 3:1 for graphics).
 */

export type Rgb = readonly [number, number, number];
export type Lab = readonly [number, number, number];
export type Deficiency = 'protanopia' | 'deuteranopia' | 'tritanopia';

type Matrix = readonly [Rgb, Rgb, Rgb];

/** Machado et al. 2009, severity 1.0. */
export const MACHADO_2009: Record<Deficiency, Matrix> = {
	protanopia: [
		[0.152286, 1.052583, -0.204868],
		[0.114503, 0.786281, 0.099216],
		[-0.003882, -0.048116, 1.051998]
	],
	deuteranopia: [
		[0.367322, 0.860646, -0.227968],
		[0.280085, 0.672501, 0.047413],
		[-0.01182, 0.04294, 0.968881]
	],
	tritanopia: [
		[1.255528, -0.076749, -0.178779],
		[-0.078411, 0.930809, 0.147602],
		[0.004733, 0.691367, 0.3039]
	]
};

/** `#rrggbb` → sRGB channels 0…1. */
export function hexToRgb(hex: string): Rgb {
	const m = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex.trim());
	if (!m) throw new Error(`Not a #rrggbb colour: ${hex}`);
	return [parseInt(m[1], 16) / 255, parseInt(m[2], 16) / 255, parseInt(m[3], 16) / 255];
}

/** sRGB transfer function (IEC 61966-2-1), encoded → linear. */
export function toLinear(c: number): number {
	return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function toEncoded(c: number): number {
	const v = Math.min(1, Math.max(0, c));
	return v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055;
}

/** The colour as seen with the deficiency (Machado 2009 on linear sRGB), back in sRGB. */
export function simulate(rgb: Rgb, deficiency: Deficiency): Rgb {
	const lin = rgb.map(toLinear);
	const m = MACHADO_2009[deficiency];
	const out = m.map((row) => row[0] * lin[0] + row[1] * lin[1] + row[2] * lin[2]);
	return [toEncoded(out[0]), toEncoded(out[1]), toEncoded(out[2])];
}

/** sRGB → CIELAB (D65 white, the sRGB matrix of IEC 61966-2-1). */
export function rgbToLab(rgb: Rgb): Lab {
	const [r, g, b] = rgb.map(toLinear);
	const x = (0.4124564 * r + 0.3575761 * g + 0.1804375 * b) / 0.95047;
	const y = 0.2126729 * r + 0.7151522 * g + 0.072175 * b;
	const z = (0.0193339 * r + 0.119192 * g + 0.9503041 * b) / 1.08883;
	const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t) / 116 + 16 / 116);
	const [fx, fy, fz] = [f(x), f(y), f(z)];
	return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

const deg = Math.PI / 180;

/** CIEDE2000 colour difference with kL = kC = kH = 1 (Sharma et al. 2005, eqs. 1–22). */
export function deltaE2000(lab1: Lab, lab2: Lab): number {
	const [L1, a1, b1] = lab1;
	const [L2, a2, b2] = lab2;
	const C1 = Math.hypot(a1, b1);
	const C2 = Math.hypot(a2, b2);
	const Cbar7 = ((C1 + C2) / 2) ** 7;
	const G = 0.5 * (1 - Math.sqrt(Cbar7 / (Cbar7 + 25 ** 7)));
	const a1p = (1 + G) * a1;
	const a2p = (1 + G) * a2;
	const C1p = Math.hypot(a1p, b1);
	const C2p = Math.hypot(a2p, b2);
	const hue = (b: number, a: number) => {
		if (a === 0 && b === 0) return 0;
		const h = Math.atan2(b, a) / deg;
		return h < 0 ? h + 360 : h;
	};
	const h1p = hue(b1, a1p);
	const h2p = hue(b2, a2p);
	const dLp = L2 - L1;
	const dCp = C2p - C1p;
	let dhp = 0;
	if (C1p * C2p !== 0) {
		dhp = h2p - h1p;
		if (dhp > 180) dhp -= 360;
		else if (dhp < -180) dhp += 360;
	}
	const dHp = 2 * Math.sqrt(C1p * C2p) * Math.sin((dhp / 2) * deg);
	const Lbarp = (L1 + L2) / 2;
	const Cbarp = (C1p + C2p) / 2;
	let hbarp = h1p + h2p;
	if (C1p * C2p !== 0) {
		if (Math.abs(h1p - h2p) <= 180) hbarp = (h1p + h2p) / 2;
		else if (h1p + h2p < 360) hbarp = (h1p + h2p + 360) / 2;
		else hbarp = (h1p + h2p - 360) / 2;
	}
	const T =
		1 -
		0.17 * Math.cos((hbarp - 30) * deg) +
		0.24 * Math.cos(2 * hbarp * deg) +
		0.32 * Math.cos((3 * hbarp + 6) * deg) -
		0.2 * Math.cos((4 * hbarp - 63) * deg);
	const dTheta = 30 * Math.exp(-(((hbarp - 275) / 25) ** 2));
	const Cbarp7 = Cbarp ** 7;
	const Rc = 2 * Math.sqrt(Cbarp7 / (Cbarp7 + 25 ** 7));
	const Sl = 1 + (0.015 * (Lbarp - 50) ** 2) / Math.sqrt(20 + (Lbarp - 50) ** 2);
	const Sc = 1 + 0.045 * Cbarp;
	const Sh = 1 + 0.015 * Cbarp * T;
	const Rt = -Math.sin(2 * dTheta * deg) * Rc;
	return Math.sqrt(
		(dLp / Sl) ** 2 + (dCp / Sc) ** 2 + (dHp / Sh) ** 2 + Rt * (dCp / Sc) * (dHp / Sh)
	);
}

/** WCAG 2.x relative luminance of an sRGB colour. */
export function relativeLuminance(rgb: Rgb): number {
	// WCAG 2.x states the threshold 0.03928; the difference from 0.04045 is below 8-bit steps.
	const [r, g, b] = rgb.map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
	return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.x contrast ratio, 1…21. */
export function contrastRatio(a: string, b: string): number {
	const la = relativeLuminance(hexToRgb(a));
	const lb = relativeLuminance(hexToRgb(b));
	return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}

/** The closest pair of colours as seen with `vision`, by CIEDE2000. */
export function closestPair(
	colours: Record<string, string>,
	vision: Deficiency | 'normal'
): { a: string; b: string; deltaE: number } {
	const names = Object.keys(colours);
	const lab = (name: string) => {
		const rgb = hexToRgb(colours[name]);
		return rgbToLab(vision === 'normal' ? rgb : simulate(rgb, vision));
	};
	let best = { a: '', b: '', deltaE: Infinity };
	for (let i = 0; i < names.length; i++)
		for (let k = i + 1; k < names.length; k++) {
			const deltaE = deltaE2000(lab(names[i]), lab(names[k]));
			if (deltaE < best.deltaE) best = { a: names[i], b: names[k], deltaE };
		}
	return best;
}
