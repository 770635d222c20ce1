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
	jointKinds,
	loadings,
	members,
	stressDirections,
	type JointInput,
	type JointKind,
	type Loading,
	type Member,
	type ReadReading,
	type ReadingError,
	type ReadingsInput,
	type StressDirection
} from './types';

export interface ResolvedJoint {
	kind: JointKind;
	loading?: Loading;
	member?: Member;
	stress?: StressDirection;
	lengths: Partial<Record<JointLengthField, number>>;
}

const isBlank = (value: unknown) =>
	value === undefined || value === null || (typeof value === 'string' && value.trim() === '');

export function oneOf<T extends string>(allowed: readonly T[], value: unknown): value is T {
	return typeof value === 'string' && (allowed as readonly string[]).includes(value);
}

function readChoice<T extends string>(
	field: 'loading' | 'member' | 'stress',
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
	return resolved;
}

const YES = ['yes', 'y', 'true'];
const NO = ['no', 'n', 'false'];

function readFlag(value: unknown): boolean | undefined {
	const answer = typeof value === 'string' ? value.trim().toLowerCase() : value;
	if (typeof answer === 'boolean') return answer;
	if (typeof answer !== 'string') return undefined;
	return YES.includes(answer) ? true : NO.includes(answer) ? false : undefined;
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
		const { kind, label } = readingDefinitions[id];
		const field = `readings.${id}`;
		if (kind === 'boolean') {
			const flag = readFlag(value);
			if (flag === undefined) errors.push({ field, message: `${label}: answer yes or no` });
			else {
				parsed[id] = flag;
				read.push({
					id,
					text: typeof value === 'boolean' ? (value ? 'yes' : 'no') : String(value),
					value: flag,
					unit: 'bool'
				});
			}
			continue;
		}
		if (typeof value !== 'string' && typeof value !== 'number') {
			const expected = kind === 'angle' ? 'an angle' : 'a length';
			errors.push({ field, message: `${label}: expected ${expected}, not yes/no` });
			continue;
		}
		const result =
			kind === 'angle'
				? parseAngle(value, { reading: quantitySpec(id) })
				: parseLength(value, { units, reading: quantitySpec(id) });
		if (!result.ok) {
			errors.push({ field, message: result.message });
			continue;
		}
		parsed[id] = result.value;
		const unit = kind === 'angle' ? 'deg' : 'mm';
		read.push({
			id,
			text: typeof value === 'number' ? `${value}${unit === 'deg' ? '°' : ' mm'}` : value,
			value: result.value,
			unit
		});
	}
	return { parsed: parsed as ParsedReadings, read };
}
