import type { Pen, Pt } from './pen';
import type { DemoSheetSpec, DemoWeld } from './types';

/** A weld as a page generator reports it, in sheet space (before the page rotation). */
export interface SheetWeld {
	number: string;
	kind: DemoWeld['kind'];
	location: DemoWeld['location'];
	at: Pt;
	sizeText: string;
	thicknessText: string;
}

export interface PageJob {
	pen: Pen;
	spec: DemoSheetSpec;
	pageIndex: number;
	pageCount: number;
	width: number;
	height: number;
	/** Welds this page should carry in the first issue. */
	target: number;
	/** Number of the first weld on this page: numbering runs on over the sheets. */
	firstNumber: number;
	variant: number;
}

export interface PageOutcome {
	welds: SheetWeld[];
	nextNumber: number;
}

/**
 * Joints added by a revision take the number before them plus a letter (5A, 5B) so existing
 * numbers never move; R and M are kept for repairs and modifications.
 */
export function numberInFlowOrder(
	added: boolean[],
	first: number
): { labels: string[]; next: number } {
	const letters = 'ABCDEFGHJKLNPQSTUVWXYZ';
	let n = first - 1;
	let suffix = 0;
	const labels = added.map((isAdded) => {
		if (!isAdded) {
			n += 1;
			suffix = 0;
			return String(n);
		}
		const label = `${Math.max(n, 1)}${letters[suffix % letters.length]}`;
		suffix += 1;
		return label;
	});
	return { labels, next: n + 1 };
}

export function splitTarget(total: number, pages: number, lo: number, hi: number): number[] {
	const out: number[] = [];
	let left = Math.max(total, lo * pages);
	for (let i = 0; i < pages; i++) {
		const share = Math.round(left / (pages - i));
		const v = Math.max(lo, Math.min(hi, share));
		out.push(v);
		left -= v;
	}
	return out;
}
