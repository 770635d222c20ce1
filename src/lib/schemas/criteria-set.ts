/**
 * A project's own criteria set as the administrator derives or revises it: one zod schema
 * shared by the settings page, the API and the tests, and the reading of the limits typed in
 * the project's units into the millimetres and degrees the engine judges by.
 */
import { z } from 'zod';
import { note, text } from './text';
import {
	checkIds,
	hasLengthPart,
	limitUnit,
	parseReading,
	type CheckId,
	type LimitOverride,
	type Rule
} from '$lib/acceptance';
import { parseAngle, parseLength, type UnitSystem } from '$lib/units';
import type { QuantitySpec } from '$lib/acceptance/readings';

/** Lower-case letters, digits, "." and "-", as the built-in ids (`asme-b31.3-normal`). */
export const CRITERIA_SET_ID = /^[a-z0-9](?:[a-z0-9.-]*[a-z0-9])?$/;

export const criteriaSetId = z
	.string({ error: 'Give the set an id, such as "pl-01-undercut".' })
	.trim()
	.toLowerCase()
	.min(1, { error: 'Give the set an id, such as "pl-01-undercut".' })
	.max(60, { error: 'An id has at most 60 characters.' })
	.regex(CRITERIA_SET_ID, {
		error: 'Use letters, digits, "." and "-" in an id, starting and ending with a letter or digit.'
	});

export const RULE_TYPES = ['absent', 'max', 'min', 'range', 'banded'] as const;
export type RuleType = (typeof RULE_TYPES)[number];

export const RULE_TYPE_WORDS: Record<RuleType, string> = {
	absent: 'none allowed',
	max: 'at most',
	min: 'at least',
	range: 'from … to',
	banded: 'at most, deeper over a limited length'
};

/** A limit as typed in the project's units (`1/32`, `0.8 mm`, `37.5°`), or a number of mm or degrees. */
const limitValue = z.union([z.string().trim().max(40), z.number()], {
	error:
		'Give a limit as typed, such as "1/32 in" or "0.8 mm", or a number of millimetres (degrees for an angle).'
});

export const limitOverrideSchema = z.object({
	type: z.enum(RULE_TYPES, { error: `The rule is one of ${RULE_TYPES.join(', ')}.` }),
	min: limitValue.optional(),
	max: limitValue.optional(),
	/** banded: how deep the imperfection may go over a limited length… */
	bandUpTo: limitValue.optional(),
	/** …and that length in all */
	bandLength: limitValue.optional(),
	/** past the limit the inspector judges instead of the engine rejecting (none allowed, at most) */
	inspectorJudges: z.boolean().default(false),
	clause: z
		.string({ error: 'Name the project specification clause that sets this limit.' })
		.trim()
		.min(1, { error: 'Name the project specification clause that sets this limit.' })
		.max(160, { error: 'A clause has at most 160 characters.' }),
	note: note('A note', 500).default('')
});
export type LimitOverrideInput = z.input<typeof limitOverrideSchema>;

const overridesSchema = z
	.record(z.string(), z.unknown())
	.superRefine((overrides, ctx) => {
		for (const check of Object.keys(overrides)) {
			if ((checkIds as readonly string[]).includes(check)) continue;
			ctx.addIssue({
				code: 'custom',
				path: [check],
				message: `Unknown check "${check}"; use one of: ${checkIds.join(', ')}.`
			});
		}
	})
	.pipe(z.record(z.string(), limitOverrideSchema));

/**
 * Derive a new set (`base` given) or revise one of the project's sets (`revises`: the version
 * the change was made on). `overrides` are every limit the set changes from its base, each
 * with the project clause that sets it; a revision sends them all again, not only the new ones.
 */
export const criteriaSetSchema = z
	.object({
		id: criteriaSetId,
		name: text('A name', 120, {
			min: 1,
			minError: 'Name the set, such as "PL-01 process piping".'
		}),
		base: z.string().trim().min(1).max(80).optional(),
		revises: z.number().int().min(1).optional(),
		overrides: overridesSchema.default({})
	})
	.superRefine((input, ctx) => {
		if ((input.base === undefined) === (input.revises === undefined)) {
			ctx.addIssue({
				code: 'custom',
				path: ['base'],
				message:
					'Send "base" (the set to derive from) to create a set, or "revises" (the version you changed) to revise one.'
			});
		}
	});
export type CriteriaSetInput = z.infer<typeof criteriaSetSchema>;

/** What a criteria set picker offers: the built-in sets, then the project's own. */
export interface CriteriaChoice {
	id: string;
	name: string;
	version: number;
	builtIn: boolean;
}

export type OverridesResult =
	| { ok: true; overrides: Partial<Record<CheckId, LimitOverride>> }
	| { ok: false; field: string; message: string };

/** Which rules a check can take: a flag is present or not; only some checks read a length. */
export function ruleTypesFor(check: CheckId): readonly RuleType[] {
	if (limitUnit(check) === 'flag') return ['absent'];
	return RULE_TYPES.filter((type) => type !== 'banded' || hasLengthPart(check));
}

class Refused extends Error {
	constructor(
		readonly field: string,
		message: string
	) {
		super(message);
	}
}

/**
 * The typed limits read into rules in mm and degrees. A bare number takes the project's unit
 * system, a JSON number is already mm (or degrees); anything unreadable names its field,
 * such as `overrides.undercut.depth.max`.
 */
export function readOverrides(
	overrides: CriteriaSetInput['overrides'],
	units: UnitSystem
): OverridesResult {
	const read: Partial<Record<CheckId, LimitOverride>> = {};
	try {
		for (const [key, input] of Object.entries(overrides)) {
			const check = key as CheckId;
			const field = `overrides.${check}`;
			if (!ruleTypesFor(check).includes(input.type)) {
				throw new Refused(
					`${field}.type`,
					`${check} takes ${ruleTypesFor(check).join(' or ')}, not ${input.type}.`
				);
			}
			const override: LimitOverride = {
				rule: ruleOf(check, input, field, units),
				clause: input.clause
			};
			if (input.note) override.note = input.note;
			read[check] = override;
		}
	} catch (error) {
		if (error instanceof Refused) return { ok: false, field: error.field, message: error.message };
		throw error;
	}
	return { ok: true, overrides: read };
}

type OverrideInput = z.infer<typeof limitOverrideSchema>;

function ruleOf(check: CheckId, input: OverrideInput, field: string, units: UnitSystem): Rule {
	const unit = limitUnit(check);
	const value = (part: 'min' | 'max' | 'bandUpTo' | 'bandLength', label: string) => {
		const typed = input[part];
		if (typed === undefined || typed === '') {
			throw new Refused(`${field}.${part}`, `${check}: give the ${label}.`);
		}
		// A count of pores, or a roughness: read as the reading itself is read.
		if ((unit === 'count' || unit === 'um') && part !== 'bandLength') {
			const read = parseReading(unit === 'count' ? 'poreCount' : 'surfaceRoughness', typed, units);
			if (!read.ok) throw new Refused(`${field}.${part}`, `${check} ${label}: ${read.message}`);
			return read.value as number;
		}
		const spec: QuantitySpec =
			unit === 'deg'
				? { label: `${check} ${label}`, kind: 'angle', plausible: { min: 0, max: 90 } }
				: {
						label: `${check} ${label}`,
						kind: 'length',
						// A length allowance can run along a long weld; a depth or size cannot.
						plausible: { min: 0, max: part === 'bandLength' ? 10_000 : 100 }
					};
		const parsed =
			unit === 'deg'
				? parseAngle(typed, { reading: spec })
				: parseLength(typed, { units, reading: spec });
		if (!parsed.ok) throw new Refused(`${field}.${part}`, parsed.message);
		return parsed.value;
	};
	const beyond = input.inspectorJudges ? { beyond: 'judge' as const } : {};
	switch (input.type) {
		case 'absent':
			return { type: 'absent', ...beyond };
		case 'max':
			return { type: 'max', max: value('max', 'greatest value'), ...beyond };
		case 'min':
			return { type: 'min', min: value('min', 'least value') };
		case 'range': {
			const min = value('min', 'least value');
			const max = value('max', 'greatest value');
			if (max < min) {
				throw new Refused(`${field}.max`, `${check}: the greatest value is less than the least.`);
			}
			return { type: 'range', min, max };
		}
		case 'banded': {
			const max = value('max', 'depth allowed at any length');
			const deeper = input.bandUpTo !== undefined && input.bandUpTo !== '';
			const length = input.bandLength !== undefined && input.bandLength !== '';
			if (!deeper && !length) return { type: 'banded', max };
			const upTo = value('bandUpTo', 'depth allowed over a limited length');
			const total = value('bandLength', 'length allowed in all');
			if (upTo < max) {
				throw new Refused(
					`${field}.bandUpTo`,
					`${check}: the depth allowed over a limited length is less than the depth allowed at any length.`
				);
			}
			return { type: 'banded', max, band: { upTo, length: { max: total } } };
		}
	}
}
