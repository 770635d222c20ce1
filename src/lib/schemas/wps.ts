/**
 * A WPS as typed: one zod schema for the register's form, its API and each line of a CSV
 * import. Each field is text in the project's units, read by `readWps` (src/lib/wps-register.ts);
 * a list (processes, groups, fillers, PQRs) may also come as a JSON array.
 */
import { z } from 'zod';
import { text } from './text';
import { WPS_FIELDS, WPS_FIELD_LABELS, type WpsField } from '$lib/wps-register';

const MAX: Partial<Record<WpsField, number>> = { number: 40, revision: 20, title: 120 };
const LISTS: readonly WpsField[] = ['processes', 'materialGroups', 'fillerClasses', 'pqrs'];

function field(name: WpsField) {
	const one = text(WPS_FIELD_LABELS[name], MAX[name] ?? 200);
	return z
		.union([z.array(text(WPS_FIELD_LABELS[name], 60)).max(40), one])
		.refine((value) => LISTS.includes(name) || !Array.isArray(value), {
			error: `${WPS_FIELD_LABELS[name]} must be text.`
		})
		.transform((value) => (Array.isArray(value) ? value.join(', ') : value));
}

const shape = Object.fromEntries(
	WPS_FIELDS.map((name) => [name, field(name).optional()])
) as Record<WpsField, z.ZodOptional<ReturnType<typeof field>>>;

/** Every field of a WPS, each text ('' when not given). */
export const wpsSchema = z
	.object(shape)
	.transform(
		(value) =>
			Object.fromEntries(WPS_FIELDS.map((name) => [name, value[name] ?? ''])) as Record<
				WpsField,
				string
			>
	);

/** The form: the same fields, plain text, and the row's version when it edits one. */
export const wpsFormSchema = z.object({
	...(Object.fromEntries(
		WPS_FIELDS.map((name) => [name, text(WPS_FIELD_LABELS[name], MAX[name] ?? 200).default('')])
	) as Record<WpsField, z.ZodDefault<ReturnType<typeof text>>>),
	id: z.coerce.number().int().min(0).default(0),
	version: z.coerce.number().int().min(0).default(0)
});

export const wpsVersion = z
	.number({ error: 'Send the WPS version you last saw.' })
	.int({ error: 'The WPS version is a whole number.' })
	.min(1, { error: 'The WPS version is a whole number from 1.' });

/** A change: the fields that change, and the version it was made on. */
export const wpsPatchSchema = z.object({ ...shape, version: wpsVersion });
