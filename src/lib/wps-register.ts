/**
 * The WPS register's rules, pure: a WPS as typed (the same fields on the form, in the API and
 * in a CSV line) read into the stored record, every problem named by its field; the joint
 * design the acceptance engine judges a fit-up against; and whether a joint lies inside the
 * ranges the WPS qualifies (thickness, diameter, base-metal group) and a weld's processes are
 * the WPS's own.
 */
import type { UnitSystem } from './domain';
import type { WpsJointDesign } from './acceptance/types';
import { normalProcess, processCovered } from './processes';
import { parseAngle, parseLength, formatAngle, formatLength, type QuantitySpec } from './units';

export const WPS_STATUSES = ['draft', 'approved', 'superseded'] as const;
export type WpsStatus = (typeof WPS_STATUSES)[number];
export const WPS_STATUS_LABELS: Record<WpsStatus, string> = {
	draft: 'Draft',
	approved: 'Approved',
	superseded: 'Superseded'
};

/** Every field of a WPS as typed, in the order of the form and of the CSV template's columns. */
export const WPS_FIELDS = [
	'number',
	'revision',
	'status',
	'title',
	'processes',
	'materialGroups',
	'thicknessMin',
	'thicknessMax',
	'diameterMin',
	'diameterMax',
	'grooveType',
	'rootOpeningMin',
	'rootOpeningMax',
	'rootFaceMin',
	'rootFaceMax',
	'bevelAngleMin',
	'bevelAngleMax',
	'preheatMin',
	'interpassMax',
	'fillerClasses',
	'pqrs'
] as const;
export type WpsField = (typeof WPS_FIELDS)[number];
export type WpsTyped = Record<WpsField, string>;

/** The screens' and the CSV template's words for each field. */
export const WPS_FIELD_LABELS: Record<WpsField, string> = {
	number: 'WPS number',
	revision: 'Revision',
	status: 'Status',
	title: 'Title',
	processes: 'Processes',
	materialGroups: 'Base-metal groups',
	thicknessMin: 'Thickness min',
	thicknessMax: 'Thickness max',
	diameterMin: 'Diameter min',
	diameterMax: 'Diameter max',
	grooveType: 'Groove',
	rootOpeningMin: 'Root opening min',
	rootOpeningMax: 'Root opening max',
	rootFaceMin: 'Root face min',
	rootFaceMax: 'Root face max',
	bevelAngleMin: 'Bevel angle min',
	bevelAngleMax: 'Bevel angle max',
	preheatMin: 'Preheat min',
	interpassMax: 'Interpass max',
	fillerClasses: 'Filler classes',
	pqrs: 'PQRs'
};

export const emptyWps = (): WpsTyped =>
	Object.fromEntries(WPS_FIELDS.map((field) => [field, ''])) as WpsTyped;

/** One end of a range: the value in mm or degrees and the text as typed. */
export interface WpsBound {
	value: number;
	text: string;
}
/** A range the WPS qualifies; an open end (no limit that way) is null. */
export interface WpsRange {
	min: WpsBound | null;
	max: WpsBound | null;
}
export const RANGE_IDS = [
	'thickness',
	'diameter',
	'rootOpening',
	'rootFace',
	'bevelAngle'
] as const;
export type WpsRangeId = (typeof RANGE_IDS)[number];
export type WpsRanges = Partial<Record<WpsRangeId, WpsRange>>;

/** A temperature in °C with the text as typed (°F in an imperial project's bare numbers). */
export interface WpsTemperature {
	celsius: number;
	text: string;
}

/** A WPS as stored, without its row's id, project and version. */
export interface WpsRecord {
	number: string;
	revision: string;
	status: WpsStatus;
	title: string;
	processes: string[];
	materialGroups: string[];
	ranges: WpsRanges;
	grooveType: string;
	preheatMin: WpsTemperature | null;
	interpassMax: WpsTemperature | null;
	fillerClasses: string[];
	pqrs: string[];
}

export interface WpsProblem {
	field: WpsField;
	message: string;
}

export type WpsRead = { ok: true; record: WpsRecord } | { ok: false; problems: WpsProblem[] };

/** A list as typed: `GTAW, SMAW`, `GTAW/SMAW`, `P1; P8` or one item a line. */
export function splitList(value: string): string[] {
	return value
		.split(/[,;/\n]+/)
		.map((item) => item.trim())
		.filter(Boolean);
}

/** `P1`, `P-No. 1`, `p 8` → `P1`, `P8`; ISO/TR 15608 groups (`1.1`, `8`) and other text as typed. */
export function normalGroup(group: string): string {
	const p = /^P\s*-?\s*(?:No\.?\s*)?(\d{1,2}[A-C]?)$/i.exec(group.trim());
	return p ? `P${p[1].toUpperCase()}` : group.trim();
}

const SPECS: Record<Exclude<WpsRangeId, 'bevelAngle'>, QuantitySpec> = {
	thickness: { label: 'Thickness', kind: 'length', plausible: { min: 0, max: 1000 } },
	diameter: { label: 'Diameter', kind: 'length', plausible: { min: 0, max: 10000 } },
	rootOpening: { label: 'Root opening', kind: 'length', plausible: { min: 0, max: 100 } },
	rootFace: { label: 'Root face', kind: 'length', plausible: { min: 0, max: 100 } }
};
const BEVEL: QuantitySpec = { label: 'Bevel angle', kind: 'angle', plausible: { min: 0, max: 90 } };

/** A temperature as typed: `10`, `10 °C`, `50F`, `300 °F`; a bare number takes the project's units. */
export function parseTemperature(
	input: string,
	units: UnitSystem
): { ok: true; value: WpsTemperature } | { ok: false; message: string } {
	const text = input.trim();
	const match = /^(-?\d+(?:[.,]\d+)?)\s*(?:°|º|deg\.?\s*)?\s*([CF])?$/i.exec(text);
	if (!match) return { ok: false, message: `cannot read "${text}"; type it like 10 °C or 50 °F` };
	const number = Number(match[1].replace(',', '.'));
	const scale = match[2]?.toUpperCase() ?? (units === 'imperial' ? 'F' : 'C');
	const celsius = scale === 'F' ? ((number - 32) * 5) / 9 : number;
	if (celsius < -60 || celsius > 1000) {
		return { ok: false, message: `${text} is not a plausible welding temperature` };
	}
	return { ok: true, value: { celsius: Math.round(celsius * 10) / 10, text } };
}

/** A temperature in the project's scale first: `50 °F (10 °C)` or `10 °C (50 °F)`. */
export function showTemperature(t: WpsTemperature, units: UnitSystem): string {
	const fahrenheit = `${Math.round((t.celsius * 9) / 5 + 32)} °F`;
	const celsius = `${Math.round(t.celsius)} °C`;
	return units === 'imperial' ? `${fahrenheit} (${celsius})` : `${celsius} (${fahrenheit})`;
}

function readRange(
	id: WpsRangeId,
	typed: WpsTyped,
	units: UnitSystem,
	problems: WpsProblem[],
	bothEnds: boolean
): WpsRange | undefined {
	const minField = `${id}Min` as WpsField;
	const maxField = `${id}Max` as WpsField;
	const ends = [typed[minField].trim(), typed[maxField].trim()];
	if (ends.every((end) => end === '')) return undefined;
	const read = (text: string, field: WpsField): WpsBound | null | undefined => {
		if (text === '') {
			if (bothEnds) {
				problems.push({
					field,
					message: `${WPS_FIELD_LABELS[field]}: give both ends of the range`
				});
				return undefined;
			}
			return null;
		}
		const parsed =
			id === 'bevelAngle'
				? parseAngle(text, { reading: BEVEL })
				: parseLength(text, { units, reading: SPECS[id] });
		if (!parsed.ok) {
			problems.push({ field, message: parsed.message });
			return undefined;
		}
		return { value: parsed.value, text: parsed.text };
	};
	const min = read(ends[0], minField);
	const max = read(ends[1], maxField);
	if (min === undefined || max === undefined) return undefined;
	if (min && max && min.value > max.value) {
		problems.push({
			field: minField,
			message: `${WPS_FIELD_LABELS[minField]} (${min.text}) is more than the max (${max.text})`
		});
		return undefined;
	}
	return { min, max };
}

/** A WPS as typed, read in the project's units; every problem named by its field. */
export function readWps(typed: WpsTyped, units: UnitSystem): WpsRead {
	const problems: WpsProblem[] = [];
	const number = typed.number.trim();
	const revision = typed.revision.trim();
	if (!number) problems.push({ field: 'number', message: 'Give the WPS number.' });
	if (!revision)
		problems.push({ field: 'revision', message: 'Give the revision (0 for the first).' });
	const statusText = typed.status.trim().toLowerCase() || 'draft';
	const status = WPS_STATUSES.find((s) => s === statusText);
	if (!status) {
		problems.push({ field: 'status', message: `Status is one of ${WPS_STATUSES.join(', ')}.` });
	}
	const processes: string[] = [];
	for (const item of splitList(typed.processes)) {
		const name = normalProcess(item);
		if (!name) {
			problems.push({
				field: 'processes',
				message: `Cannot read the process "${item}": give its letters (GTAW, SMAW, GMAW, FCAW, SAW …) or ISO 4063 number.`
			});
		} else if (!processes.includes(name)) processes.push(name);
	}
	if (processes.length === 0 && !problems.some((p) => p.field === 'processes')) {
		problems.push({
			field: 'processes',
			message: 'Give the process or processes, such as GTAW/SMAW.'
		});
	}
	const ranges: WpsRanges = {};
	for (const id of RANGE_IDS) {
		const bothEnds = id !== 'thickness' && id !== 'diameter';
		const range = readRange(id, typed, units, problems, bothEnds);
		if (range) ranges[id] = range;
	}
	const temperature = (field: 'preheatMin' | 'interpassMax') => {
		const text = typed[field].trim();
		if (!text) return null;
		const parsed = parseTemperature(text, units);
		if (!parsed.ok) {
			problems.push({ field, message: `${WPS_FIELD_LABELS[field]}: ${parsed.message}` });
			return null;
		}
		return parsed.value;
	};
	const preheatMin = temperature('preheatMin');
	const interpassMax = temperature('interpassMax');
	if (preheatMin && interpassMax && preheatMin.celsius > interpassMax.celsius) {
		problems.push({
			field: 'interpassMax',
			message: `The interpass max (${interpassMax.text}) is below the preheat min (${preheatMin.text}).`
		});
	}
	if (problems.length > 0 || !status) return { ok: false, problems };
	return {
		ok: true,
		record: {
			number,
			revision,
			status,
			title: typed.title.trim(),
			processes,
			materialGroups: [...new Set(splitList(typed.materialGroups).map(normalGroup))],
			ranges,
			grooveType: typed.grooveType.trim(),
			preheatMin,
			interpassMax,
			fillerClasses: splitList(typed.fillerClasses.replace(/\//g, ',')),
			pqrs: splitList(typed.pqrs.replace(/\//g, ','))
		}
	};
}

/** The stored record back as the form and the CSV write it (texts as they were typed). */
export function typedOf(record: WpsRecord): WpsTyped {
	const typed = emptyWps();
	typed.number = record.number;
	typed.revision = record.revision;
	typed.status = record.status;
	typed.title = record.title;
	typed.processes = record.processes.join(', ');
	typed.materialGroups = record.materialGroups.join('; ');
	for (const id of RANGE_IDS) {
		const range = record.ranges[id];
		typed[`${id}Min` as WpsField] = range?.min?.text ?? '';
		typed[`${id}Max` as WpsField] = range?.max?.text ?? '';
	}
	typed.grooveType = record.grooveType;
	typed.preheatMin = record.preheatMin?.text ?? '';
	typed.interpassMax = record.interpassMax?.text ?? '';
	typed.fillerClasses = record.fillerClasses.join('; ');
	typed.pqrs = record.pqrs.join('; ');
	return typed;
}

/** `WPS-CS-01 rev 2`, as lists and the weld log name a WPS. */
export const wpsLabel = (wps: Pick<WpsRecord, 'number' | 'revision'>) =>
	`${wps.number} rev ${wps.revision}`;

/** The joint design the acceptance engine judges a fit-up against (mm and degrees). */
export function jointDesign(
	record: Pick<WpsRecord, 'number' | 'revision' | 'ranges'>
): WpsJointDesign {
	const design: WpsJointDesign = { number: record.number, revision: record.revision };
	for (const id of ['rootOpening', 'rootFace', 'bevelAngle'] as const) {
		const range = record.ranges[id];
		if (range?.min && range.max) design[id] = { min: range.min.value, max: range.max.value };
	}
	return design;
}

/** A range as shown: `1.6 mm – 3.2 mm`, `from 2"`, `up to 19.1 mm`. */
export function showRange(id: WpsRangeId, range: WpsRange | undefined, units: UnitSystem): string {
	if (!range) return '';
	const show = (bound: WpsBound) =>
		id === 'bevelAngle' ? formatAngle(bound.value) : formatLength(bound.value, units);
	if (range.min && range.max) return `${show(range.min)} – ${show(range.max)}`;
	if (range.min) return `from ${show(range.min)}`;
	return range.max ? `up to ${show(range.max)}` : '';
}

// Base-metal groups of common specifications ------------------------------------------------

/**
 * Specifications to their base-metal group, so a joint's material as written on the drawing
 * can be checked against the WPS's groups. ASME P-numbers from ASME BPVC Section IX (2023)
 * QW/QB-422; ISO/TR 15608:2017 groups from its Table 1 by specified minimum yield strength
 * (group 1.1 up to 275 MPa, 1.2 over 275 up to 360 MPa). A material none of these name has
 * no group here, and the joint is not flagged for it.
 */
const MATERIAL_GROUPS: readonly { pattern: RegExp; group: string }[] = [
	{ pattern: /\bA\s?106\b/i, group: 'P1' },
	{ pattern: /\bA\s?53\b/i, group: 'P1' },
	{ pattern: /\bA\s?105\b/i, group: 'P1' },
	{ pattern: /\bA\s?234\b.*\bWPB\b/i, group: 'P1' },
	{ pattern: /\bA\s?333\b/i, group: 'P1' },
	{ pattern: /\bA\s?516\b/i, group: 'P1' },
	{ pattern: /\bA\s?36\b/i, group: 'P1' },
	{ pattern: /\bA\s?572\b/i, group: 'P1' },
	// unconfirmed — check the clause: A992 listed as P-No. 1 in recent editions of QW/QB-422
	{ pattern: /\bA\s?992\b/i, group: 'P1' },
	{ pattern: /\bA\s?(312|358|403)\b.*\b(TP)?3(04|16)L?\b/i, group: 'P8' },
	{ pattern: /\bA\s?335\b.*\bP11\b/i, group: 'P4' },
	{ pattern: /\bA\s?335\b.*\bP22\b/i, group: 'P5A' },
	{ pattern: /\bP2(35|65)GH\b/i, group: '1.1' },
	{ pattern: /\bS2(35|75)/i, group: '1.1' },
	{ pattern: /\bP355/i, group: '1.2' },
	{ pattern: /\bS355/i, group: '1.2' }
];

/** The group a joint's material text names or belongs to, or null when unknown here. */
export function materialGroup(material: string): string | null {
	const own = normalGroup(material);
	if (/^P\d{1,2}[A-C]?$/.test(own)) return own;
	return MATERIAL_GROUPS.find(({ pattern }) => pattern.test(material))?.group ?? null;
}

// Range flags --------------------------------------------------------------------------------

export interface WpsRangeFlag {
	field: 'thickness' | 'diameter' | 'material';
	message: string;
}

export interface JointRanges {
	thicknessMm: number | null;
	diameterMm: number | null;
	material: string;
}

/**
 * Where a joint lies outside what the WPS qualifies: thickness, outside diameter (pipe) or
 * base-metal group. A value the joint does not give is not flagged.
 */
export function rangeFlags(
	wps: Pick<WpsRecord, 'number' | 'revision' | 'ranges' | 'materialGroups'>,
	joint: JointRanges,
	units: UnitSystem
): WpsRangeFlag[] {
	const flags: WpsRangeFlag[] = [];
	const name = `WPS ${wpsLabel(wps)}`;
	const check = (field: 'thickness' | 'diameter', value: number | null, noun: string) => {
		const range = wps.ranges[field];
		if (value === null || !range) return;
		if ((range.min && value < range.min.value) || (range.max && value > range.max.value)) {
			flags.push({
				field,
				message: `${noun} ${formatLength(value, units)} is outside ${name} (${showRange(field, range, units)}).`
			});
		}
	};
	check('thickness', joint.thicknessMm, 'Thickness');
	check('diameter', joint.diameterMm, 'Diameter');
	const groups = wps.materialGroups.map(normalGroup);
	const material = joint.material.trim();
	if (groups.length > 0 && material) {
		const group = materialGroup(material);
		const named = groups.some((g) => material.toLowerCase().includes(g.toLowerCase()));
		if (group && !named && !groups.includes(group)) {
			flags.push({
				field: 'material',
				message: `Material ${material} (group ${group}) is not among the groups of ${name} (${groups.join(', ')}).`
			});
		}
	}
	return flags;
}

/** The processes of a weld the WPS does not list, for the refusal's message. */
export function unlistedProcesses(
	wps: Pick<WpsRecord, 'processes'>,
	used: readonly string[]
): string[] {
	return [...new Set(used)].filter((process) => !processCovered(wps.processes, process));
}
