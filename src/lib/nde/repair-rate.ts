/**
 * Repair rate, on the two bases a contract may name (trade practice: owners prefer the joint
 * basis, contractors the length basis), so both are shown, each with its basis in words. Pure.
 */

/** One weld (a joint's original weld, or one of its repairs) examined by NDE. */
export interface ExaminedWeld {
	/** Outside diameter in mm, or null where the joint has no pipe size (plate, structural). */
	diameterMm: number | null;
	rejected: boolean;
	/** Lengths of the indications rejected, in mm, where the report gives them. */
	indicationLengthsMm: readonly number[];
}

export interface RepairRate {
	examined: number;
	rejected: number;
	/** Rejected ÷ examined welds, 0 to 1; null before any is examined. */
	jointRate: number | null;
	/** Circumference of the welds examined that have a pipe size, in mm. */
	examinedMm: number;
	rejectedMm: number;
	/** Rejected ÷ examined length, 0 to 1; null when no sized weld is examined. */
	lengthRate: number | null;
	/** Welds examined without a pipe size, left out of the length basis. */
	unsized: number;
}

export const JOINT_BASIS =
	'Joint basis: welds rejected by NDE ÷ welds examined by NDE, each weld and each repair counted once.';
export const LENGTH_BASIS =
	'Length basis: length rejected ÷ length examined. A weld examined counts its circumference (π × outside diameter, ASME B36.10M sizes); a rejected weld counts the lengths of the indications rejected, or its whole circumference where none is recorded. Welds without a pipe size are left out.';

/** The weld's length examined: its circumference at the outside diameter. */
export function circumferenceMm(diameterMm: number): number {
	return Math.PI * diameterMm;
}

export function repairRate(welds: Iterable<ExaminedWeld>): RepairRate {
	let examined = 0;
	let rejected = 0;
	let examinedMm = 0;
	let rejectedMm = 0;
	let unsized = 0;
	for (const weld of welds) {
		examined++;
		if (weld.rejected) rejected++;
		if (weld.diameterMm == null || !(weld.diameterMm > 0)) {
			unsized++;
			continue;
		}
		const length = circumferenceMm(weld.diameterMm);
		examinedMm += length;
		if (weld.rejected) {
			const indications = weld.indicationLengthsMm.reduce((sum, l) => sum + l, 0);
			rejectedMm += indications > 0 ? Math.min(indications, length) : length;
		}
	}
	return {
		examined,
		rejected,
		jointRate: examined > 0 ? rejected / examined : null,
		examinedMm,
		rejectedMm,
		lengthRate: examinedMm > 0 ? rejectedMm / examinedMm : null,
		unsized
	};
}

/** `3.2 %`, or a dash before anything is examined. */
export function formatRate(rate: number | null): string {
	return rate == null ? '–' : `${(100 * rate).toFixed(1)} %`;
}
