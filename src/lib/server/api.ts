/** Small helpers shared by the JSON API routes. */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';

/** The error shape of every API answer: a message a person can act on, and the field if any. */
export function apiError(status: number, error: string, field?: string): Response {
	return json(field ? { error, field } : { error }, { status });
}

/** The first problem of a failed zod parse, as a 400 answer naming the field. */
export function invalid(result: z.ZodSafeParseError<unknown>): Response {
	const issue = result.error.issues[0];
	const field = issue?.path.join('.') || undefined;
	return apiError(
		400,
		issue ? `${field ? `${field}: ` : ''}${issue.message}` : 'The request is not valid.',
		field
	);
}

/** Query string parameters as a plain object, for a zod schema. */
export function queryOf(url: URL): Record<string, string> {
	return Object.fromEntries(url.searchParams);
}
