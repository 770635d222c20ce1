/** Inputs about accounts: one zod schema each, shared by forms, API routes and tests. */
import { z } from 'zod';
import { PROJECT_ROLES } from '$lib/permissions';
import { text } from './text';

export const email = z
	.string()
	.trim()
	.toLowerCase()
	.pipe(z.email({ error: 'Enter an e-mail address such as name@company.com.' }));

/** NIST SP 800-63B asks for at least 8; we ask for 12 and no other composition rules. */
export const PASSWORD_MIN_LENGTH = 12;

export const newPassword = z
	.string()
	.min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters.` })
	.max(200, { error: 'Use at most 200 characters.' });

export const credentialsSchema = z.object({
	email,
	password: z.string().min(1, { error: 'Enter your password.' }).max(200)
});

export const linkRequestSchema = z.object({ email });

export const changePasswordSchema = z
	.object({
		current: z.string().max(200).default(''),
		password: newPassword,
		confirm: z.string()
	})
	.refine((v) => v.password === v.confirm, {
		error: 'The two new passwords differ.',
		path: ['confirm']
	});

export const tokenCreateSchema = z.object({
	name: text('The token name', 80, {
		min: 1,
		minError: 'Name the token, e.g. "weld log export script".'
	})
});

export const inviteSchema = z.object({
	email,
	name: text('The name', 120, { min: 1, minError: 'Enter the person’s name.' }),
	projectId: z.coerce.number().int().positive().optional(),
	role: z.enum(PROJECT_ROLES).optional()
});

export const membershipSchema = z.object({
	email,
	role: z.enum(PROJECT_ROLES, { error: 'Choose a role.' })
});

/** A member of the project, as the members list names them. */
const memberId = z
	.string({ error: 'Choose the member.' })
	.trim()
	.min(1, { error: 'Choose the member.' })
	.max(64, { error: 'Choose the member.' });

/** A member's new role on the project. */
export const memberRoleSchema = z.object({
	userId: memberId,
	role: z.enum(PROJECT_ROLES, { error: 'Choose one of the roles.' })
});

/** A member taken off the project. */
export const memberRemoveSchema = z.object({ userId: memberId });
