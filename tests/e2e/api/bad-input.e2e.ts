/**
 * Requests Tacksheet does not take get a 4xx answer that says why, never a 500, signed in or
 * not: a search too long, a method a route does not take, a form action a page does not have,
 * a body over the size limit, an API address that does not exist.
 */
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';

let admin: APIRequestContext;
let anonymous: APIRequestContext;
test.beforeAll(async () => {
	admin = await signedInClient('admin@tacksheet.test');
	anonymous = await newRequest.newContext({ baseURL: BASE_URL });
});
test.afterAll(async () => {
	await admin.dispose();
	await anonymous.dispose();
});

const long = 'x'.repeat(81);

test('a register search over 80 characters is 400 naming the field, on the API and the page', async () => {
	const api = await admin.get(`/api/projects/1/drawings?q=${long}`);
	expect(api.status()).toBe(400);
	expect(await api.json()).toMatchObject({ field: 'q', error: expect.stringMatching(/80/) });
	const page = await admin.get(`/projects/1/drawings?q=${long}`);
	expect(page.status()).toBe(400);
	expect(await page.text()).toContain('Search for at most 80 characters.');
	// Every other list takes the same care.
	for (const url of [
		`/api/projects/1/joints?q=${long}`,
		`/api/projects/1/joints.csv?q=${long}`,
		`/api/projects/1/outstanding?area=${'a'.repeat(200)}`,
		'/api/projects/1/joints?page=0',
		'/api/projects/1/drawings?page=-1&pageSize=100000'
	]) {
		const response = await admin.get(url);
		expect(response.status(), url).toBeLessThan(500);
	}
});

const pagePosts: { what: string; url: string; status: number }[] = [
	{ what: 'no action name, page of named actions', url: '/projects/1/welders', status: 400 },
	{ what: 'no action name, admin page', url: '/admin/users', status: 400 },
	{ what: 'an unknown action', url: '/projects/1/settings?/nope', status: 404 },
	{ what: 'an unknown action beside named ones', url: '/projects/1/welders?/nope', status: 404 },
	{ what: 'a malformed escape in the name', url: '/projects/1/welders?/%E0%A4%A', status: 400 },
	{ what: 'the reserved name "default"', url: '/projects/1/settings?/default', status: 400 },
	{ what: 'a POST to a page with no actions', url: '/projects/1/drawings', status: 405 }
];

for (const caller of ['signed in', 'no session'] as const) {
	for (const { what, url, status } of pagePosts) {
		test(`POST ${url} (${what}), ${caller} → ${status}`, async () => {
			const client = caller === 'signed in' ? admin : anonymous;
			const response = await client.post(url, {
				form: { name: 'x' },
				headers: { origin: BASE_URL },
				maxRedirects: 0
			});
			expect(response.status()).toBe(status);
			if (status === 405) expect(response.headers()['allow']).toBe('GET, HEAD');
		});
	}

	test(`PUT, PATCH and DELETE to a page, ${caller} → 405 with Allow`, async () => {
		const client = caller === 'signed in' ? admin : anonymous;
		for (const method of ['PUT', 'PATCH', 'DELETE']) {
			for (const [url, allow] of [
				['/projects/1/settings', 'GET, HEAD, POST'],
				['/projects/1', 'GET, HEAD'],
				['/signin', 'GET, HEAD, POST']
			]) {
				const response = await client.fetch(url, {
					method,
					headers: { origin: BASE_URL },
					maxRedirects: 0
				});
				expect(response.status(), `${method} ${url}`).toBe(405);
				expect(response.headers()['allow'], `${method} ${url}`).toBe(allow);
			}
		}
	});

	test(`an API method a route does not take, ${caller} → JSON 405 with Allow`, async () => {
		const client = caller === 'signed in' ? admin : anonymous;
		const response = await client.fetch('/api/projects/1/drawings', {
			method: 'PUT',
			headers: { origin: BASE_URL },
			data: {}
		});
		expect(response.status()).toBe(405);
		expect(response.headers()['allow']).toBe('GET, HEAD, POST');
		expect((await response.json()).error).toMatch(/PUT/);
	});

	test(`an API address that does not exist, ${caller} → JSON 404`, async () => {
		const client = caller === 'signed in' ? admin : anonymous;
		for (const url of ['/api/joints/1e3', '/api/joints/-1', '/api/nope', '/api/projects/1/nope']) {
			const response = await client.get(url);
			expect(response.status(), url).toBe(404);
			expect(response.headers()['content-type'], url).toContain('application/json');
			expect((await response.json()).error, url).toBeTruthy();
		}
	});
}

test('a JSON body over the size limit → 413 saying so, not "Send a JSON body."', async () => {
	// adapter-node's BODY_SIZE_LIMIT, 512K by default.
	const big = JSON.stringify({ name: 'x'.repeat(600 * 1024) });
	for (const url of ['/api/tokens', '/api/acceptance/evaluate', '/api/joints/1/inspections']) {
		const response = await admin.post(url, {
			data: big,
			headers: { origin: BASE_URL, 'content-type': 'application/json' }
		});
		expect(response.status(), url).toBe(413);
		expect((await response.json()).error, url).toMatch(/larger than/);
	}
});
