/**
 * Inputs about joints and pins: one zod schema each, shared by the joint card, the API and
 * the tests. Lengths arrive as typed (`3/8`, `9.5 mm`) and are read by the units module.
 */
import { z } from 'zod';
import { JOINT_KINDS, JOINT_LOCATIONS, REASON_MIN_LENGTH } from '$lib/domain';
import { outsideDiameterMm } from '$lib/pipe-sizes';
import { note, text } from './text';
import { parseLength, type UnitSystem } from '$lib/units';
import { quantitySpec } from '$lib/acceptance/readings';

export const weldNumber = z
	.string()
	.trim()
	.min(1, { error: 'Enter the weld number.' })
	.max(24, { error: 'A weld number has at most 24 characters.' })
	.regex(/^[A-Za-z0-9][A-Za-z0-9./-]*$/, {
		error: 'Use letters, digits, "-", "/" or "." in a weld number.'
	});

/**
 * The joint's version as the client last read it. Every write that changes a joint sends it;
 * a joint changed since answers 409, so nobody overwrites a record they have not seen.
 */
export const jointVersion = z
	.number({ error: 'Send the joint version you last saw.' })
	.int({ error: 'The joint version is a whole number.' })
	.min(1, { error: 'The joint version is a whole number from 1.' });

export const jointFields = z.object({
	kind: z.enum(JOINT_KINDS, { error: 'Choose butt, fillet, socket or branch.' }),
	location: z.enum(JOINT_LOCATIONS, { error: 'Choose shop or field.' }),
	line: text('The line', 120),
	spool: text('The spool', 60),
	/** Nominal size (`6`, `NPS 6`, `DN150`) or an outside diameter with its unit. */
	size: text('The size', 40),
	thickness: text('The thickness', 40),
	requiredSize: text('The required size', 40),
	material: text('The material', 120),
	wps: text('The WPS', 60),
	/** The joint's WPS from the project's register; null names none. */
	wpsId: z
		.number({ error: "Choose a WPS from the project's register." })
		.int({ error: "Choose a WPS from the project's register." })
		.min(1, { error: "Choose a WPS from the project's register." })
		.nullable(),
	/** A built-in set or one of the project's own; the server checks it belongs to the project. */
	criteriaSetId: z
		.string({ error: 'Choose one of the criteria sets.' })
		.trim()
		.min(1, { error: 'Choose one of the criteria sets.' })
		.max(80),
	ndeRequired: text('The NDE requirement', 40)
});
export type JointFields = z.infer<typeof jointFields>;

export const createPinSchema = z.object({
	pageIndex: z.number().int().min(0),
	x: z.number().finite(),
	y: z.number().finite(),
	/** A number of one's own; by default the next in the project's sequence. */
	number: weldNumber.optional(),
	/** Insert between numbers: the new joint takes `5A` after `5`. */
	insertAfter: weldNumber.optional(),
	joint: jointFields.partial().default({})
});

export const movePinSchema = z.object({
	x: z.number().finite(),
	y: z.number().finite(),
	pageIndex: z.number().int().min(0).optional(),
	version: jointVersion
});

export const updateJointSchema = jointFields.partial().extend({
	number: weldNumber.optional(),
	version: jointVersion
});

export const voidJointSchema = z.object({
	reason: note('The reason', 300, {
		min: REASON_MIN_LENGTH,
		minError: 'Say why the joint is voided (at least a few words).'
	}),
	version: jointVersion
});

/** A cut-out: the joint is voided with the reason and a joint with the N-suffixed number replaces it. */
export const cutOutSchema = z.object({
	reason: note('The reason', 300, {
		min: REASON_MIN_LENGTH,
		minError: 'Say why the joint is cut out (e.g. "RT reject after R2", "client request").'
	}),
	version: jointVersion
});
export type CutOut = z.infer<typeof cutOutSchema>;

export const reviewPinSchema = z.object({
	version: jointVersion
});

export interface LengthColumns {
	sizeText?: string;
	diameterMm?: number | null;
	thicknessText?: string;
	thicknessMm?: number | null;
	requiredSizeText?: string;
	requiredSizeMm?: number | null;
}

/**
 * Read the typed sizes into millimetres, keeping the text: a nominal pipe size gives its
 * outside diameter; anything unreadable is an error naming the field.
 */
export function jointLengths(
	fields: Partial<Pick<JointFields, 'size' | 'thickness' | 'requiredSize'>>,
	units: UnitSystem
): { ok: true; values: LengthColumns } | { ok: false; field: string; message: string } {
	const values: LengthColumns = {};
	if (fields.size !== undefined) {
		values.sizeText = fields.size;
		if (!fields.size) values.diameterMm = null;
		else {
			const nominal = outsideDiameterMm(fields.size);
			if (nominal !== null) values.diameterMm = nominal;
			else if (/[a-z"]/i.test(fields.size.replace(/^(nps|dn)/i, ''))) {
				const parsed = parseLength(fields.size, {
					units,
					reading: {
						label: 'Size',
						kind: 'length',
						plausible: { min: 0, max: 5000, minExclusive: true }
					}
				});
				if (!parsed.ok) return { ok: false, field: 'joint.size', message: parsed.message };
				values.diameterMm = parsed.value;
			} else {
				return {
					ok: false,
					field: 'joint.size',
					message: `Size "${fields.size}" is not a nominal pipe size (e.g. 6, NPS 6, DN150) nor a diameter with its unit.`
				};
			}
		}
	}
	for (const [field, textKey, mmKey] of [
		['thickness', 'thicknessText', 'thicknessMm'],
		['requiredSize', 'requiredSizeText', 'requiredSizeMm']
	] as const) {
		const typed = fields[field];
		if (typed === undefined) continue;
		values[textKey] = typed;
		if (!typed) {
			values[mmKey] = null;
			continue;
		}
		const parsed = parseLength(typed, { units, reading: quantitySpec(field) });
		if (!parsed.ok) return { ok: false, field: `joint.${field}`, message: parsed.message };
		values[mmKey] = parsed.value;
	}
	return { ok: true, values };
}

/** Which suggestions of a revision: some numbers, or all of them. */
const suggestionChoice = {
	numbers: z
		.array(weldNumber)
		.min(1, { error: 'Name at least one suggested number, or send "all": true.' })
		.max(5000)
		.optional(),
	all: z.literal(true, { error: '"all" is true when sent.' }).optional()
};
const oneChoice = (value: { numbers?: string[]; all?: true }) =>
	(value.numbers !== undefined) !== (value.all === true);
const choiceError = { error: 'Send either "numbers": [...] or "all": true.', path: ['numbers'] };

/** Accept suggestions: joints made with these defaults (kind, shop or field, criteria set …). */
export const acceptSuggestionsSchema = z
	.object({ ...suggestionChoice, joint: jointFields.partial().default({}) })
	.refine(oneChoice, choiceError);

export const dismissSuggestionsSchema = z.object(suggestionChoice).refine(oneChoice, choiceError);
