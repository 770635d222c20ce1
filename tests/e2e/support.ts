import path from 'node:path';
import Database from 'better-sqlite3';
import { expect, request as newRequest, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_PASSWORD, DEMO_USERS } from '../../src/lib/server/demo/scenario';

export { DEMO_PASSWORD, DEMO_USERS };

export const BASE_URL = `http://localhost:${process.env.E2E_PORT || 4173}`;
/** The test server's data folder (playwright.config.ts): its database and uploads. */
export const DATA_DIR = path.resolve(`test-results/e2e-${process.env.E2E_PORT || 4173}`);

/** The test server's database, opened read-only beside it (WAL lets both read at once). */
export function readDatabase<T>(read: (db: Database.Database) => T): T {
	const db = new Database(path.join(DATA_DIR, 'tacksheet.db'), { readonly: true });
	try {
		return read(db);
	} finally {
		db.close();
	}
}

/** The newest message the mail stand-in kept for an address, and how many it has. */
export function latestMail(to: string): { text: string; count: number } | undefined {
	return readDatabase((db) => {
		const row = db
			.prepare(
				'select text, (select count(*) from mail_messages where "to" = ?) as count from mail_messages where "to" = ? order by id desc limit 1'
			)
			.get(to, to) as { text: string; count: number } | undefined;
		return row;
	});
}

/** An HTTP client signed in the way a script would: a form post to Auth.js's credentials callback. */
export async function signedInClient(
	email: string,
	password = DEMO_PASSWORD
): Promise<APIRequestContext> {
	const client = await newRequest.newContext({ baseURL: BASE_URL });
	const response = await client.post('/auth/callback/credentials', {
		form: { email, password, callbackUrl: '/projects' },
		headers: { origin: BASE_URL },
		maxRedirects: 0
	});
	expect(response.status(), `sign-in of ${email}`).toBe(302);
	expect(response.headers()['location']).not.toContain('error=');
	return client;
}

export async function signInInBrowser(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
}

/** The newest message the mail stand-in received for an address, read on the admin's mail page. */
export async function latestMailText(page: Page, to: string): Promise<string> {
	await page.goto('/admin/mail');
	await page.getByRole('link').filter({ hasText: to }).first().click();
	await page.getByRole('tab', { name: 'Plain text' }).click();
	return (await page.getByTestId('mail-text').textContent()) ?? '';
}

/** Choose a drawing in a drawing picker: type its number, then tap (or click) its match. */
export async function pickDrawing(page: Page, number: string, label = 'Drawing (all if none)') {
	await page.getByRole('combobox', { name: label }).fill(number);
	const exact = new RegExp(`^${number.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}( |$)`);
	await page
		.getByRole('listbox', { name: 'Matching drawings' })
		.getByRole('option', { name: exact })
		.click();
	await expect(page.getByTestId('drawing-chip').filter({ hasText: number })).toBeVisible();
}

/** Waits until the mail stand-in has kept more than `seen` messages for an address (SMTP is async). */
export async function mailAfter(
	to: string,
	seen: number
): Promise<{ text: string; count: number }> {
	for (let waited = 0; waited < 15_000; waited += 100) {
		const mail = latestMail(to);
		if (mail && mail.count > seen) return mail;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`no new mail for ${to}`);
}
