/**
 * evaluateIndications(set, joint, method, indications) judges the indications of an RT or UT
 * report by the set's criteria for volumetric examination (B31.3 Table 341.3.2, radiography;
 * API 1104 section 9), with the same verdict words as a visual inspection.
 *
 * Each kind of indication is judged on each dimension its limit names: the largest individual
 * length, width and depth, the accumulated length in the worst stretch of weld (exactly where
 * the indications' positions are given, otherwise from their total), and their number. A
 * dimension the limit needs and the report does not give is for the inspector ("judge").
 * Unreadable input is returned as errors, as evaluate does.
 */
import { parseLength, type UnitSystem } from '../units';
import { readJoint, type ResolvedJoint } from './inputs';
import {
	atMost,
	mergeScenarios,
	newTrace,
	quantity,
	resolveMax,
	resolveMin,
	TOLERANCE,
	type LimitContext,
	type Scenario,
	type ScenarioResult,
	type Trace
} from './limits';
import { describeLength, judgeAccumulated } from './rules';
import {
	indicationTypes,
	ndeMethodsJudged,
	type Confidence,
	type CriteriaSet,
	type EvaluateOptions,
	type Expr,
	type FindingUnit,
	type IndicationEvaluationResult,
	type IndicationFinding,
	type IndicationInput,
	type IndicationLimit,
	type IndicationPart,
	type IndicationType,
	type JointField,
	type JointInput,
	type LengthAllowance,
	type ParsedIndication,
	type ReadingError
} from './types';

export const indicationLabels: Record<IndicationType, string> = {
	crack: 'Crack',
	craterCrack: 'Crater or star crack',
	lackOfFusion: 'Lack of fusion (IF)',
	coldLap: 'Incomplete fusion due to cold lap (IFD)',
	incompletePenetration: 'Incomplete penetration (IP)',
	hiLoPenetration: 'Incomplete penetration due to hi-lo (IPD)',
	crossPenetration: 'Inadequate cross penetration (ICP)',
	internalConcavity: 'Internal concavity (IC)',
	burnThrough: 'Burn-through (BT)',
	elongatedSlag: 'Elongated slag or linear indication (ESI)',
	isolatedSlag: 'Isolated slag (ISI)',
	tungsten: 'Tungsten inclusion',
	porosity: 'Porosity or rounded indication',
	clusterPorosity: 'Cluster porosity (CP)',
	hollowBead: 'Hollow bead (HB)',
	undercut: 'Undercut (EU, IU)'
};

const DIMENSIONS = ['length', 'width', 'depth', 'position'] as const;
type Dimension = (typeof DIMENSIONS)[number];
const DIMENSION_WORDS: Record<Dimension, string> = {
	length: 'length',
	width: 'width',
	depth: 'depth',
	position: 'position along the weld'
};

function readIndications(
	indications: readonly IndicationInput[] | undefined,
	units: UnitSystem,
	errors: ReadingError[]
): ParsedIndication[] {
	if (indications !== undefined && !Array.isArray(indications)) {
		errors.push({ field: 'indications', message: 'Indications must be a list' });
		return [];
	}
	const parsed: ParsedIndication[] = [];
	(indications ?? []).forEach((indication, index) => {
		const field = `indications.${index}`;
		if (!indicationTypes.includes(indication?.type)) {
			errors.push({
				field: `${field}.type`,
				message: `Indication ${index + 1}: the type must be one of ${indicationTypes.join(', ')}`
			});
			return;
		}
		const read: ParsedIndication = { type: indication.type };
		for (const dimension of DIMENSIONS) {
			const value: unknown = indication[dimension];
			if (value === undefined || value === null || value === '') continue;
			const label = `Indication ${index + 1} ${DIMENSION_WORDS[dimension]}`;
			const result =
				typeof value === 'string' || typeof value === 'number'
					? parseLength(value, {
							units,
							reading: { label, kind: 'length', plausible: { min: 0, max: 100_000 } }
						})
					: { ok: false as const, message: `${label}: give a length` };
			if (result.ok) read[`${dimension}Mm`] = result.value;
			else errors.push({ field: `${field}.${dimension}`, message: result.message });
		}
		if (indication.darker !== undefined && indication.darker !== null) {
			if (typeof indication.darker === 'boolean') read.darker = indication.darker;
			else
				errors.push({
					field: `${field}.darker`,
					message: `Indication ${index + 1}: darker is true or false`
				});
		}
		parsed.push(read);
	});
	return parsed;
}

function limitContext(joint: ResolvedJoint, units: UnitSystem): LimitContext {
	const { thickness, weldLength, diameter, socketWall } = joint.lengths;
	const girth =
		weldLength === undefined && joint.seam === 'circumferential' && diameter
			? Math.PI * diameter
			: undefined;
	return {
		units,
		kind: joint.kind,
		seam: joint.seam,
		flange: joint.flange,
		loading: joint.loading,
		member: joint.member,
		stress: joint.stress,
		bases: { thickness, weldLength: weldLength ?? girth, diameter, socketWall }
	};
}

/** The most indication length lying in any `per` of weld, round the weld where it closes. */
export function worstStretch(
	spans: readonly { start: number; length: number }[],
	per: number,
	weldLength: number | undefined
): number {
	const intervals = spans.map(({ start, length }) => [start, start + length] as const);
	// A girth weld closes on itself: a stretch may run past its datum.
	const all =
		weldLength === undefined
			? intervals
			: [...intervals, ...intervals.map(([a, b]) => [a + weldLength, b + weldLength] as const)];
	const starts = [...all.map(([a]) => a), ...all.map(([, b]) => b - per)];
	let worst = 0;
	for (const from of starts) {
		const to = from + per;
		const inside = all.reduce(
			(sum, [a, b]) => sum + Math.max(0, Math.min(b, to) - Math.max(a, from)),
			0
		);
		worst = Math.max(worst, inside);
	}
	return worst;
}

/** Strict and lenient scenarios of one finding, merged as evaluate merges them. */
interface Part {
	check: IndicationFinding['check'];
	type: IndicationType | null;
	part: IndicationPart;
	indication: number | null;
	measured: number;
	unit: FindingUnit;
	clause: string;
	confidence: Confidence;
	note?: string;
	judge: (scenario: Scenario, trace: Trace) => ScenarioResult;
}

interface Run {
	ctx: LimitContext;
	findings: IndicationFinding[];
	missingJoint: Set<JointField>;
}

function addPart(run: Run, part: Part) {
	const trace = newTrace();
	const strict = part.judge('strict', trace);
	const lenient = part.judge('lenient', trace);
	const merged = mergeScenarios(strict, lenient);
	const notes = [part.note, ...(strict.notes ?? lenient.notes ?? []), ...trace.reasons];
	if (!merged.settled) {
		for (const unknown of trace.unknown) {
			if (unknown === 'thickness' || unknown === 'weldLength' || unknown === 'diameter')
				run.missingJoint.add(unknown);
		}
	}
	if (merged.uncertain && trace.unknown.size > 0) {
		const names = [...trace.unknown]
			.map((name) =>
				name === 'weldLength' ? 'the weld length (or the outside diameter)' : `the ${name}`
			)
			.join(' and ');
		notes.push(`The limit depends on ${names}, not given.`);
	}
	const finding: IndicationFinding = {
		check: part.check,
		type: part.type,
		part: part.part,
		indication: part.indication,
		measured: part.measured,
		limit: merged.limit,
		unit: part.unit,
		outcome: merged.outcome,
		clause: part.clause,
		confidence: part.confidence,
		note: [...new Set(notes.filter((note): note is string => !!note))].join(' ')
	};
	if (merged.bounds) finding.bounds = merged.bounds;
	run.findings.push(finding);
}

const maxJudge =
	(ctx: LimitContext, measured: number, expr: Expr) =>
	(scenario: Scenario, trace: Trace): ScenarioResult => {
		const limit = resolveMax(expr, ctx, scenario, trace);
		return { outcome: atMost(measured, limit) ? 'within' : 'outside', limit };
	};

/** The largest value of one dimension, and whether every indication gave it. */
function largest(
	items: readonly { item: ParsedIndication; index: number }[],
	key: 'lengthMm' | 'widthMm' | 'depthMm'
) {
	let worst: { value: number; index: number } | undefined;
	for (const { item, index } of items) {
		const value = item[key];
		if (value !== undefined && (!worst || value > worst.value)) worst = { value, index };
	}
	return { worst, complete: items.every(({ item }) => item[key] !== undefined) };
}

/** ISO 5817's short imperfection, as an allowance over a stretch: 25 mm in any 100 mm. */
const SHORT = { max: 25, per: 100 } as const;

function judgeAggregate(
	run: Run,
	items: readonly { item: ParsedIndication; index: number }[],
	given: LengthAllowance,
	base: {
		check: string;
		type: IndicationType | null;
		clause: string;
		confidence: Confidence;
		note?: string;
	}
) {
	const { ctx } = run;
	const allowance: { max: Expr; per?: Expr } = 'short' in given ? SHORT : given;
	const weldLength = ctx.bases.weldLength;
	const part: IndicationPart = allowance.per === undefined ? 'share' : 'aggregate';
	const check = (
		base.type === null
			? `${base.check}${part === 'share' ? '.share' : ''}`
			: `nde.${base.type}.${part}`
	) as IndicationFinding['check'];
	const known = items.every(({ item }) => item.lengthMm !== undefined);
	const total = items.reduce((sum, { item }) => sum + (item.lengthMm ?? 0), 0);
	const spans =
		known && items.every(({ item }) => item.positionMm !== undefined)
			? items.map(({ item }) => ({ start: item.positionMm!, length: item.lengthMm! }))
			: undefined;
	const perIn = (scenario: Scenario, trace: Trace) =>
		allowance.per === undefined ? undefined : resolveMin(allowance.per, ctx, scenario, trace);
	const shownPer = perIn('strict', newTrace());
	const measured =
		spans && shownPer !== undefined ? worstStretch(spans, shownPer, weldLength) : total;
	addPart(run, {
		...base,
		check,
		part,
		indication: null,
		measured,
		unit: 'mm',
		judge: (scenario, trace) => {
			const max = resolveMax(allowance.max, ctx, scenario, trace);
			const per = perIn(scenario, trace);
			if (!known) {
				return {
					outcome: 'judge',
					limit: max,
					notes: ['Give the length of every indication counted here.']
				};
			}
			if (spans && per !== undefined) {
				const worst = worstStretch(spans, per, weldLength);
				return { outcome: atMost(worst, max) ? 'within' : 'outside', limit: max };
			}
			return judgeAccumulated(total, max, per, undefined, weldLength, ctx.units);
		}
	});
}

function judgeKind(
	run: Run,
	type: IndicationType,
	limit: IndicationLimit | undefined,
	items: readonly { item: ParsedIndication; index: number }[],
	criteriaClause: string
) {
	const { ctx } = run;
	if (items.length === 0) return;
	const base = (part: IndicationPart) => ({
		check: `nde.${type}.${part}` as const,
		type,
		clause: limit?.clause ?? criteriaClause,
		confidence: limit?.confidence ?? ('practice' as Confidence),
		note: limit?.note
	});
	const count = items.length;
	if (!limit) {
		addPart(run, {
			...base('present'),
			part: 'present',
			indication: items[0].index,
			measured: count,
			unit: 'count',
			note: 'This set has no criterion for this kind of indication: for the inspector.',
			judge: () => ({ outcome: 'judge' })
		});
		return;
	}
	if (limit.absent) {
		addPart(run, {
			...base('present'),
			part: 'present',
			indication: items[0].index,
			measured: count,
			unit: 'count',
			note: limit.note ?? 'Not permitted.',
			judge: () => ({ outcome: 'outside', limit: 0 })
		});
		return;
	}
	if (limit.open) {
		addPart(run, {
			...base('distribution'),
			part: 'distribution',
			indication: items[0].index,
			measured: count,
			unit: 'count',
			note: [limit.note, limit.open].filter(Boolean).join(' '),
			judge: () => ({ outcome: 'judge' })
		});
	}
	const dimensions: ['length' | 'width' | 'depth', 'lengthMm' | 'widthMm' | 'depthMm'][] = [
		['length', 'lengthMm'],
		['width', 'widthMm'],
		['depth', 'depthMm']
	];
	for (const [part, key] of dimensions) {
		const expr = limit[part];
		if (expr === undefined) continue;
		const { worst, complete } = largest(items, key);
		addPart(run, {
			...base(part),
			part,
			indication: worst?.index ?? items[0].index,
			measured: worst?.value ?? 0,
			unit: 'mm',
			judge: (scenario, trace) => {
				const result = maxJudge(ctx, worst?.value ?? 0, expr)(scenario, trace);
				if (result.outcome === 'outside' || complete) return result;
				return {
					...result,
					outcome: 'judge',
					notes: [
						`Give the ${part} of every indication of this kind${part === 'depth' ? ' (where the method shows it)' : ''}.`
					]
				};
			}
		});
	}
	for (const allowance of limit.aggregate ?? []) {
		judgeAggregate(run, items, allowance, { ...base('aggregate'), check: `nde.${type}` });
	}
	if (limit.count) {
		const { max, per, underDiameter } = limit.count;
		const positioned = items.every(({ item }) => item.positionMm !== undefined);
		addPart(run, {
			...base('count'),
			part: 'count',
			indication: null,
			measured: count,
			unit: 'count',
			judge: (scenario, trace) => {
				if (underDiameter !== undefined) {
					const diameter = ctx.bases.diameter;
					const bound = quantity(underDiameter, ctx.units);
					if (diameter === undefined) {
						trace.unknown.add('diameter');
						if (scenario === 'lenient') return { outcome: 'within' };
					} else if (diameter >= bound - TOLERANCE) return { outcome: 'within' };
				}
				const limitCount = resolveMax(max, ctx, scenario, trace);
				if (count <= limitCount) return { outcome: 'within', limit: limitCount };
				if (per === undefined) return { outcome: 'outside', limit: limitCount };
				const window = resolveMin(per, ctx, scenario, trace);
				if (positioned) {
					const worst = worstStretch(
						items.map(({ item }) => ({ start: item.positionMm!, length: 0.001 })),
						window,
						ctx.bases.weldLength
					);
					// Each indication counted as a point: the stretch holds this many.
					return {
						outcome: Math.round(worst / 0.001) <= limitCount ? 'within' : 'outside',
						limit: limitCount
					};
				}
				const weld = ctx.bases.weldLength;
				if (weld !== undefined && weld <= window + TOLERANCE) {
					return { outcome: 'outside', limit: limitCount };
				}
				return {
					outcome: 'judge',
					limit: limitCount,
					notes: [
						`More than ${limitCount} in all: give their positions, or check that no ${describeLength(window, ctx.units)} holds more.`
					]
				};
			}
		});
	}
}

/**
 * The verdict on the indications of one RT or UT report. With no indications, a method the
 * set has criteria for is within; a method it has none for is for the inspector.
 */
export function evaluateIndications(
	set: CriteriaSet,
	joint: JointInput,
	method: string,
	indications: readonly IndicationInput[] | undefined,
	options: EvaluateOptions = {}
): IndicationEvaluationResult {
	const units = options.units ?? 'imperial';
	const errors: ReadingError[] = [];
	if (!(ndeMethodsJudged as readonly string[]).includes(method)) {
		errors.push({
			field: 'method',
			message: `Indications are judged for ${ndeMethodsJudged.join(' and ')}; MT and PT results are the report's`
		});
	}
	const resolved = readJoint(joint, units, errors);
	const parsed = readIndications(indications, units, errors);
	if (errors.length > 0 || !resolved) return { ok: false, errors };
	const volumetricMethod = method as (typeof ndeMethodsJudged)[number];

	const criteria = {
		id: set.id,
		name: set.name,
		standard: set.standard,
		edition: set.edition,
		version: set.version
	};
	const methodCriteria = set.volumetric?.[volumetricMethod];
	if (!methodCriteria || methodCriteria.notBuiltIn) {
		return {
			ok: true,
			verdict: 'judge',
			criteria,
			method: volumetricMethod,
			findings: [],
			missingJoint: [],
			indications: parsed,
			note:
				methodCriteria?.notBuiltIn ??
				`${set.name} has no criteria for ${volumetricMethod} indications: the result is the examiner's, for the inspector to sign.`
		};
	}

	const ctx = limitContext(resolved, units);
	const run: Run = { ctx, findings: [], missingJoint: new Set() };
	const byType = new Map<IndicationType, { item: ParsedIndication; index: number }[]>();
	const add = (type: IndicationType, entry: { item: ParsedIndication; index: number }) =>
		byType.set(type, [...(byType.get(type) ?? []), entry]);
	parsed.forEach((item, index) => {
		const limit = methodCriteria.limits[item.type];
		// A darker internal concavity is judged as burn-through (API 1104 9.3.6).
		if (limit?.darkerAs && item.darker === true) add(limit.darkerAs, { item, index });
		else add(item.type, { item, index });
	});

	for (const type of indicationTypes) {
		const limit = methodCriteria.limits[type];
		let items = byType.get(type) ?? [];
		if (limit?.darkerAs) {
			const unknown = items.filter(({ item }) => item.darker === undefined);
			if (unknown.length > 0) {
				addPart(run, {
					check: `nde.${type}.present`,
					type,
					part: 'present',
					indication: unknown[0].index,
					measured: unknown.length,
					unit: 'count',
					clause: limit.clause,
					confidence: limit.confidence,
					note: `${limit.note ?? ''} Say whether the image is darker than the thinnest adjacent parent metal.`.trim(),
					judge: () => ({ outcome: 'judge' })
				});
			} else if (items.length > 0) {
				addPart(run, {
					check: `nde.${type}.present`,
					type,
					part: 'present',
					indication: items[0].index,
					measured: items.length,
					unit: 'count',
					clause: limit.clause,
					confidence: limit.confidence,
					note: limit.note ?? '',
					judge: () => ({ outcome: 'within' })
				});
			}
			continue;
		}
		if (limit?.onlyDarker) items = items.filter(({ item }) => item.darker !== false);
		judgeKind(run, type, limit, items, methodCriteria.clause);
	}

	for (const group of methodCriteria.groups ?? []) {
		const items = group.types.flatMap((type) => byType.get(type) ?? []);
		if (items.length === 0) continue;
		for (const allowance of group.aggregate) {
			judgeAggregate(run, items, allowance, {
				check: `nde.group.${group.id}`,
				type: null,
				clause: group.clause,
				confidence: group.confidence,
				note: group.note
			});
		}
	}

	const { findings } = run;
	const missingJoint = (['thickness', 'weldLength', 'diameter'] as const).filter((field) =>
		run.missingJoint.has(field)
	);
	const verdict = findings.some((finding) => finding.outcome === 'outside')
		? 'outside'
		: findings.some((finding) => finding.outcome === 'judge') || missingJoint.length > 0
			? 'judge'
			: 'within';
	return {
		ok: true,
		verdict,
		criteria,
		method: volumetricMethod,
		findings,
		missingJoint,
		indications: parsed
	};
}
