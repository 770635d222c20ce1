/**
 * Limits in words, for the people who set them: "at most the lesser of 1/32 in and
 * 0.25 × thickness". Quantities show in the project's column of a dual-unit code. Pure.
 */
import { MM_PER_INCH, type UnitSystem } from '../units';
import { checkDefinitions } from './checks';
import { quantity } from './limits';
import type { Basis, CheckId, Condition, Expr, LengthAllowance, Quantity, Rule } from './types';

/** What a check's limit is measured in. */
export type LimitUnit = 'mm' | 'deg' | 'flag' | 'count' | 'um';

const FLAG_CHECKS: readonly CheckId[] = ['crack', 'fusion', 'overlap', 'crater'];
const OTHER_UNITS: Partial<Record<CheckId, LimitUnit>> = {
	'bevelAngle.range': 'deg',
	'pore.count': 'count',
	'surfaceFinish.max': 'um'
};

export function limitUnit(check: CheckId): LimitUnit {
	if (FLAG_CHECKS.includes(check)) return 'flag';
	return OTHER_UNITS[check] ?? 'mm';
}

/** Checks whose limit may allow a deeper imperfection over a limited length (a banded rule). */
export function hasLengthPart(check: CheckId): boolean {
	return checkDefinitions[check].length !== undefined;
}

const trim = (value: number, places: number) => String(Number(value.toFixed(places)));

/**
 * A length as an inspector reads it: an exact 1/64 in as a fraction (`1/32 in`), else the
 * inches and the millimetres (`0.020 in (0.5 mm)`); in a metric project, millimetres.
 */
export function lengthWords(mm: number, units: UnitSystem): string {
	if (units === 'metric') return `${trim(mm, 3)} mm`;
	const inches = mm / MM_PER_INCH;
	const sixtyFourths = inches * 64;
	if (Math.abs(sixtyFourths - Math.round(sixtyFourths)) < 1e-6) {
		return `${inchFraction(Math.round(sixtyFourths))} in`;
	}
	return `${inches.toFixed(3)} in (${trim(mm, 2)} mm)`;
}

function inchFraction(sixtyFourths: number): string {
	const whole = Math.floor(sixtyFourths / 64);
	let numerator = sixtyFourths % 64;
	let denominator = 64;
	while (numerator > 0 && numerator % 2 === 0) {
		numerator /= 2;
		denominator /= 2;
	}
	if (numerator === 0) return String(whole);
	return whole === 0 ? `${numerator}/${denominator}` : `${whole}-${numerator}/${denominator}`;
}

/**
 * A value as it would be typed back into a form in the project's units: `1/32 in`, `0.5 mm`,
 * `37.5°`. Exact, unlike the display: a value that is no whole 1/64 in stays in millimetres.
 */
export function typedValue(value: number, unit: Exclude<LimitUnit, 'flag'>, units: UnitSystem) {
	if (unit === 'deg') return `${trim(value, 3)}°`;
	if (unit === 'count') return String(Math.round(value));
	if (unit === 'um') return `${trim(value, 3)} µm`;
	const sixtyFourths = (value / MM_PER_INCH) * 64;
	if (units === 'imperial' && Math.abs(sixtyFourths - Math.round(sixtyFourths)) < 1e-9) {
		return `${inchFraction(Math.round(sixtyFourths))} in`;
	}
	return `${trim(value, 4)} mm`;
}

const BASIS_WORDS: Record<Basis, string> = {
	thickness: 'thickness',
	faceWidth: 'face width',
	requiredSize: 'required fillet size',
	nominalThroat: 'nominal throat',
	weldLength: 'weld length',
	rootWidth: 'root bead width',
	rootOpening: 'root opening',
	diameter: 'outside diameter',
	socketWall: 'socket wall or hub thickness'
};

function conditionWords(condition: Condition): string {
	if ('kindIn' in condition) return `${condition.kindIn.join(' or ')} joints`;
	if ('member' in condition) return `${condition.member} members`;
	if ('stress' in condition) return `weld ${condition.stress} to the stress`;
	if ('seam' in condition) {
		return condition.seam === 'longitudinal' ? 'longitudinal seams' : 'girth welds';
	}
	if ('flange' in condition) return `${condition.flange} flanges`;
	if ('given' in condition) return `where the ${BASIS_WORDS[condition.given]} is recorded`;
	return `${condition.loading} loading`;
}

function list(items: string[]): string {
	return items.length <= 1
		? (items[0] ?? '')
		: `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

interface Words {
	unit: Exclude<LimitUnit, 'flag'>;
	units: UnitSystem;
}

function quantityWords(value: Quantity, words: Words): string {
	const number = quantity(value, words.units);
	if (words.unit === 'deg') return `${trim(number, 2)}°`;
	if (words.unit === 'count') return String(number);
	if (words.unit === 'um') {
		return words.units === 'imperial'
			? `${trim(number / 0.0254, 0)} µin Ra (${trim(number, 2)} µm)`
			: `${trim(number, 2)} µm Ra`;
	}
	return lengthWords(number, words.units);
}

/** An expression in words; `nested` wraps the ones that read as a list in parentheses. */
export function exprWords(expr: Expr, words: Words, nested = false): string {
	const wrap = (text: string) => (nested ? `(${text})` : text);
	if (typeof expr === 'number' || 'mm' in expr) return quantityWords(expr, words);
	if ('of' in expr) {
		const base = `${trim(expr.times, 4)} × ${BASIS_WORDS[expr.of]}`;
		return expr.plus === undefined || quantity(expr.plus, words.units) === 0
			? base
			: wrap(`${base} + ${quantityWords(expr.plus, { ...words, unit: 'mm' })}`);
	}
	if ('by' in expr) {
		const lengthOnly = { ...words, unit: 'mm' as const };
		const steps = expr.steps.map((step) =>
			'upTo' in step
				? `up to ${quantityWords(step.upTo, lengthOnly)}: ${exprWords(step.value, words, true)}`
				: `under ${quantityWords(step.below, lengthOnly)}: ${exprWords(step.value, words, true)}`
		);
		return wrap(
			`by ${BASIS_WORDS[expr.by]}, ${[...steps, `over that: ${exprWords(expr.otherwise, words, true)}`].join('; ')}`
		);
	}
	if ('when' in expr) {
		// "None for longitudinal seams" reads better after the rule than before it.
		if (typeof expr.then === 'number' && expr.then === 0) {
			return wrap(`${exprWords(expr.otherwise, words)}, none for ${conditionWords(expr.when)}`);
		}
		return wrap(
			`${exprWords(expr.then, words, true)} for ${conditionWords(expr.when)}, otherwise ${exprWords(expr.otherwise, words, true)}`
		);
	}
	if ('lesserOf' in expr) {
		return wrap(`the lesser of ${list(expr.lesserOf.map((e) => exprWords(e, words, true)))}`);
	}
	if ('greaterOf' in expr) {
		return wrap(`the greater of ${list(expr.greaterOf.map((e) => exprWords(e, words, true)))}`);
	}
	if ('sumOf' in expr) {
		return wrap(expr.sumOf.map((e) => exprWords(e, words, true)).join(' + '));
	}
	if ('either' in expr) {
		return wrap(
			`${expr.either.map((e) => exprWords(e, words, true)).join(' or ')} (${expr.because.replace(/\.$/, '')})`
		);
	}
	const open = `no fixed number: ${expr.open}`;
	// Inside a longer sentence the note reads as one aside, without its own full stop.
	return nested ? wrap(open.replace(/\.$/, '')) : open;
}

export function allowanceWords(allowance: LengthAllowance, units: UnitSystem): string {
	if ('short' in allowance) return 'a short imperfection (25 mm in any 100 mm)';
	const max = exprWords(allowance.max, { unit: 'mm', units }, true);
	return allowance.per === undefined
		? `${max} in all`
		: `${max} in any ${exprWords(allowance.per, { unit: 'mm', units }, true)}`;
}

/** A rule in words: "at most 1/32 in", "none; past that the inspector judges". */
export function ruleWords(rule: Rule, unit: LimitUnit, units: UnitSystem): string {
	const words: Words = { unit: unit === 'flag' ? 'mm' : unit, units };
	// A stepped or conditional value reads as one thing inside the sentence around it.
	const value = (expr: Expr) =>
		exprWords(expr, words, typeof expr === 'object' && ('by' in expr || 'when' in expr));
	const open = (expr: Expr) => typeof expr === 'object' && 'open' in expr;
	const judged =
		(rule.type === 'absent' || rule.type === 'max') && 'beyond' in rule && rule.beyond === 'judge';
	const beyond = judged ? '; past that the inspector judges' : '';
	switch (rule.type) {
		case 'absent':
			return `none allowed${beyond}`;
		case 'max': {
			const judgeUpTo =
				rule.judgeUpTo === undefined
					? ''
					: `; up to ${exprWords(rule.judgeUpTo, words)} the inspector judges`;
			return `${open(rule.max) ? '' : 'at most '}${value(rule.max)}${judgeUpTo}${beyond}`;
		}
		case 'min': {
			const judgeAbove =
				rule.judgeAbove === undefined
					? ''
					: `; less, but more than ${exprWords(rule.judgeAbove, words)}, the inspector judges`;
			return `${open(rule.min) ? '' : 'at least '}${value(rule.min)}${judgeAbove}`;
		}
		case 'range': {
			const [min, max] = [exprWords(rule.min, words), exprWords(rule.max, words)];
			return min === max && typeof rule.min === 'object' && 'open' in rule.min
				? min
				: `${min} to ${max}`;
		}
		case 'banded': {
			const band = rule.band
				? `; deeper, up to ${exprWords(rule.band.upTo, words)}, over at most ${allowanceWords(rule.band.length, units)}`
				: '';
			return `at most ${value(rule.max)} at any length${band}`;
		}
		case 'length':
			return `at most ${allowanceWords(rule.allowance, units)}`;
	}
}
