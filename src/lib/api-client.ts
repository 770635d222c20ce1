/**
 * The browser's one way of calling the JSON API: JSON in and out, and a refusal turned into
 * an `ApiFailure` (the status, the server's message, the field it names) that the screen
 * shows as it is. A lost connection is a failure too (status 0), with words a person can act
 * on; a cancelled request (its AbortSignal fired) is thrown on unchanged.
 */

export interface ApiFailure {
	status: number;
	error: string;
	field?: string;
}

export function isApiFailure(value: unknown): value is ApiFailure {
	return typeof value === 'object' && value !== null && 'status' in value && 'error' in value;
}

/** The failure's own message, or the fallback for anything that is not an API failure. */
export function failureText(failure: unknown, fallback: string): string {
	return isApiFailure(failure) ? failure.error : fallback;
}

/** A 409: someone else changed the record meanwhile; the screen reloads it. */
export function isStale(failure: unknown): boolean {
	return isApiFailure(failure) && failure.status === 409;
}

export function isAbortError(error: unknown): boolean {
	return error instanceof DOMException && error.name === 'AbortError';
}

const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * A fresh `Idempotency-Key` for a write, so a retry of the same call is answered once by the
 * server. Only in a secure context (https or localhost) does the browser offer randomUUID.
 */
export function newIdempotencyKey(): string | undefined {
	return globalThis.crypto?.randomUUID?.();
}

export async function callApi<T>(url: string, init: RequestInit = {}): Promise<T> {
	let response: Response;
	const key = WRITES.has((init.method ?? 'GET').toUpperCase()) ? newIdempotencyKey() : undefined;
	try {
		response = await fetch(url, {
			...init,
			headers: {
				...(init.body !== undefined && !(init.body instanceof FormData)
					? { 'content-type': 'application/json' }
					: {}),
				...(key ? { 'idempotency-key': key } : {}),
				accept: 'application/json',
				...(init.headers ?? {})
			}
		});
	} catch (error) {
		if (isAbortError(error)) throw error;
		throw {
			status: 0,
			error: 'The server could not be reached. Check the connection and try again.'
		} satisfies ApiFailure;
	}
	const body = await response.json().catch(() => ({}));
	if (!response.ok) {
		throw {
			status: response.status,
			error: body.error ?? `The server answered ${response.status}.`,
			...(body.field ? { field: body.field } : {})
		} satisfies ApiFailure;
	}
	return body as T;
}
