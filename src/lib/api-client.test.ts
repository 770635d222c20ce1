import { afterEach, describe, expect, it, vi } from 'vitest';
import { callApi, failureText, isApiFailure, isStale } from './api-client';

afterEach(() => vi.unstubAllGlobals());

function answering(status: number, body: unknown) {
	const fetch = vi.fn(async () => new Response(JSON.stringify(body), { status }));
	vi.stubGlobal('fetch', fetch);
	return fetch;
}

describe('callApi', () => {
	it('sends JSON and returns the answer', async () => {
		const fetch = answering(201, { id: 4 });
		await expect(callApi('/api/x', { method: 'POST', body: '{}' })).resolves.toEqual({ id: 4 });
		expect(fetch.mock.calls[0]).toEqual([
			'/api/x',
			expect.objectContaining({
				headers: {
					'content-type': 'application/json',
					// A write carries a fresh key, so a retry of it is answered once.
					'idempotency-key': expect.stringMatching(/^[0-9a-f-]{36}$/),
					accept: 'application/json'
				}
			})
		]);
	});

	it('turns a refusal into the server’s message and field', async () => {
		answering(409, {
			error: 'Someone changed this joint since you opened it; reload and check.',
			field: 'version'
		});
		const failure = await callApi('/api/joints/1/inspections').catch((f: unknown) => f);
		expect(failure).toEqual({
			status: 409,
			error: 'Someone changed this joint since you opened it; reload and check.',
			field: 'version'
		});
		expect(isStale(failure)).toBe(true);
	});

	it('says the connection failed when the server cannot be reached', async () => {
		vi.stubGlobal(
			'fetch',
			vi.fn(async () => {
				throw new TypeError('Failed to fetch');
			})
		);
		const failure = await callApi('/api/x').catch((f: unknown) => f);
		expect(isApiFailure(failure) && failure.status).toBe(0);
		expect(failureText(failure, 'fallback')).toMatch(/Check the connection/);
	});

	it('gives a fallback for anything that is not an API failure', () => {
		expect(failureText(new Error('boom'), 'The pins could not be loaded.')).toBe(
			'The pins could not be loaded.'
		);
	});
});
