import { expect, request as newRequest, test } from '@playwright/test';
import { BASE_URL } from '../support';

test('repeated failed sign-ins for one address are slowed, then refused with 429', async () => {
	test.setTimeout(90_000);
	const client = await newRequest.newContext({ baseURL: BASE_URL });
	const attempt = async (password: string) => {
		const started = Date.now();
		const response = await client.post('/auth/callback/credentials', {
			form: { email: 'no-such-person@tacksheet.test', password, callbackUrl: '/' },
			headers: { origin: BASE_URL },
			maxRedirects: 0
		});
		return { response, ms: Date.now() - started };
	};
	const times: number[] = [];
	for (let i = 0; i < 8; i++) {
		const { response, ms } = await attempt(`wrong-${i}`);
		expect(response.status()).toBe(302);
		expect(response.headers()['location']).toContain('error=CredentialsSignin');
		times.push(ms);
	}
	// From the fourth failure on, each attempt waits longer (0.5 s, 1 s, 2 s …).
	expect(times[5]).toBeGreaterThan(900);
	// The answer is the same whether or not the address has an account.
	const refused = await attempt('tacksheet-demo');
	expect(refused.response.status()).toBe(429);
	expect(refused.response.headers()['retry-after']).toMatch(/^\d+$/);
	expect((await refused.response.json()).error).toMatch(/Too many failed sign-ins/);
	await client.dispose();
});

test('the lock-out counts the address Auth.js signs in: a second email field or a JSON body is refused too', async () => {
	// Runs after the test above, which locked no-such-person@tacksheet.test.
	const client = await newRequest.newContext({ baseURL: BASE_URL });
	const repeated = await client.post('/auth/callback/credentials', {
		data: new URLSearchParams([
			['email', 'someone-else@tacksheet.test'],
			['email', 'no-such-person@tacksheet.test'],
			['password', 'tacksheet-demo'],
			['callbackUrl', '/']
		]).toString(),
		headers: { origin: BASE_URL, 'content-type': 'application/x-www-form-urlencoded' },
		maxRedirects: 0
	});
	expect(repeated.status()).toBe(429);
	const asJson = await client.post('/auth/callback/credentials', {
		data: { email: 'No-Such-Person@tacksheet.test ', password: 'tacksheet-demo', callbackUrl: '/' },
		headers: { origin: BASE_URL },
		maxRedirects: 0
	});
	expect(asJson.status()).toBe(429);
	await client.dispose();
});
