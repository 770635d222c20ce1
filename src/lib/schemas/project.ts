/** A project's settings, as the administrator edits them. */
import { z } from 'zod';
import { text } from './text';

const percent = z.coerce
	.number()
	.min(0, { error: 'At least 0 %.' })
	.max(100, { error: 'At most 100 %.' });

export const projectSettingsSchema = z.object({
	name: text('The name', 160, { min: 1, minError: 'Name the project.' }),
	client: text('The client', 160).default(''),
	contractor: text('The contractor', 160).default(''),
	site: text('The site', 160).default(''),
	/** A built-in set or one of the project's own; the action checks it belongs to the project. */
	defaultCriteriaSet: z
		.string({ error: 'Choose a criteria set.' })
		.trim()
		.min(1, { error: 'Choose a criteria set.' }),
	shopPrefix: z
		.string()
		.trim()
		.max(8)
		.regex(/^[A-Za-z0-9-]*$/, { error: 'Letters, digits and "-" only.' })
		.default(''),
	fieldPrefix: z
		.string()
		.trim()
		.max(8)
		.regex(/^[A-Za-z0-9-]*$/, { error: 'Letters, digits and "-" only.' })
		.default('FW-'),
	sequence: z.enum(['drawing', 'line']).default('drawing'),
	lotGroupBy: z.enum(['line', 'system', 'drawing', 'week']).default('line'),
	rtPercent: percent.default(5),
	utPercent: percent.default(0),
	everyWelder: z.boolean().default(true)
});
