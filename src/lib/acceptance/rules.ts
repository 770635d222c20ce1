/** Judges one measured value against one rule, in one scenario (see limits.ts). */
import { formatBoth, formatLength, type UnitSystem } from '../units';
import {
	atLeast,
	atMost,
	resolveMax,
	resolveMin,
	TOLERANCE,
	type LimitContext,
	type Scenario,
	type ScenarioResult,
	type Trace
} from './limits';
import type { LengthAllowance, Rule } from './types';

export interface RuleInput {
	measured: number;
	/** accumulated length of the imperfection, for the length part of a banded rule */
	lengthMm?: number;
	/** span the length reading covers: 300 mm for undercut (any 12 in), the weld for undersize */
	lengthWindowMm?: number;
	weldLengthMm?: number;
}

export interface RuleResult {
	main: ScenarioResult;
	/** the length part of a banded rule; `missing` when it applies and no length was read */
	length?: ScenarioResult | 'missing';
}

export function describeLength(mm: number, units: UnitSystem): string {
	return units === 'imperial' ? formatBoth(mm) : formatLength(mm, 'metric');
}

/** ISO 5817 short imperfection, from memory: ≤ 25 mm in any 100 mm; ≤ 25 % of a weld under 100 mm. */
export function judgeShortImperfection(
	lengthMm: number,
	spanMm: number | undefined,
	weldLengthMm: number | undefined
): ScenarioResult {
	if (weldLengthMm !== undefined && weldLengthMm < 100) {
		const limit = 0.25 * weldLengthMm;
		return { outcome: atMost(lengthMm, limit) ? 'within' : 'outside', limit };
	}
	if (atMost(lengthMm, 25)) return { outcome: 'within', limit: 25 };
	// The most a span can hold with no 100 mm stretch over 25 mm is 25 mm per started 100 mm.
	if (spanMm !== undefined && lengthMm > 25 * Math.ceil(spanMm / 100 - TOLERANCE) + TOLERANCE) {
		return { outcome: 'outside', limit: 25 };
	}
	return {
		outcome: 'judge',
		limit: 25,
		notes: ['More than 25 mm in all: check that no 100 mm of weld holds more than 25 mm.']
	};
}

function judgeLength(
	allowance: LengthAllowance,
	input: RuleInput,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): ScenarioResult | 'missing' {
	if (input.lengthMm === undefined) return 'missing';
	if ('short' in allowance) {
		return judgeShortImperfection(input.lengthMm, input.lengthWindowMm, input.weldLengthMm);
	}
	const limit = resolveMax(allowance.max, ctx, scenario, trace);
	return { outcome: atMost(input.lengthMm, limit) ? 'within' : 'outside', limit };
}

export function judgeRule(
	rule: Rule,
	input: RuleInput,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): RuleResult {
	const { measured } = input;
	switch (rule.type) {
		case 'absent':
			return {
				main: { outcome: atMost(measured, 0) ? 'within' : (rule.beyond ?? 'outside'), limit: 0 }
			};
		case 'max': {
			const limit = resolveMax(rule.max, ctx, scenario, trace);
			if (atMost(measured, limit)) return { main: { outcome: 'within', limit } };
			const judgeUpTo =
				rule.judgeUpTo === undefined ? undefined : resolveMax(rule.judgeUpTo, ctx, scenario, trace);
			const outcome =
				judgeUpTo !== undefined && atMost(measured, judgeUpTo)
					? 'judge'
					: (rule.beyond ?? 'outside');
			return { main: { outcome, limit } };
		}
		case 'min': {
			const limit = resolveMin(rule.min, ctx, scenario, trace);
			if (atLeast(measured, limit)) return { main: { outcome: 'within', limit } };
			const judgeAbove =
				rule.judgeAbove === undefined
					? undefined
					: resolveMin(rule.judgeAbove, ctx, scenario, trace);
			const outcome =
				judgeAbove !== undefined && measured > judgeAbove + TOLERANCE ? 'judge' : 'outside';
			return { main: { outcome, limit } };
		}
		case 'range': {
			const min = resolveMin(rule.min, ctx, scenario, trace);
			const max = resolveMax(rule.max, ctx, scenario, trace);
			const range = { min, max };
			if (!atLeast(measured, min)) return { main: { outcome: 'outside', limit: min, range } };
			if (!atMost(measured, max)) return { main: { outcome: 'outside', limit: max, range } };
			const nearer = measured - min <= max - measured ? min : max;
			return { main: { outcome: 'within', limit: nearer, range } };
		}
		case 'banded': {
			const anyLength = resolveMax(rule.max, ctx, scenario, trace);
			if (atMost(measured, anyLength)) return { main: { outcome: 'within', limit: anyLength } };
			if (!rule.band) return { main: { outcome: 'outside', limit: anyLength } };
			const ceiling = resolveMax(rule.band.upTo, ctx, scenario, trace);
			if (!atMost(measured, ceiling)) return { main: { outcome: 'outside', limit: ceiling } };
			const note =
				anyLength > 0 && Number.isFinite(anyLength)
					? `Over ${describeLength(anyLength, ctx.units)}, allowed only over a limited length.`
					: 'Allowed only over a limited length.';
			return {
				main: { outcome: 'within', limit: ceiling, notes: [note] },
				length: judgeLength(rule.band.length, input, ctx, scenario, trace)
			};
		}
	}
}
