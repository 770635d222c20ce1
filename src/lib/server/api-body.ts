/** Reading and checking a JSON body against its zod schema, for the API routes. */
import type { z } from 'zod';
import { apiError, invalid } from './api';

/**
 * The JSON body of a request, or the answer to give when there is none: 413 for a body over
 * the size limit (the reader stops at it), 400 for anything that is not JSON.
 */
export async function readJson(
	request: Request
): Promise<{ body: unknown } | { response: Response }> {
	try {
		return { body: await request.json() };
	} catch (error) {
		if ((error as { status?: unknown } | null)?.status === 413)
			return {
				response: apiError(
					413,
					`The request body is larger than the ${process.env.BODY_SIZE_LIMIT || '512K'} limit.`
				)
			};
		return { response: apiError(400, 'Send a JSON body.') };
	}
}

export async function parseBody<T extends z.ZodType>(
	request: Request,
	schema: T
): Promise<{ data: z.infer<T> } | { response: Response }> {
	const read = await readJson(request);
	if ('response' in read) return read;
	const result = schema.safeParse(read.body);
	return result.success ? { data: result.data } : { response: invalid(result) };
}
