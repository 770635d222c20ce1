/**
 * Reads the joint and the readings as the API sends them: strings as typed (parsed with the
 * units module), numbers in mm or degrees, yes/no for flags. Every unreadable field is collected
 * as a ReadingError; blank fields count as not given.
 */
import { parseAngle, parseLength, type UnitSystem } from '../units';
import type { ParsedReadings } from './checks';
import {
	isReadingId,
	jointLengthFields,
	quantitySpec,
	readingDefinitions,
	type JointLengthField,
	type ReadingId
} from './readings';
import {
	flangeTypes,
	jointKinds,
	loadings,
	members,
	seams,
	stressDirections,
	type FlangeType,
	type JointInput,
	type JointKind,
	type Loading,
	type Member,
	type ReadReading,
	type ReadingUnit,
	type ReadingError,
	type ReadingsInput,
	type Seam,
	type StressDirection
} from './types';

export interface ResolvedJoint {
	kind: JointKind;
	loading?: Loading;
	member?: Member;
	stress?: StressDirection;
	seam?: Seam;
	flange?: FlangeType;
	lengths: Partial<Record<JointLengthField, number>>;
}

const isBlank = (value: unknown) =>
	value === undefined || value === null || (typeof value === 'string' && value.trim() === '');

export function oneOf<T extends string>(allowed: readonly T[], value: unknown): value is T {
	return typeof value === 'string' && (allowed as readonly string[]).includes(value);
}

function readChoice<T extends string>(
	field: 'loading' | 'member' | 'stress' | 'seam' | 'flange',
	allowed: readonly T[],
	value: unknown,
	errors: ReadingError[]
): T | undefined {
	if (isBlank(value)) return undefined;
	if (oneOf(allowed, value)) return value;
	errors.push({
		field: `joint.${field}`,
		message: `Joint ${field} must be one of ${allowed.join(', ')}`
	});
	return undefined;
}

export function readJoint(
	joint: JointInput,
	units: UnitSystem,
	errors: ReadingError[]
): ResolvedJoint | undefined {
	if (!oneOf(jointKinds, joint?.kind)) {
		errors.push({
			field: 'joint.kind',
			message: `Joint kind must be one of ${jointKinds.join(', ')}`
		});
		return undefined;
	}
	const resolved: ResolvedJoint = {
		kind: joint.kind,
		loading: readChoice('loading', loadings, joint.loading, errors),
		member: readChoice('member', members, joint.member, errors),
		stress: readChoice('stress', stressDirections, joint.stress, errors),
		seam: readChoice('seam', seams, joint.seam, errors),
		flange: readChoice('flange', flangeTypes, joint.flange, errors),
		lengths: {}
	};
	for (const field of jointLengthFields) {
		const value: unknown = joint[field];
		if (isBlank(value)) continue;
		const parsed =
			typeof value === 'string' || typeof value === 'number'
				? parseLength(value, { units, reading: quantitySpec(field) })
				: { ok: false as const, message: `Joint ${field} must be a length` };
		if (parsed.ok) resolved.lengths[field] = parsed.value;
		else errors.push({ field: `joint.${field}`, message: parsed.message });
	}
	// Pipe butt joints are girth welds: a longitudinal seam comes with the pipe, not the weld map.
	if (resolved.kind === 'butt' && !resolved.seam && resolved.lengths.diameter !== undefined) {
		resolved.seam = 'circumferential';
	}
	return resolved;
}

/** A joint as the records keep it: kind, and lengths in mm (null where not recorded). */
export interface JointRecord {
	kind: JointKind;
	thicknessMm?: number | null;
	requiredSizeMm?: number | null;
	diameterMm?: number | null;
}

/** What the engine is told of a recorded joint, the same on the card and on the server. */
export function jointInputOf(joint: JointRecord): JointInput {
	const input: JointInput = { kind: joint.kind };
	if (joint.thicknessMm != null) input.thickness = joint.thicknessMm;
	if (joint.requiredSizeMm != null) input.requiredSize = joint.requiredSizeMm;
	if (joint.diameterMm != null) input.diameter = joint.diameterMm;
	return input;
}

const YES = ['yes', 'y', 'true'];
const NO = ['no', 'n', 'false'];

function readFlag(value: unknown): boolean | undefined {
	const answer = typeof value === 'string' ? value.trim().toLowerCase() : value;
	if (typeof answer === 'boolean') return answer;
	if (typeof answer !== 'string') return undefined;
	return YES.includes(answer) ? true : NO.includes(answer) ? false : undefined;
}

export type ParsedReading =
	{ ok: true; value: number | boolean; unit: ReadingUnit } | { ok: false; message: string };

const COUNT = /^(\d+)(?:\s*(?:pores?|x))?$/;

function readCount(value: string | number, label: string, max: number): ParsedReading {
	const count =
		typeof value === 'number' ? value : Number(COUNT.exec(value.trim().toLowerCase())?.[1]);
	if (!Number.isInteger(count) || count < 0) {
		return { ok: false, message: `${label}: give a whole number, such as 0, 1 or 3` };
	}
	if (count > max) {
		return { ok: false, message: `${label}: ${count} is more than any plausible count (${max})` };
	}
	return { ok: true, value: count, unit: 'count' };
}

const ROUGHNESS =
	/^(?:ra\s*)?(\d+(?:[.,]\d*)?|[.,]\d+)\s*(µm|μm|um|microns?|µin|μin|uin|micro-?inch(?:es)?|microin)?(?:\s*ra)?$/;
const MICROINCH_IN_UM = 0.0254;

/**
 * A surface roughness as typed: `500 µin`, `12.5 µm`, `Ra 250`. A bare number is µin in an
 * imperial project and µm in a metric one; a JSON number is µm.
 */
function readRoughness(
	value: string | number,
	label: string,
	max: number,
	units: UnitSystem
): ParsedReading {
	let um: number;
	if (typeof value === 'number') um = value;
	else {
		const match = ROUGHNESS.exec(value.trim().toLowerCase());
		if (!match) {
			return {
				ok: false,
				message: `${label}: cannot read "${value}"; type it like 500 µin or 12.5 µm`
			};
		}
		const number = Number(match[1].replace(',', '.'));
		const unit = match[2];
		const inches = unit ? unit.includes('in') : units === 'imperial';
		um = inches ? number * MICROINCH_IN_UM : number;
	}
	if (!Number.isFinite(um) || um < 0) {
		return { ok: false, message: `${label}: cannot be negative or blank` };
	}
	if (um > max) {
		return {
			ok: false,
			message: `${label}: more than any plausible roughness (at most ${max} µm Ra)`
		};
	}
	return { ok: true, value: um, unit: 'um' };
}

/** One reading as typed, in the unit its limits use; the same reading the server stores. */
export function parseReading(id: ReadingId, value: unknown, units: UnitSystem): ParsedReading {
	const { kind, label, plausible } = readingDefinitions[id];
	if (kind === 'boolean') {
		const flag = readFlag(value);
		return flag === undefined
			? { ok: false, message: `${label}: answer yes or no` }
			: { ok: true, value: flag, unit: 'bool' };
	}
	if (typeof value !== 'string' && typeof value !== 'number') {
		const expected =
			kind === 'angle'
				? 'an angle'
				: kind === 'count'
					? 'a number'
					: kind === 'roughness'
						? 'a roughness'
						: 'a length';
		return { ok: false, message: `${label}: expected ${expected}, not yes/no` };
	}
	if (kind === 'count') return readCount(value, label, plausible?.max ?? Infinity);
	if (kind === 'roughness') return readRoughness(value, label, plausible?.max ?? Infinity, units);
	const result =
		kind === 'angle'
			? parseAngle(value, { reading: quantitySpec(id) })
			: parseLength(value, { units, reading: quantitySpec(id) });
	return result.ok
		? { ok: true, value: result.value, unit: kind === 'angle' ? 'deg' : 'mm' }
		: { ok: false, message: result.message };
}

/**
 * The reading as the record shows it: the text as typed, or for a JSON value its unit
 * written out, so that "1.6" reads the same in an inch project, where a bare 1.6 means inches.
 */
function typedText(value: unknown, unit: ReadingUnit): string {
	if (typeof value === 'boolean') return value ? 'yes' : 'no';
	if (typeof value !== 'number') return String(value);
	return unit === 'deg'
		? `${value}°`
		: unit === 'mm'
			? `${value} mm`
			: unit === 'um'
				? `${value} µm`
				: `${value}`;
}

/**
 * The readings given, parsed once: by id for the checks, and each as the record keeps it
 * (the text as typed beside its value). Unreadable ones are collected in `errors`.
 */
export function readReadings(
	readings: ReadingsInput,
	units: UnitSystem,
	errors: ReadingError[]
): { parsed: ParsedReadings; read: ReadReading[] } {
	const parsed: Partial<Record<ReadingId, number | boolean>> = {};
	const read: ReadReading[] = [];
	for (const [id, value] of Object.entries(readings ?? {})) {
		if (!isReadingId(id) || isBlank(value)) continue;
		const result = parseReading(id, value, units);
		if (!result.ok) {
			errors.push({ field: `readings.${id}`, message: result.message });
			continue;
		}
		parsed[id] = result.value;
		read.push({ id, text: typedText(value, result.unit), value: result.value, unit: result.unit });
	}
	return { parsed: parsed as ParsedReadings, read };
}
