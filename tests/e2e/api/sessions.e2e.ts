/**
 * Sessions end when they should: signing out, a password change, an administrator's reset
 * and disabling an account end every session the person had; reset and disable end their
 * personal API tokens too, and enabling the account again brings none of it back. Each test
 * works on a person invited here, so the demo accounts stay as they are.
 */
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, latestMail, mailAfter, signedInClient } from '../support';

/** New for every run of this file, so a retry starts from a fresh account. */
const PERSON = `session-check-${Date.now()}@tacksheet.test`;
const PASSWORD = 'choose-a-long-one-1';

let admin: APIRequestContext;
let personId: string;

/** A form action posted as the page's own script posts it; the answer is SvelteKit's JSON. */
async function action(client: APIRequestContext, url: string, form: Record<string, string>) {
	const response = await client.post(url, {
		form,
		headers: { origin: BASE_URL, 'x-sveltekit-action': 'true', accept: 'application/json' },
		maxRedirects: 0
	});
	return { status: response.status(), body: await response.json().catch(() => null) };
}

/** Signs in with the next link e-mailed to the person (after `seen` mails), as a click would. */
async function signInByLink(email: string, seen: number): Promise<APIRequestContext> {
	const { text } = await mailAfter(email, seen);
	const link = /https?:\/\/\S+\/auth\/callback\/nodemailer\S+/.exec(text)?.[0];
	expect(link, `a sign-in link in the mail to ${email}`).toBeTruthy();
	const client = await newRequest.newContext({ baseURL: BASE_URL });
	await client.get(link!);
	expect((await client.get('/api/me')).status()).toBe(200);
	return client;
}

async function setPassword(client: APIRequestContext, current: string, password: string) {
	const answer = await action(client, '/account?/password', {
		current,
		password,
		confirm: password
	});
	expect(answer.status).toBe(200);
	expect(answer.body?.type).toBe('success');
}

/** A second client holding the same cookies: the session as it was at this moment. */
async function copyOf(client: APIRequestContext): Promise<APIRequestContext> {
	return newRequest.newContext({ baseURL: BASE_URL, storageState: await client.storageState() });
}

async function me(client: APIRequestContext, token?: string) {
	return (
		await client.get('/api/me', token ? { headers: { authorization: `Bearer ${token}` } } : {})
	).status();
}

async function newToken(client: APIRequestContext): Promise<string> {
	const response = await client.post('/api/tokens', {
		data: { name: 'session check' },
		headers: { origin: BASE_URL }
	});
	expect(response.status()).toBe(201);
	return (await response.json()).token;
}

test.beforeAll(async () => {
	admin = await signedInClient('admin@tacksheet.test');
	const invited = await action(admin, '/admin/users?/invite', {
		email: PERSON,
		name: 'Session Check'
	});
	expect(invited.body?.type).toBe('success');
	const first = await signInByLink(PERSON, 0);
	await setPassword(first, '', PASSWORD);
	personId = (await (await first.get('/api/me')).json()).id;
	await first.dispose();
});
test.afterAll(async () => admin.dispose());

test('signing out ends that session and every other session of the person', async () => {
	const here = await signedInClient(PERSON, PASSWORD);
	const elsewhere = await signedInClient(PERSON, PASSWORD);
	const kept = await copyOf(here);
	expect(await me(kept)).toBe(200);
	const out = await here.post('/signout', {
		form: {},
		headers: { origin: BASE_URL },
		maxRedirects: 0
	});
	expect(out.status()).toBeLessThan(400);
	expect(await me(kept), 'the cookie kept from before the sign-out').toBe(401);
	expect(await (await kept.get('/auth/session')).json(), "Auth.js's session endpoint").toBeNull();
	expect(await me(elsewhere), 'a session on another device').toBe(401);
	const again = await signedInClient(PERSON, PASSWORD);
	expect(await me(again)).toBe(200);
	for (const c of [here, elsewhere, kept, again]) await c.dispose();
});

test('a password change ends every other session; the one that made it goes on', async () => {
	const here = await signedInClient(PERSON, PASSWORD);
	const elsewhere = await signedInClient(PERSON, PASSWORD);
	const token = await newToken(elsewhere);
	await setPassword(here, PASSWORD, `${PASSWORD}-2`);
	expect(await me(here)).toBe(200);
	expect(await me(elsewhere)).toBe(401);
	// A personal API token is the person's own key for scripts: a password change keeps it.
	const script = await newRequest.newContext({ baseURL: BASE_URL });
	expect(await me(script, token)).toBe(200);
	await setPassword(here, `${PASSWORD}-2`, PASSWORD);
	for (const c of [here, elsewhere, script]) await c.dispose();
});

test("an administrator's reset ends every session and token; the old session cannot set a password", async () => {
	const held = await signedInClient(PERSON, PASSWORD);
	const token = await newToken(held);
	const seen = mailCount(PERSON);
	const reset = await action(admin, '/admin/users?/reset', { userId: personId });
	expect(reset.status).toBe(200);
	expect(await me(held)).toBe(401);
	const script = await newRequest.newContext({ baseURL: BASE_URL });
	expect(await me(script, token)).toBe(401);
	const taken = await action(held, '/account?/password', {
		current: '',
		password: 'taken-over-account-1',
		confirm: 'taken-over-account-1'
	});
	expect(taken.body?.type).not.toBe('success');
	expect(
		(
			await script.post('/auth/callback/credentials', {
				form: { email: PERSON, password: 'taken-over-account-1', callbackUrl: '/' },
				headers: { origin: BASE_URL },
				maxRedirects: 0
			})
		).headers()['location']
	).toContain('error=');
	// The person signs in with the link the reset sent and chooses a password again.
	const back = await signInByLink(PERSON, seen);
	await setPassword(back, '', PASSWORD);
	for (const c of [held, script, back]) await c.dispose();
});

test('disabling ends sessions and tokens; enabling again brings neither back', async () => {
	const held = await signedInClient(PERSON, PASSWORD);
	const token = await newToken(held);
	expect((await action(admin, '/admin/users?/disable', { userId: personId })).status).toBe(200);
	const script = await newRequest.newContext({ baseURL: BASE_URL });
	expect(await me(held)).toBe(401);
	expect(await me(script, token)).toBe(401);
	expect((await action(admin, '/admin/users?/enable', { userId: personId })).status).toBe(200);
	expect(await me(held), 'the session from before the disable').toBe(401);
	expect(await me(script, token), 'the token from before the disable').toBe(401);
	const fresh = await signedInClient(PERSON, PASSWORD);
	expect(await me(fresh)).toBe(200);
	for (const c of [held, script, fresh]) await c.dispose();
});

test('sign-in links are limited per address; the answer is the same either way', async () => {
	const before = mailCount(PERSON);
	const client = await newRequest.newContext({ baseURL: BASE_URL });
	const answers = new Set<string>();
	for (let i = 0; i < 5; i++) {
		const response = await client.post('/signin/link', {
			form: { email: PERSON },
			headers: { origin: BASE_URL, 'x-sveltekit-action': 'true', accept: 'application/json' },
			maxRedirects: 0
		});
		answers.add(`${response.status()} ${await response.text()}`);
	}
	// Straight to Auth.js, as a script would: counted against the same address.
	for (let i = 0; i < 2; i++) {
		const response = await client.post('/auth/signin/nodemailer', {
			form: { email: PERSON, callbackUrl: '/' },
			headers: { origin: BASE_URL },
			maxRedirects: 0
		});
		expect(response.status()).toBe(302);
		expect(response.headers()['location']).toContain('/signin/check-email');
	}
	expect(answers.size, [...answers].join('\n')).toBe(1);
	expect([...answers][0]).toContain('/signin/check-email');
	// Three links an address per 15 minutes (sign-in-guard.ts); the mail stand-in takes a moment.
	await mailAfter(PERSON, before + 2);
	await new Promise((r) => setTimeout(r, 1000));
	expect(mailCount(PERSON) - before).toBe(3);
	await client.dispose();
});

function mailCount(to: string): number {
	return latestMail(to)?.count ?? 0;
}
