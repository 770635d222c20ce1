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
	/**
	 * Stretch of weld a length reading covers: 300 mm for "in any 12 in (300 mm)"; undefined
	 * where the reading is the total along the whole weld.
	 */
	lengthWindowMm?: number;
	weldLengthMm?: number;
}

export interface RuleResult {
	main: ScenarioResult;
	/** the length part of a banded rule; `missing` when it applies and no length was read */
	length?: ScenarioResult | 'missing';
}

export function describeLength(mm: number, units: UnitSystem): string {
	if (!Number.isFinite(mm)) return 'no fixed length';
	return units === 'imperial' ? formatBoth(mm) : formatLength(mm, 'metric');
}

/** How much weld a length counts over, where the weld length cuts a longer stretch short. */
function span(windowMm: number | undefined, weldLengthMm: number | undefined): number | undefined {
	if (windowMm === undefined) return weldLengthMm;
	return weldLengthMm === undefined ? windowMm : Math.min(windowMm, weldLengthMm);
}

const stretches = (longer: number, shorter: number) => Math.ceil(longer / shorter - TOLERANCE);

/**
 * An accumulated length read over one stretch of weld (`windowMm`, or the whole weld), judged
 * against a limit that holds over another (`perMm`, or the whole weld). Where the stretches
 * differ, what the reading proves is within or outside, and what it cannot tell is judged:
 * 50 mm in the worst 300 mm against "38 mm in any 150 mm" may or may not crowd one 150 mm.
 */
export function judgeAccumulated(
	measured: number,
	max: number,
	perMm: number | undefined,
	windowMm: number | undefined,
	weldLengthMm: number | undefined,
	units: UnitSystem
): ScenarioResult {
	const readSpan = span(windowMm, weldLengthMm);
	const codeSpan = span(perMm, weldLengthMm);
	const within: ScenarioResult = { outcome: 'within', limit: max };
	const outside: ScenarioResult = { outcome: 'outside', limit: max };
	// No number (a code that leaves it open): nothing to exceed. Nothing read, or none
	// allowed: no stretch can change that. Both the whole weld: compare.
	if (!Number.isFinite(max)) return { outcome: 'within', limit: max };
	if (atMost(measured, 0)) return within;
	if (atMost(max, 0)) return outside;
	if (windowMm === undefined && perMm === undefined) {
		return atMost(measured, max) ? within : outside;
	}
	const where =
		perMm === undefined ? 'in the whole weld' : `in any ${describeLength(perMm, units)} of weld`;
	const judge: ScenarioResult = {
		outcome: 'judge',
		limit: max,
		notes: [
			`The length read cannot show what lies ${where}: check that it holds no more than ${describeLength(max, units)}.`
		]
	};
	if (readSpan !== undefined && codeSpan !== undefined) {
		if (Math.abs(readSpan - codeSpan) <= TOLERANCE) return atMost(measured, max) ? within : outside;
		if (codeSpan < readSpan) {
			// Every stretch the code counts lies inside the one read.
			if (atMost(measured, max)) return within;
			return measured > max * stretches(readSpan, codeSpan) + TOLERANCE ? outside : judge;
		}
		// The code counts a longer stretch, made of several like the one read.
		if (!atMost(measured, max)) return outside;
		return atMost(measured * stretches(codeSpan, readSpan), max) ? within : judge;
	}
	if (readSpan === undefined && codeSpan !== undefined) {
		// The whole weld's total, of a weld of unknown length: every stretch holds at most that.
		return atMost(measured, max) ? within : judge;
	}
	// The code counts the whole weld, whose length is not known: more than allowed is outside.
	return atMost(measured, max) ? judge : outside;
}

/**
 * ISO 5817 short imperfection (clause 3, unconfirmed): in welds of 100 mm and more, at most
 * 25 mm in the 100 mm that holds the most; in shorter welds, at most 25 % of the weld length.
 */
export function judgeShortImperfection(
	lengthMm: number,
	windowMm: number | undefined,
	weldLengthMm: number | undefined,
	units: UnitSystem = 'metric'
): ScenarioResult {
	if (weldLengthMm !== undefined && weldLengthMm < 100) {
		return judgeAccumulated(
			lengthMm,
			0.25 * weldLengthMm,
			undefined,
			windowMm,
			weldLengthMm,
			units
		);
	}
	return judgeAccumulated(lengthMm, 25, 100, windowMm, weldLengthMm, units);
}

export function judgeAllowance(
	allowance: LengthAllowance,
	lengthMm: number,
	input: Pick<RuleInput, 'lengthWindowMm' | 'weldLengthMm'>,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): ScenarioResult {
	if ('short' in allowance) {
		return judgeShortImperfection(lengthMm, input.lengthWindowMm, input.weldLengthMm, ctx.units);
	}
	const max = resolveMax(allowance.max, ctx, scenario, trace);
	// A longer stretch holds more: the strict scenario takes the longest it could be.
	const per =
		allowance.per === undefined ? undefined : resolveMin(allowance.per, ctx, scenario, trace);
	return judgeAccumulated(lengthMm, max, per, input.lengthWindowMm, input.weldLengthMm, ctx.units);
}

function judgeLength(
	allowance: LengthAllowance,
	input: RuleInput,
	ctx: LimitContext,
	scenario: Scenario,
	trace: Trace
): ScenarioResult | 'missing' {
	if (input.lengthMm === undefined) return 'missing';
	return judgeAllowance(allowance, input.lengthMm, input, ctx, scenario, trace);
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
		case 'length': {
			const window = { lengthWindowMm: input.lengthWindowMm, weldLengthMm: input.weldLengthMm };
			return { main: judgeAllowance(rule.allowance, measured, window, ctx, scenario, trace) };
		}
		case 'banded': {
			// The limit shown is the one at any length, with the deeper band beside it: the
			// same whatever depth is read.
			const anyLength = resolveMax(rule.max, ctx, scenario, trace);
			const ceiling = rule.band ? resolveMax(rule.band.upTo, ctx, scenario, trace) : undefined;
			const band =
				ceiling !== undefined && ceiling > anyLength + TOLERANCE ? { upTo: ceiling } : undefined;
			if (atMost(measured, anyLength))
				return { main: { outcome: 'within', limit: anyLength, band } };
			if (!rule.band || ceiling === undefined || !atMost(measured, ceiling)) {
				return { main: { outcome: 'outside', limit: anyLength, band } };
			}
			const deeper =
				anyLength > 0 && Number.isFinite(anyLength)
					? `Deeper than ${describeLength(anyLength, ctx.units)}: allowed only over a limited length.`
					: 'Allowed only over a limited length.';
			const length = judgeLength(rule.band.length, input, ctx, scenario, trace);
			// Without its length, a depth in the band cannot be within: the length decides.
			if (length === 'missing') {
				return {
					main: { outcome: 'judge', limit: anyLength, band, notes: [`${deeper} Read its length.`] },
					length
				};
			}
			return { main: { outcome: 'within', limit: anyLength, band, notes: [deeper] }, length };
		}
	}
}
