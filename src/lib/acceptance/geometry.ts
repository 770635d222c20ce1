/**
 * Fillet and butt weld geometry, in millimetres. Terms as AWS A3.0 defines them: the size of a
 * fillet is the legs of the largest right triangle inscribed in its cross-section, and the
 * theoretical throat runs from the root to the hypotenuse of that triangle (zero root opening).
 */

/** sin 45°: the throat of an equal-leg fillet per unit of leg. */
export const EQUAL_LEG_THROAT_FACTOR = Math.SQRT1_2;

/** Theoretical throat a·b/√(a²+b²); equal legs give 0.7071 × leg. */
export function theoreticalThroat(leg1Mm: number, leg2Mm: number = leg1Mm): number {
	return (leg1Mm * leg2Mm) / Math.hypot(leg1Mm, leg2Mm);
}

/** Size of a concave fillet from its gauged throat: throat / 0.7071 (equal legs assumed). */
export function filletSizeFromThroat(throatMm: number): number {
	return throatMm / EQUAL_LEG_THROAT_FACTOR;
}

/** Throat the specified (equal-leg) fillet size should give. */
export function nominalThroat(requiredSizeMm: number): number {
	return requiredSizeMm * EQUAL_LEG_THROAT_FACTOR;
}

export interface FilletMeasurement {
	leg1Mm?: number;
	leg2Mm?: number;
	/** actual throat as gauged; governs the size of a concave fillet */
	throatMm?: number;
}

/**
 * The size a fillet can be credited with: the shorter leg, reduced to throat / 0.7071 when the
 * gauged throat shows the face is concave. Undefined when nothing was measured.
 */
export function filletSize({ leg1Mm, leg2Mm, throatMm }: FilletMeasurement): number | undefined {
	const candidates = [
		leg1Mm,
		leg2Mm,
		throatMm === undefined ? undefined : filletSizeFromThroat(throatMm)
	];
	const measured = candidates.filter((value): value is number => value !== undefined);
	return measured.length === 0 ? undefined : Math.min(...measured);
}

/** How far a fillet falls short of the required size; zero when it is full size or larger. */
export function filletUndersize(requiredSizeMm: number, actualSizeMm: number): number {
	return Math.max(0, requiredSizeMm - actualSizeMm);
}

/** Difference between the two legs of a fillet meant to be equal. */
export function legAsymmetry(leg1Mm: number, leg2Mm: number): number {
	return Math.abs(leg1Mm - leg2Mm);
}

/** Butt offset (hi-lo) as a share of the thickness it is judged against (0.1 = 10 %). */
export function offsetShareOfThickness(offsetMm: number, thicknessMm: number): number {
	return offsetMm / thicknessMm;
}
