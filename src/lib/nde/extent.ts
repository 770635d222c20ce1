/**
 * How much NDE a joint's lot needs: the extent the code of its criteria set asks (by method,
 * percent and kind of weld), unless the project's settings say otherwise, and how lots are
 * formed. Pure: the settings page, the lot page and the server all read it.
 *
 * The code's extent is a floor; owners often ask more, and the project's settings carry
 * their own figure per criteria set. Every figure here names its clause; a clause that rests
 * on a single source says "unconfirmed — check the clause" wherever it shows.
 */
import { NDE_METHODS, type NdeMethod } from '../joint-state';

export const WELD_KINDS = ['butt', 'fillet', 'socket', 'branch'] as const;
export type WeldKind = (typeof WELD_KINDS)[number];

export const LOT_GROUPINGS = ['line', 'system', 'drawing', 'week', 'welder', 'location'] as const;
export type LotGrouping = (typeof LOT_GROUPINGS)[number];

export const GROUPING_LABELS: Record<LotGrouping, string> = {
	line: 'Line',
	system: 'System / test pack',
	drawing: 'Drawing',
	week: 'Week welded',
	welder: 'Root welder',
	location: 'Shop / field'
};

/** One method at one extent, for the kinds of weld it covers. */
export interface Extent {
	method: NdeMethod;
	/** Percent of the lot's welds, 0 to 100; 100 examines every weld. */
	percent: number;
	kinds: WeldKind[];
}

/** What a code asks by default of the welds a criteria set judges. */
export interface CodeExtent {
	extents: Extent[];
	/** The code's words, short. */
	words: string;
	clause: string;
	/** False where the clause rests on a single source. */
	confirmed: boolean;
}

/** How a project forms its lots, and the extent it asks where it departs from the code. */
export interface LotRule {
	groupBy: LotGrouping;
	/** Every welder with welds in a lot is represented in its sample. */
	everyWelder: boolean;
	/** By criteria set id (built-in or the project's own): the extent that replaces the code's. */
	extents: Record<string, Extent[]>;
	/** Where requests for examination go: the NDE contractor's address. */
	contractorEmail: string;
}

const B31_3 = 'ASME B31.3-2018';

/** The code's own extent for the built-in criteria sets that set one. */
export const CODE_EXTENTS: Record<string, CodeExtent> = {
	'asme-b31.3-normal': {
		extents: [{ method: 'RT', percent: 5, kinds: ['butt'] }],
		words:
			'At least 5 % of circumferential butt and miter groove welds, fully examined by random RT or UT, with every welder represented in each lot',
		clause: `${B31_3} 341.4.1(b)(1)`,
		confirmed: true
	},
	'asme-b31.3-severe-cyclic': {
		extents: [{ method: 'RT', percent: 100, kinds: ['butt', 'branch'] }],
		words:
			'All circumferential butt and miter groove welds and fabricated branch connection welds, by RT or UT',
		clause: `${B31_3} 341.4.3(b)`,
		confirmed: false
	},
	'asme-b31.3-category-d': {
		extents: [],
		words: 'Visual examination only',
		clause: `${B31_3} 341.4.2`,
		confirmed: true
	}
};

/**
 * Category M fluid service has no criteria set of its own (its visual limits are those of
 * normal service), so a project marks its Category M welds with a set of its own and gives
 * it this extent in the settings.
 */
export const CATEGORY_M: CodeExtent = {
	extents: [{ method: 'RT', percent: 20, kinds: ['butt'] }],
	words: 'At least 20 % of circumferential butt and miter groove welds, by random RT or UT',
	clause: `${B31_3} M341.4`,
	confirmed: false
};

const NONE: CodeExtent = {
	extents: [],
	words: 'The code leaves the extent of NDE to the contract or the application standard',
	clause: '',
	confirmed: true
};

/** The extent the code of a built-in set asks, or none named. */
export function codeExtent(builtInId: string | undefined): CodeExtent {
	return (builtInId && CODE_EXTENTS[builtInId]) || NONE;
}

export const UNCONFIRMED = 'unconfirmed — check the clause';

/** The clause as a screen shows it. */
export function clauseWords(extent: CodeExtent): string {
	if (!extent.clause) return '';
	return extent.confirmed ? extent.clause : `${extent.clause} (${UNCONFIRMED})`;
}

/**
 * The extent for a joint judged by a criteria set: the project's figure for the set, else
 * for the set it was derived from (and so on), else the code's for the built-in set at the
 * root. `chain` runs from the joint's set to that built-in set.
 */
export function extentFor(rule: LotRule, chain: readonly string[]): Extent[] {
	for (const id of chain) {
		const own = rule.extents[id];
		if (own) return own;
	}
	return codeExtent(chain.at(-1)).extents;
}

/** The extents that apply to one weld of this kind. */
export function extentsForKind(extents: readonly Extent[], kind: string): Extent[] {
	return extents.filter((e) => e.percent > 0 && (e.kinds as readonly string[]).includes(kind));
}

/** Welds in the sample: the percent of the lot, rounded up (5 % of 21 welds is 2). */
export function requiredCount(welds: number, percent: number): number {
	if (welds <= 0 || percent <= 0) return 0;
	if (percent >= 100) return welds;
	// Work in hundredths of a percent so that 5 % of 20 is exactly 1, not 1.0000000000000002.
	return Math.ceil((welds * Math.round(percent * 100)) / 10_000);
}

const DEFAULT_RULE: LotRule = {
	groupBy: 'line',
	everyWelder: true,
	extents: {},
	contractorEmail: ''
};

function isMethod(value: unknown): value is NdeMethod {
	return typeof value === 'string' && (NDE_METHODS as readonly string[]).includes(value);
}

function cleanExtents(value: unknown): Extent[] {
	if (!Array.isArray(value)) return [];
	return value.flatMap((e) => {
		if (!e || typeof e !== 'object') return [];
		const { method, percent, kinds } = e as Record<string, unknown>;
		if (!isMethod(method) || typeof percent !== 'number' || !(percent >= 0 && percent <= 100))
			return [];
		const known = Array.isArray(kinds)
			? WELD_KINDS.filter((k) => (kinds as unknown[]).includes(k))
			: [];
		return [{ method, percent, kinds: known.length ? known : ['butt'] }];
	});
}

/**
 * The rule as stored, read safely: an older rule (`percent` per method for every joint, and
 * four groupings) still reads, its percent taken as the project's figure for B31.3 normal
 * service where it departs from the code's.
 */
export function readLotRule(stored: unknown): LotRule {
	if (!stored || typeof stored !== 'object') return { ...DEFAULT_RULE };
	const raw = stored as Record<string, unknown>;
	const groupBy = (LOT_GROUPINGS as readonly string[]).includes(raw.groupBy as string)
		? (raw.groupBy as LotGrouping)
		: DEFAULT_RULE.groupBy;
	const extents: Record<string, Extent[]> = {};
	if (raw.extents && typeof raw.extents === 'object') {
		for (const [id, list] of Object.entries(raw.extents as Record<string, unknown>))
			extents[id] = cleanExtents(list);
	} else if (raw.percent && typeof raw.percent === 'object') {
		const legacy = cleanExtents(
			Object.entries(raw.percent as Record<string, unknown>).map(([method, percent]) => ({
				method,
				percent,
				kinds: ['butt']
			}))
		).filter((e) => e.percent > 0);
		const code = CODE_EXTENTS['asme-b31.3-normal'].extents;
		const same =
			legacy.length === code.length &&
			legacy.every((e, i) => e.method === code[i].method && e.percent === code[i].percent);
		if (!same) extents['asme-b31.3-normal'] = legacy;
	}
	return {
		groupBy,
		everyWelder: raw.everyWelder !== false,
		extents,
		contractorEmail: typeof raw.contractorEmail === 'string' ? raw.contractorEmail : ''
	};
}

export function describeExtent(extents: readonly Extent[]): string {
	if (extents.length === 0) return 'none';
	return extents.map((e) => `${e.method} ${e.percent} % of ${e.kinds.join(', ')} welds`).join('; ');
}
