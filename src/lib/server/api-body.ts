/** Reading and checking a JSON body against its zod schema, for the API routes. */
import type { z } from 'zod';
import { apiError, invalid } from './api';

export async function parseBody<T extends z.ZodType>(
	request: Request,
	schema: T
): Promise<{ data: z.infer<T> } | { response: Response }> {
	const body = await request.json().catch(() => undefined);
	if (body === undefined) return { response: apiError(400, 'Send a JSON body.') };
	const result = schema.safeParse(body);
	return result.success ? { data: result.data } : { response: invalid(result) };
}
