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

/**
 * What a refused or failed request means and what to do, for an answer without its own
 * message (a proxy's page, a crash): never a bare status code.
 */
export function statusText(status: number): string {
	if (status === 401) return 'You are signed out. Sign in again, then repeat the change.';
	if (status === 403)
		return 'Your role on this project does not allow that. Ask an administrator if you need it.';
	if (status === 404) return 'That is no longer there. Reload the page to see what is.';
	if (status === 409)
		return 'Someone changed this since you opened it. Reload, check what changed, then try again.';
	if (status === 413) return 'That is too large to send.';
	if (status === 429) return 'Too many tries in a short time. Wait a minute, then try again.';
	if (status >= 500)
		return `The server could not finish this (error ${status}); nothing was saved. Try again in a moment; if it keeps failing, tell your administrator.`;
	return `The request was refused (error ${status}). Reload the page and try again.`;
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
			error: body.error ?? statusText(response.status),
			...(body.field ? { field: body.field } : {})
		} satisfies ApiFailure;
	}
	return body as T;
}
