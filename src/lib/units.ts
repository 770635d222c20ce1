/**
 * Reading what inspectors type off their gauges, and writing it back the way they read it.
 * Lengths are held in millimetres and angles in degrees; 1 in = 25.4 mm exactly.
 */
import type { UnitSystem } from './domain';
export type { UnitSystem };
export type TypedUnit = 'in' | 'mm' | 'deg';

export const MM_PER_INCH = 25.4;

export type QuantityKind = 'length' | 'angle';

export interface PlausibleRange {
	/** mm for lengths, degrees for angles, µm Ra for roughness, a number for counts */
	min: number;
	max: number;
	/** true where zero means "no weld" or "no part" rather than a reading of nothing */
	minExclusive?: boolean;
}

/** What is being typed: its name in messages and the values that are plausible for it. */
export interface QuantitySpec {
	label: string;
	kind: QuantityKind;
	plausible: PlausibleRange;
}

export type ParsedQuantity =
	{ ok: true; value: number; text: string; unit: TypedUnit } | { ok: false; message: string };

export interface ParseOptions {
	/**
	 * the reading or joint field being typed (`quantitySpec(id)` from the acceptance readings):
	 * names it in messages and sets what is plausible
	 */
	reading?: QuantitySpec;
}

export interface LengthParseOptions extends ParseOptions {
	/** what a bare number means: inches (imperial) or millimetres (metric) */
	units: UnitSystem;
}

const UNICODE_FRACTIONS: Record<string, string> = {
	'½': '1/2',
	'¼': '1/4',
	'¾': '3/4',
	'⅛': '1/8',
	'⅜': '3/8',
	'⅝': '5/8',
	'⅞': '7/8'
};

const UNIT_SUFFIX = /^(.*?)\s*(mm|millimet(?:er|re)s?|in\.?|inch(?:es)?|"|°|deg\.?|degs|degrees?)$/;
const DECIMAL = /^(?:\d+(?:[.,]\d*)?|[.,]\d+)$/;
const FRACTION = /^(\d+)\/(\d+)$/;
const MIXED = /^(\d+)(?:\s+|\s*-\s*)(\d+)\/(\d+)$/;

function normalise(text: string): string {
	return text
		.trim()
		.replace(/[½¼¾⅛⅜⅝⅞]/g, (glyph) => ` ${UNICODE_FRACTIONS[glyph]}`)
		.replace(/⁄/g, '/')
		.replace(/[″“”]|''/g, '"')
		.replace(/º/g, '°')
		.replace(/[−–]/g, '-')
		.replace(/\s+/g, ' ')
		.trim()
		.toLowerCase();
}

function unitOf(suffix: string | undefined): TypedUnit | undefined {
	if (!suffix) return undefined;
	if (suffix.startsWith('m')) return 'mm';
	if (suffix === '"' || suffix.startsWith('in')) return 'in';
	return 'deg';
}

/** A plain number, a fraction or a mixed number (`37-1/2`, `1 1/4`); undefined when unreadable. */
function readNumber(text: string): number | undefined {
	if (DECIMAL.test(text)) return Number(text.replace(',', '.'));
	const fraction = FRACTION.exec(text);
	if (fraction) {
		const denominator = Number(fraction[2]);
		return denominator === 0 ? undefined : Number(fraction[1]) / denominator;
	}
	const mixed = MIXED.exec(text);
	if (mixed) {
		const numerator = Number(mixed[2]);
		const denominator = Number(mixed[3]);
		// "1-5/4" is a slip, not a mixed number
		if (denominator === 0 || numerator >= denominator) return undefined;
		return Number(mixed[1]) + numerator / denominator;
	}
	return undefined;
}

function specFor(kind: QuantityKind, reading: ParseOptions['reading']): QuantitySpec {
	if (reading) return reading;
	return {
		label: kind === 'length' ? 'Length' : 'Angle',
		kind,
		plausible: { min: 0, max: kind === 'length' ? Number.MAX_VALUE : 360 }
	};
}

function show(value: number, unit: TypedUnit): string {
	if (unit === 'deg') return formatAngle(value);
	return unit === 'in' ? formatBoth(value) : formatLength(value, 'metric');
}

function checkPlausible(
	value: number,
	spec: QuantitySpec,
	typed: { text: string; unit: TypedUnit; bare: boolean }
): ParsedQuantity {
	const { label, plausible } = spec;
	if (!Number.isFinite(value))
		return { ok: false, message: `${label}: "${typed.text}" is not a number` };
	if (value < 0) return { ok: false, message: `${label}: cannot be negative ("${typed.text}")` };
	if (plausible.minExclusive ? value <= plausible.min : value < plausible.min) {
		return { ok: false, message: `${label}: must be more than ${show(plausible.min, typed.unit)}` };
	}
	if (value > plausible.max) {
		const bare = typed.bare
			? `; a bare number is read as ${typed.unit === 'in' ? 'inches' : typed.unit === 'mm' ? 'millimetres' : 'degrees'}`
			: '';
		// "Undercut — total length in any 12 in (300 mm)" is named by what comes before the dash.
		const noun = label.split(' — ')[0].toLowerCase();
		return {
			ok: false,
			message: `${label}: ${show(value, typed.unit)} is more than any plausible ${noun} (at most ${show(plausible.max, typed.unit)})${bare}`
		};
	}
	return { ok: true, value, text: typed.text, unit: typed.unit };
}

function parseQuantity(
	input: string | number,
	kind: QuantityKind,
	bareUnit: TypedUnit,
	reading: ParseOptions['reading']
): ParsedQuantity {
	const spec = specFor(kind, reading);
	const machineUnit: TypedUnit = kind === 'length' ? 'mm' : 'deg';
	if (typeof input === 'number') {
		return checkPlausible(input, spec, { text: String(input), unit: machineUnit, bare: false });
	}
	const text = input.trim();
	if (text === '') return { ok: false, message: `${spec.label}: no value given` };

	const normalised = normalise(text);
	const suffix = UNIT_SUFFIX.exec(normalised);
	const typedUnit = unitOf(suffix?.[2]);
	const numberText = (suffix ? suffix[1] : normalised).trim();

	if (typedUnit && (typedUnit === 'deg') !== (kind === 'angle')) {
		const other = kind === 'length' ? 'an angle, not a length' : 'a length, not an angle';
		return { ok: false, message: `${spec.label}: "${text}" is ${other}` };
	}
	const negative = numberText.startsWith('-');
	const magnitude = readNumber(negative ? numberText.slice(1).trim() : numberText);
	if (magnitude === undefined) {
		const example =
			kind === 'length' ? '3/32, 1-1/4 in, .375in or 2.5 mm' : '37.5°, 37-1/2 deg or 30';
		return { ok: false, message: `${spec.label}: cannot read "${text}"; type it like ${example}` };
	}
	if (negative) return { ok: false, message: `${spec.label}: cannot be negative ("${text}")` };
	// Fractions are an inch habit: in a metric project "3/8" is far likelier inches than 0.375 mm.
	if (!typedUnit && bareUnit === 'mm' && numberText.includes('/')) {
		return {
			ok: false,
			message: `${spec.label}: "${text}" has no unit; type ${text} in, or the value in mm`
		};
	}

	const unit = typedUnit ?? bareUnit;
	const value = unit === 'in' ? magnitude * MM_PER_INCH : magnitude;
	return checkPlausible(value, spec, { text, unit, bare: typedUnit === undefined });
}

/**
 * Reads a length as typed (`3/8`, `3/8"`, `1-1/4 in`, `1 1/4"`, `.375in`, `9,5 mm`) into millimetres.
 * A bare number takes the project's unit system; a bare fraction in a metric project is refused
 * as ambiguous. A number (not a string) is already millimetres,
 * as the JSON API sends it, and is only checked for plausibility.
 */
export function parseLength(input: string | number, options: LengthParseOptions): ParsedQuantity {
	return parseQuantity(
		input,
		'length',
		options.units === 'imperial' ? 'in' : 'mm',
		options.reading
	);
}

/** Reads an angle (`37.5°`, `37-1/2 deg`, `30`) into degrees; a number is already degrees. */
export function parseAngle(input: string | number, options: ParseOptions = {}): ParsedQuantity {
	return parseQuantity(input, 'angle', 'deg', options.reading);
}

function greatestCommonDivisor(a: number, b: number): number {
	return b === 0 ? a : greatestCommonDivisor(b, a % b);
}

/** Inches to the nearest 1/64, reduced, as a mixed number: `3/8`, `1-1/4`, `2`. */
function inchFraction(mm: number): string {
	const sixtyFourths = Math.round((Math.abs(mm) / MM_PER_INCH) * 64);
	const sign = mm < 0 && sixtyFourths > 0 ? '-' : '';
	const whole = Math.floor(sixtyFourths / 64);
	const remainder = sixtyFourths % 64;
	if (remainder === 0) return `${sign}${whole}`;
	const divisor = greatestCommonDivisor(remainder, 64);
	const fraction = `${remainder / divisor}/${64 / divisor}`;
	return whole === 0 ? `${sign}${fraction}` : `${sign}${whole}-${fraction}`;
}

function millimetres(mm: number): string {
	const tenths = Math.round(mm * 10) / 10;
	return `${(tenths === 0 ? 0 : tenths).toFixed(1)} mm`;
}

/** `3/8"`, `1-1/4"` (nearest 1/64 in) or `9.5 mm` (nearest 0.1 mm). */
export function formatLength(mm: number, units: UnitSystem): string {
	return units === 'imperial' ? `${inchFraction(mm)}"` : millimetres(mm);
}

/** `3/8 in (9.5 mm)`, for limits and notes read by both camps. */
export function formatBoth(mm: number): string {
	return `${inchFraction(mm)} in (${millimetres(mm)})`;
}

/** `37.5°`, `45°` (nearest 0.1°). */
export function formatAngle(deg: number): string {
	const tenths = Math.round(deg * 10) / 10;
	return `${tenths === 0 ? 0 : tenths}°`;
}
