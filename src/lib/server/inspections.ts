/** Inspection records: readings as typed and in mm or degrees, judged by the acceptance engine. */
import {
	evaluate,
	getCriteriaSet,
	isReadingId,
	readingDefinitions,
	type JointInput,
	type Stage
} from '$lib/acceptance';
import { parseAngle, parseLength, type UnitSystem } from '$lib/units';
import type { StoredReading } from './db/schema';

export type ReadingTexts = Record<string, string | boolean>;

/** Each reading with the text as typed and its value, as an inspection row keeps it. */
export function storedReadings(texts: ReadingTexts, units: UnitSystem): StoredReading[] {
	return Object.entries(texts)
		.filter(([id]) => isReadingId(id))
		.map(([id, raw]): StoredReading => {
			const definition = readingDefinitions[id as keyof typeof readingDefinitions];
			if (typeof raw === 'boolean')
				return { id, text: raw ? 'yes' : 'no', value: raw, unit: 'bool' };
			const parsed =
				definition.kind === 'angle'
					? parseAngle(raw, { reading: definition.id })
					: parseLength(raw, { units, reading: definition.id });
			return parsed.ok
				? { id, text: raw, value: parsed.value, unit: definition.kind === 'angle' ? 'deg' : 'mm' }
				: { id, text: raw, value: null, unit: null };
		});
}

/** The engine's verdict on a set of readings, in the shape an inspection row stores. */
export function judgeReadings(
	criteriaSetId: string,
	joint: JointInput,
	stage: Stage,
	texts: ReadingTexts,
	units: UnitSystem
) {
	const set = getCriteriaSet(criteriaSetId);
	if (!set) throw new Error(`Unknown criteria set ${criteriaSetId}`);
	const result = evaluate(set, joint, stage, texts, { units });
	if (!result.ok) {
		throw new Error(
			`Readings not readable: ${result.errors.map((e) => `${e.field}: ${e.message}`).join('; ')}`
		);
	}
	return {
		readings: storedReadings(texts, units),
		verdict: result.verdict,
		findings: result.findings,
		version: result.criteria.version
	};
}
