/** A project's settings, as the administrator edits them. */
import { z } from 'zod';
import { text } from './text';

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
	sequence: z.enum(['drawing', 'line']).default('drawing')
});
