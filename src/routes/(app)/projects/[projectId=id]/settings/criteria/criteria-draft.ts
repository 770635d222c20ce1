/**
 * The criteria set editor's draft: each check's limit as typed in the project's units, read
 * from a stored override and sent to the API as it stands. Pure.
 */
import {
	checkIds,
	limitUnit,
	typedValue,
	type CheckId,
	type CriteriaSet,
	type Expr,
	type LimitOverride,
	type LimitUnit,
	type Rule
} from '$lib/acceptance';
import { ruleTypesFor, type LimitOverrideInput, type RuleType } from '$lib/schemas/criteria-set';
import type { UnitSystem } from '$lib/units';

export interface LimitDraft {
	changed: boolean;
	type: RuleType;
	min: string;
	max: string;
	bandUpTo: string;
	bandLength: string;
	inspectorJudges: boolean;
	clause: string;
	note: string;
}

export interface SetDraft {
	/** the version being revised; undefined when deriving a new set */
	revises?: number;
	base: string;
	id: string;
	name: string;
	limits: Record<CheckId, LimitDraft>;
}

function text(expr: Expr | undefined, unit: LimitUnit, units: UnitSystem): string {
	if (typeof expr !== 'number' || unit === 'flag') return '';
	return typedValue(expr, unit, units);
}

/** The editor's rule type for a limit: an accumulated length is edited as a greatest value. */
const editedType = (type: Rule['type']): RuleType => (type === 'length' ? 'max' : type);

/** A check as the base has it: unchanged, its rule type offered first when changed. */
function unchanged(check: CheckId, base: CriteriaSet): LimitDraft {
	const baseRule = base.limits[check]?.rule;
	const baseType = baseRule && editedType(baseRule.type);
	const types = ruleTypesFor(check);
	return {
		changed: false,
		type: baseType && types.includes(baseType) ? baseType : types[0],
		min: '',
		max: '',
		bandUpTo: '',
		bandLength: '',
		inspectorJudges: false,
		clause: '',
		note: ''
	};
}

function fromOverride(check: CheckId, override: LimitOverride, units: UnitSystem): LimitDraft {
	const { rule } = override;
	const unit = limitUnit(check);
	const draft: LimitDraft = {
		changed: true,
		type: editedType(rule.type),
		min: 'min' in rule ? text(rule.min, unit, units) : '',
		max:
			'max' in rule
				? text(rule.max, unit, units)
				: rule.type === 'length' && 'max' in rule.allowance
					? text(rule.allowance.max, unit, units)
					: '',
		bandUpTo: rule.type === 'banded' && rule.band ? text(rule.band.upTo, unit, units) : '',
		bandLength:
			rule.type === 'banded' && rule.band && 'max' in rule.band.length
				? text(rule.band.length.max, 'mm', units)
				: '',
		inspectorJudges: 'beyond' in rule && rule.beyond === 'judge',
		clause: override.clause ?? '',
		note: override.note ?? ''
	};
	return draft;
}

/** A new set derived from `base`, nothing changed yet. */
export function newDraft(base: CriteriaSet): SetDraft {
	return {
		base: base.id,
		id: '',
		name: '',
		limits: Object.fromEntries(checkIds.map((check) => [check, unchanged(check, base)])) as Record<
			CheckId,
			LimitDraft
		>
	};
}

/** The next version of a project set: its changed limits as they stand, typed back. */
export function revisionDraft(set: CriteriaSet, base: CriteriaSet, units: UnitSystem): SetDraft {
	const changed = new Set(set.changed ?? []);
	return {
		revises: set.version,
		base: base.id,
		id: set.id,
		name: set.name,
		limits: Object.fromEntries(
			checkIds.map((check) => {
				const limit = set.limits[check];
				return [
					check,
					changed.has(check) && limit ? fromOverride(check, limit, units) : unchanged(check, base)
				];
			})
		) as Record<CheckId, LimitDraft>
	};
}

/** The request body: the changed limits only, blank parts left out. */
export function requestBody(draft: SetDraft) {
	const overrides: Partial<Record<CheckId, LimitOverrideInput>> = {};
	for (const check of checkIds) {
		const limit = draft.limits[check];
		if (!limit.changed) continue;
		const input: LimitOverrideInput = {
			type: limit.type,
			inspectorJudges: limit.inspectorJudges,
			clause: limit.clause,
			note: limit.note
		};
		for (const part of ['min', 'max', 'bandUpTo', 'bandLength'] as const) {
			if (limit[part].trim() !== '') input[part] = limit[part].trim();
		}
		overrides[check] = input;
	}
	return {
		id: draft.id,
		name: draft.name,
		...(draft.revises === undefined ? { base: draft.base } : { revises: draft.revises }),
		overrides
	};
}
