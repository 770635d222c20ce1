/**
 * Turns limit data into numbers for one joint, and judges a measured value against them.
 *
 * Where the joint data a limit depends on is missing, each rule is judged twice: once with the
 * strictest value every expression could take, once with the most lenient. The rules are
 * monotone in their limits, so when both agree that is the answer; when they disagree the
 * inspector judges.
 */
import { MM_PER_INCH, type UnitSystem } from '../units';
import type {
	Basis,
	Condition,
	Expr,
	FlangeType,
	JointKind,
	LimitBounds,
	Loading,
	Member,
	Outcome,
	Quantity,
	Seam,
	StressDirection
} from './types';

/** A reading exactly on a limit is within it: 1/32 in is 0.79375 mm and floats drift. */
export const TOLERANCE = 1e-6;

export type Scenario = 'strict' | 'lenient';
type Pick = 'low' | 'high';

export interface LimitContext {
	units: UnitSystem;
	kind: JointKind;
	loading?: Loading;
	member?: Member;
	stress?: StressDirection;
	seam?: Seam;
	flange?: FlangeType;
	bases: Partial<Record<Basis, number>>;
}

/** What a resolution ran into: data it needed and did not have, and codes that leave it open. */
export interface Trace {
	unknown: Set<Basis | 'member' | 'stress' | 'loading' | 'seam'>;
	reasons: Set<string>;
}

export const newTrace = (): Trace => ({ unknown: new Set(), reasons: new Set() });

export function quantity(value: Quantity, units: UnitSystem): number {
	if (typeof value === 'number') return value;
	return units === 'imperial' ? value.in * MM_PER_INCH : value.mm;
}

function conditionHolds(
	condition: Condition,
	ctx: LimitContext,
	trace: Trace
): boolean | undefined {
	if ('kindIn' in condition) return condition.kindIn.includes(ctx.kind);
	if ('given' in condition) return ctx.bases[condition.given] !== undefined;
	// Only the joints the flange rows are drawn for are flanges; no flange named means none.
	if ('flange' in condition) return ctx.flange === condition.flange;
	if ('seam' in condition && condition.unknown === 'no' && ctx.seam === undefined) return false;
	const [field, wanted, actual] =
		'member' in condition
			? (['member', condition.member, ctx.member] as const)
			: 'stress' in condition
				? (['stress', condition.stress, ctx.stress] as const)
				: 'seam' in condition
					? (['seam', condition.seam, ctx.seam] as const)
					: (['loading', condition.loading, ctx.loading] as const);
	if (actual === undefined) {
		trace.unknown.add(field);
		return undefined;
	}
	return actual === wanted;
}

function extreme(values: number[], pick: Pick): number {
	return pick === 'low' ? Math.min(...values) : Math.max(...values);
}

function resolve(expr: Expr, ctx: LimitContext, pick: Pick, trace: Trace): number {
	if (typeof expr === 'number' || 'mm' in expr) return quantity(expr, ctx.units);
	if ('of' in expr) {
		const plus = expr.plus === undefined ? 0 : quantity(expr.plus, ctx.units);
		const basis = ctx.bases[expr.of];
		if (basis !== undefined) return plus + expr.times * basis;
		trace.unknown.add(expr.of);
		return pick === 'low' ? plus : Infinity;
	}
	if ('by' in expr) {
		const basis = ctx.bases[expr.by];
		if (basis === undefined) {
			trace.unknown.add(expr.by);
			const all = [...expr.steps.map((step) => step.value), expr.otherwise];
			return extreme(
				all.map((value) => resolve(value, ctx, pick, trace)),
				pick
			);
		}
		for (const step of expr.steps) {
			const inStep =
				'upTo' in step
					? basis <= quantity(step.upTo, ctx.units) + TOLERANCE
					: basis < quantity(step.below, ctx.units) - TOLERANCE;
			if (inStep) return resolve(step.value, ctx, pick, trace);
		}
		return resolve(expr.otherwise, ctx, pick, trace);
	}
	if ('when' in expr) {
		const holds = conditionHolds(expr.when, ctx, trace);
		if (holds === true) return resolve(expr.then, ctx, pick, trace);
		if (holds === false) return resolve(expr.otherwise, ctx, pick, trace);
		return extreme(
			[resolve(expr.then, ctx, pick, trace), resolve(expr.otherwise, ctx, pick, trace)],
			pick
		);
	}
	if ('lesserOf' in expr)
		return Math.min(...expr.lesserOf.map((e) => resolve(e, ctx, pick, trace)));
	if ('greaterOf' in expr)
		return Math.max(...expr.greaterOf.map((e) => resolve(e, ctx, pick, trace)));
	if ('sumOf' in expr)
		return expr.sumOf.reduce<number>((sum, e) => sum + resolve(e, ctx, pick, trace), 0);
	if ('either' in expr) {
		trace.reasons.add(expr.because);
		return extreme(
			expr.either.map((e) => resolve(e, ctx, pick, trace)),
			pick
		);
	}
	trace.reasons.add(expr.open);
	return pick === 'low' ? 0 : Infinity;
}

/** A maximum: the strict scenario takes the lowest value it could be. */
export function resolveMax(
	expr: Expr,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): number {
	return resolve(expr, ctx, scenario === 'strict' ? 'low' : 'high', trace);
}

/** A minimum: the strict scenario takes the highest value it could be. */
export function resolveMin(
	expr: Expr,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): number {
	return resolve(expr, ctx, scenario === 'strict' ? 'high' : 'low', trace);
}

/** The value a definite expression has, or undefined when it depends on data not given. */
export function resolveDefinite(expr: Expr, ctx: LimitContext): number | undefined {
	const trace = newTrace();
	const low = resolve(expr, ctx, 'low', trace);
	const high = resolve(expr, ctx, 'high', trace);
	return Math.abs(high - low) <= TOLERANCE ? low : undefined;
}

export const atMost = (measured: number, limit: number) => measured <= limit + TOLERANCE;
export const atLeast = (measured: number, limit: number) => measured >= limit - TOLERANCE;

/** One scenario's answer for one finding; `limit` is absent where the scenario had no limit to give. */
export interface ScenarioResult {
	outcome: Outcome;
	limit?: number;
	range?: { min: number; max: number };
	/** the deeper band of a banded limit */
	band?: { upTo: number };
	notes?: string[];
}

/**
 * Joins the strict and lenient answers. A finding missing from the strict scenario is one it
 * had already rejected; missing from the lenient one, one it did not need.
 *
 * Where the two limits differ (joint data is missing), no single limit is given, whatever the
 * outcome: `bounds` holds both, so the limit shown depends on the joint, never on the reading.
 */
export function mergeScenarios(
	strict: ScenarioResult | undefined,
	lenient: ScenarioResult | undefined
): {
	outcome: Outcome;
	limit: number | null;
	range?: { min: number; max: number };
	bounds?: LimitBounds;
	band?: { upTo: number };
	settled: boolean;
	/** the two scenarios gave different limits */
	uncertain: boolean;
} {
	const s = strict ?? { outcome: 'outside' };
	const l = lenient ?? { outcome: 'within' };
	const outcome: Outcome = s.outcome === l.outcome ? s.outcome : 'judge';
	const settled = s.outcome === l.outcome;
	const finite = (value: number | undefined): value is number =>
		value !== undefined && Number.isFinite(value);
	const sameRange =
		s.range === undefined ||
		l.range === undefined ||
		(Math.abs(s.range.min - l.range.min) <= TOLERANCE &&
			Math.abs(s.range.max - l.range.max) <= TOLERANCE);
	if (strict && lenient && finite(s.limit) && finite(l.limit)) {
		if (Math.abs(s.limit - l.limit) <= TOLERANCE && sameRange) {
			const band =
				s.band && l.band && Math.abs(s.band.upTo - l.band.upTo) <= TOLERANCE ? s.band : undefined;
			return { outcome, limit: s.limit, range: s.range, band, settled, uncertain: false };
		}
		const bounds = { min: Math.min(s.limit, l.limit), max: Math.max(s.limit, l.limit) };
		return { outcome, limit: null, bounds, settled, uncertain: true };
	}
	if (strict && lenient && (finite(s.limit) || finite(l.limit))) {
		// One scenario has no number (the code leaves it open there): nothing fixed to show.
		return { outcome, limit: null, settled, uncertain: true };
	}
	const chosen = [s, l].find((result) => finite(result.limit));
	return {
		outcome,
		limit: chosen?.limit ?? null,
		range: chosen?.range,
		band: chosen?.band,
		settled,
		uncertain: false
	};
}
