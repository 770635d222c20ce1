/**
 * evaluate(set, joint, stage, readings, options) gives the verdict for one inspection. With
 * `options.wps`, a fit-up is also judged against the joint design of the joint's WPS.
 *
 * Unreadable input is returned, not thrown: `{ ok: false, errors: [{ field, message }] }` with
 * `field` a path such as `readings.rootOpening` or `joint.thickness`, which the API turns into
 * 400 `{ error, field }`. Otherwise `{ ok: true, verdict, criteria, findings, missing, missingJoint, derived }`.
 *
 * The verdict is `outside` if any finding is outside; otherwise `judge` if any finding needs the
 * inspector, a reading or joint field the checks need is missing, or nothing could be checked;
 * otherwise `within`. It is an aid: acceptance rests with a qualified inspector.
 */
import type { UnitSystem } from '../units';
import {
	checkDefinitions,
	type CheckContext,
	type CheckDefinition,
	type Measurement,
	type ParsedReadings
} from './checks';
import {
	filletSize,
	filletUndersize,
	legAsymmetry,
	nominalThroat,
	offsetShareOfThickness,
	theoreticalThroat
} from './geometry';
import {
	mergeScenarios,
	newTrace,
	quantity,
	TOLERANCE,
	type LimitContext,
	type ScenarioResult,
	type Trace
} from './limits';
import { oneOf, readJoint, readReadings, type ResolvedJoint } from './inputs';
import { readingIds, type ReadingId } from './readings';
import { describeLength, judgeRule, type RuleResult } from './rules';
import { wpsErrors, wpsFindings, wpsSettles } from './wps';
import {
	checkIds,
	stages,
	type CheckId,
	type CriteriaSet,
	type Derived,
	type EvaluateOptions,
	type EvaluationResult,
	type Finding,
	type JointField,
	type JointInput,
	type Limit,
	type ReadingError,
	type ReadingsInput,
	type Stage
} from './types';

function deriveValues(joint: ResolvedJoint, readings: ParsedReadings): Derived {
	const derived: Derived = {};
	// The joint's nominal thickness governs; the fit-up wall reading stands in when it is not recorded.
	const thickness = joint.lengths.thickness ?? readings.wallThickness;
	const { requiredSize, diameter, socketWall } = joint.lengths;
	// A girth weld runs once round the pipe: its length is the circumference.
	const girth =
		joint.lengths.weldLength === undefined && joint.seam === 'circumferential' && diameter
			? Math.PI * diameter
			: undefined;
	const weldLength = joint.lengths.weldLength ?? girth;
	if (diameter !== undefined) derived.diameterMm = diameter;
	if (socketWall !== undefined) derived.socketWallMm = socketWall;
	if (girth !== undefined) derived.girthLengthMm = girth;
	const { filletLeg1: leg1, filletLeg2: leg2, throat, misalignment } = readings;
	if (thickness !== undefined) derived.thicknessMm = thickness;
	if (requiredSize !== undefined) derived.requiredSizeMm = requiredSize;
	if (weldLength !== undefined) derived.weldLengthMm = weldLength;

	const anyLeg = leg1 ?? leg2;
	if (anyLeg !== undefined)
		derived.theoreticalThroatMm = theoreticalThroat(leg1 ?? anyLeg, leg2 ?? anyLeg);
	const size = filletSize({ leg1Mm: leg1, leg2Mm: leg2, throatMm: throat });
	if (size !== undefined) derived.filletSizeMm = size;
	if (requiredSize !== undefined) {
		const nominal = nominalThroat(requiredSize);
		derived.nominalThroatMm = nominal;
		if (size !== undefined) derived.undersizeMm = filletUndersize(requiredSize, size);
		const actualThroat = throat ?? derived.theoreticalThroatMm;
		if (actualThroat !== undefined) {
			derived.throatShortfallMm = Math.max(0, nominal - actualThroat);
			derived.throatExcessMm = Math.max(0, actualThroat - nominal);
		}
	}
	if (leg1 !== undefined && leg2 !== undefined) derived.legAsymmetryMm = legAsymmetry(leg1, leg2);
	if (misalignment !== undefined && thickness !== undefined) {
		derived.misalignmentShareOfThickness = offsetShareOfThickness(misalignment, thickness);
	}
	return derived;
}

const UNKNOWN_NAMES: Record<string, string> = {
	thickness: 'the thickness',
	faceWidth: 'the face width',
	rootWidth: 'the root bead width',
	rootOpening: 'the root opening',
	requiredSize: 'the required fillet size',
	nominalThroat: 'the required fillet size',
	weldLength: 'the weld length',
	diameter: 'the outside diameter',
	socketWall: 'the socket wall or hub thickness',
	member: 'the member (primary or secondary)',
	stress: 'the stress direction',
	loading: 'the loading',
	seam: 'whether the weld is a plate or longitudinal seam or a girth weld'
};

/** Bases that are readings rather than joint data. */
const READING_BASES: Partial<Record<string, ReadingId>> = {
	faceWidth: 'faceWidth',
	rootWidth: 'rootWidth',
	rootOpening: 'rootOpening'
};

interface Collector {
	findings: Finding[];
	missing: Set<ReadingId>;
	missingJoint: Set<JointField>;
}

function recordUnknown(trace: Trace, collector: Collector) {
	for (const unknown of trace.unknown) {
		const reading = READING_BASES[unknown];
		if (reading) collector.missing.add(reading);
		else if (unknown === 'nominalThroat') collector.missingJoint.add('requiredSize');
		else collector.missingJoint.add(unknown as JointField);
	}
}

function uncertaintyNote(
	trace: Trace,
	strict: ScenarioResult,
	lenient: ScenarioResult,
	unit: Finding['unit'],
	units: UnitSystem
): string {
	const parts = [...trace.reasons];
	if (trace.unknown.size > 0) {
		const names = [...new Set([...trace.unknown].map((name) => UNKNOWN_NAMES[name]))].join(' and ');
		const bounds = [strict.limit, lenient.limit].filter(
			(bound): bound is number => bound !== undefined && Number.isFinite(bound)
		);
		const [low, high] = [Math.min(...bounds), Math.max(...bounds)];
		const between =
			unit === 'mm' && bounds.length === 2 && high > low
				? `: between ${describeLength(low, units)} and ${describeLength(high, units)}`
				: '';
		parts.push(`The limit depends on ${names}, not given${between}.`);
	}
	return parts.join(' ');
}

/** What one check run shares between its main finding and its length finding. */
interface CheckRun {
	limit: Limit;
	trace: Trace;
	units: UnitSystem;
	collector: Collector;
}

function addFinding(
	run: CheckRun,
	check: Finding['check'],
	measurement: Measurement,
	strict: ScenarioResult | undefined,
	lenient: ScenarioResult | undefined
) {
	const { limit, trace, units, collector } = run;
	const merged = mergeScenarios(strict, lenient);
	const notes = [limit.note, ...(strict?.notes ?? lenient?.notes ?? [])];
	if ((!merged.settled || merged.uncertain) && strict && lenient) {
		notes.push(uncertaintyNote(trace, strict, lenient, measurement.unit, units));
	}
	if (!merged.settled && strict && lenient) recordUnknown(trace, collector);
	const finding: Finding = {
		check,
		reading: measurement.reading,
		measured: measurement.value,
		limit: merged.limit,
		unit: measurement.unit,
		outcome: merged.outcome,
		clause: limit.clause,
		confidence: limit.confidence,
		note: notes.filter((note) => note).join(' ')
	};
	if (merged.range) finding.range = merged.range;
	if (merged.bounds) finding.bounds = merged.bounds;
	if (merged.band) finding.band = merged.band;
	collector.findings.push(finding);
}

function runCheck(
	id: CheckId,
	definition: CheckDefinition,
	run: CheckRun,
	measurement: Measurement,
	readings: ParsedReadings,
	ctx: LimitContext
) {
	const length = definition.length;
	const lengthMm = length ? readings[length.reading] : undefined;
	// The stretch the length read covers: the length part's, or the main reading's own.
	const window = length ? length.window : definition.window;
	const input = {
		measured: measurement.value,
		lengthMm,
		lengthWindowMm: window === undefined ? undefined : quantity(window, ctx.units),
		weldLengthMm: ctx.bases.weldLength
	};
	const strict: RuleResult = judgeRule(run.limit.rule, input, ctx, 'strict', run.trace);
	const lenient: RuleResult = judgeRule(run.limit.rule, input, ctx, 'lenient', run.trace);
	addFinding(run, id, measurement, strict.main, lenient.main);

	if (!length) return;
	if (strict.length === 'missing' || lenient.length === 'missing') {
		run.collector.missing.add(length.reading);
		return;
	}
	if (lengthMm === undefined || (strict.length === undefined && lenient.length === undefined))
		return;
	const lengthMeasurement: Measurement = { value: lengthMm, reading: length.reading, unit: 'mm' };
	addFinding(run, length.check, lengthMeasurement, strict.length, lenient.length);
}

export function evaluate(
	set: CriteriaSet,
	joint: JointInput,
	stage: Stage,
	readings: ReadingsInput,
	options: EvaluateOptions = {}
): EvaluationResult {
	const units = options.units ?? 'imperial';
	const errors: ReadingError[] = [];
	if (!oneOf(stages, stage))
		errors.push({ field: 'stage', message: `Stage must be one of ${stages.join(', ')}` });
	const resolved = readJoint(joint, units, errors);
	const { parsed, read } = readReadings(readings, units, errors);
	errors.push(...wpsErrors(options.wps));
	if (errors.length > 0 || !resolved) return { ok: false, errors };

	const derived = deriveValues(resolved, parsed);
	const ctx: LimitContext = {
		units,
		kind: resolved.kind,
		loading: resolved.loading,
		member: resolved.member,
		stress: resolved.stress,
		seam: resolved.seam,
		flange: resolved.flange,
		bases: {
			thickness: derived.thicknessMm,
			faceWidth: parsed.faceWidth,
			rootWidth: parsed.rootWidth,
			rootOpening: parsed.rootOpening,
			requiredSize: derived.requiredSizeMm,
			nominalThroat: derived.nominalThroatMm,
			weldLength: derived.weldLengthMm,
			diameter: derived.diameterMm,
			socketWall: derived.socketWallMm
		}
	};
	const checkContext: CheckContext = { readings: parsed, derived };
	const collector: Collector = { findings: [], missing: new Set(), missingJoint: new Set() };

	for (const id of checkIds) {
		const limit = set.limits[id];
		const definition = checkDefinitions[id];
		if (!limit) continue;
		if (!(limit.kinds ?? definition.kinds).includes(resolved.kind)) continue;
		if (!(limit.stages ?? definition.stages).includes(stage)) continue;
		if (definition.when && !definition.when(resolved)) continue;
		if (limit.appliesOver) {
			const value = parsed[limit.appliesOver.reading];
			if (value === undefined || value <= quantity(limit.appliesOver.value, units) + TOLERANCE)
				continue;
		}
		// Where the WPS gives the number the code leaves to it, the WPS finding stands alone.
		if (stage === 'fitup' && options.wps && wpsSettles(id, limit, options.wps)) continue;
		for (const wanted of definition.wants(checkContext)) {
			if (parsed[wanted] === undefined) collector.missing.add(wanted);
		}
		if (definition.needsRequiredSize && derived.requiredSizeMm === undefined) {
			collector.missingJoint.add('requiredSize');
			continue;
		}
		const measurement = definition.measure(checkContext);
		if (!measurement) continue;
		const run: CheckRun = { limit, trace: newTrace(), units, collector };
		runCheck(id, definition, run, measurement, parsed, ctx);
	}

	if (stage === 'fitup' && options.wps) {
		const wps = wpsFindings(options.wps, resolved.kind, parsed);
		collector.findings.push(...wps.findings);
		for (const id of wps.missing) collector.missing.add(id);
	}

	const { findings } = collector;
	const missing = readingIds.filter((id) => collector.missing.has(id));
	const jointFieldOrder: JointField[] = [
		'thickness',
		'requiredSize',
		'weldLength',
		'diameter',
		'socketWall',
		'seam',
		'member',
		'stress',
		'loading'
	];
	const missingJoint = jointFieldOrder.filter((field) => collector.missingJoint.has(field));
	const verdict = findings.some((finding) => finding.outcome === 'outside')
		? 'outside'
		: findings.length === 0 ||
			  missing.length > 0 ||
			  missingJoint.length > 0 ||
			  findings.some((finding) => finding.outcome === 'judge')
			? 'judge'
			: 'within';

	return {
		ok: true,
		verdict,
		readings: read,
		criteria: {
			id: set.id,
			name: set.name,
			standard: set.standard,
			edition: set.edition,
			version: set.version
		},
		findings,
		missing,
		missingJoint,
		derived
	};
}
