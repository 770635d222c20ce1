import type { PageJob } from './page';
import type { Rng } from '$lib/random';
import { SECTIONS, plate, type Plate, type Section } from './steel-data';

export type EndDetail = 'endPlate' | 'clip' | 'basePlate' | 'capPlate' | 'plain';
export type FeatureKind = 'stiffener' | 'splice' | 'gusset' | 'lug' | 'shearTab' | 'doubler';

export interface Feature {
	kind: FeatureKind;
	/** From the left end of the member, in mm. */
	x: number;
	added: boolean;
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
export const FEATURE_WELDS: Record<FeatureKind, number> = {
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
export function planMember(rng: Rng, job: PageJob): Member {
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
	const used = (k: FeatureKind) => features.filter((f) => f.kind === k && !f.added).length;
	const most: Record<FeatureKind, number> = {
		stiffener: job.target >= 22 ? 6 : 4,
		splice: kind === 'beam' ? 1 : 0,
		gusset: 3,
		lug: 2,
		shearTab: 4,
		doubler: 1
	};
	while (budget > 0) {
		let choice: FeatureKind;
		if (budget >= 3 && used('stiffener') < most.stiffener && rng.chance(0.55))
			choice = used('splice') < most.splice && rng.chance(0.15) ? 'splice' : 'stiffener';
		else {
			const open = singles.filter((k) => used(k) < most[k]);
			choice = open.length ? rng.pick(open) : 'stiffener';
		}
		if (FEATURE_WELDS[choice] > budget) {
			most[singles[0]] += 1;
			continue;
		}
		const x =
			takeSlot() ?? takeSlot(gap / 2) ?? (FEATURE_WELDS[choice] === 1 ? takeSlot(gap / 4) : null);
		if (x === null) break;
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
