import { expect, request as newRequest, test } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';

test('a personal API token works on the API with its owner’s roles, until revoked', async () => {
	const session = await signedInClient('viewer@tacksheet.test');
	const created = await session.post('/api/tokens', { data: { name: 'weld log script' } });
	expect(created.status()).toBe(201);
	const { token, id, prefix } = await created.json();
	expect(token).toMatch(/^tks_[A-Za-z0-9_-]{32}$/);
	expect(token.startsWith(prefix)).toBe(true);

	// Shown once: the list has the prefix, never the token.
	const listed = await (await session.get('/api/tokens')).json();
	expect(JSON.stringify(listed)).not.toContain(token);
	expect(listed.items.find((t: { id: number }) => t.id === id).prefix).toBe(prefix);

	const script = await newRequest.newContext({
		baseURL: BASE_URL,
		extraHTTPHeaders: { authorization: `Bearer ${token}` }
	});
	const me = await script.get('/api/me');
	expect(me.status()).toBe(200);
	expect(await me.json()).toMatchObject({
		email: 'viewer@tacksheet.test',
		via: 'token',
		roles: { '1': 'viewer' }
	});
	const projects = await (await script.get('/api/projects')).json();
	expect(projects.map((p: { code: string }) => p.code)).toEqual(['LBM-20', 'VFT-3']);

	// A token is for the API only; pages still want a session.
	const page = await script.get('/projects', { maxRedirects: 0 });
	expect(page.status()).toBe(303);

	expect((await session.delete(`/api/tokens/${id}`)).status()).toBe(204);
	const after = await script.get('/api/me');
	expect(after.status()).toBe(401);
	expect((await after.json()).error).toMatch(/Sign in/);
	await script.dispose();
	await session.dispose();
});

test('unknown, malformed and missing tokens get 401 JSON', async () => {
	for (const header of ['Bearer tks_nothing-like-a-real-one', 'Bearer ', 'Basic abc']) {
		const client = await newRequest.newContext({
			baseURL: BASE_URL,
			extraHTTPHeaders: { authorization: header }
		});
		const response = await client.get('/api/projects');
		expect(response.status(), header).toBe(401);
		expect(response.headers()['content-type']).toContain('application/json');
		await client.dispose();
	}
});

test('a token cannot be made without a name, nor revoked by someone else', async () => {
	const owner = await signedInClient('foreman@tacksheet.test');
	expect((await owner.post('/api/tokens', { data: { name: '  ' } })).status()).toBe(400);
	const { id } = await (await owner.post('/api/tokens', { data: { name: 'kept' } })).json();
	const other = await signedInClient('turnover@tacksheet.test');
	expect((await other.delete(`/api/tokens/${id}`)).status()).toBe(404);
	expect((await owner.get('/api/tokens')).ok()).toBe(true);
	await owner.dispose();
	await other.dispose();
});
