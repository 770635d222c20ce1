import { expect, test } from '@playwright/test';
import { DEMO_USERS, latestMailText, signInInBrowser } from './support';
import { ROLE_LABELS } from '../../src/lib/permissions';

for (const user of DEMO_USERS) {
	test(`${user.email} signs in and sees what the role may use`, async ({ page }) => {
		await signInInBrowser(page, user.email);
		await expect(page).toHaveURL(/\/projects$/);
		await expect(page.getByTestId('user-menu')).toContainText(user.name);
		const cards = page.locator('main a[href^="/projects/"]');
		await expect(cards).toHaveCount(user.projects ? user.projects.length : 2);

		await cards.first().click();
		await expect(page.getByRole('navigation', { name: 'Project' })).toBeVisible();
		await expect(page.getByTestId('user-role')).toHaveText(
			user.role ? ROLE_LABELS[user.role] : ROLE_LABELS.admin
		);

		await page.getByTestId('user-menu').click();
		const admin = page.getByRole('link', { name: 'Users and roles' });
		if (user.isAdmin) {
			await expect(admin).toBeVisible();
			await expect(page.getByRole('link', { name: 'Members and roles' })).toBeVisible();
		} else {
			await expect(admin).toHaveCount(0);
			await expect(page.getByRole('link', { name: 'Members and roles' })).toHaveCount(0);
		}
	});
}

test('a wrong password gets a clear message and no session', async ({ page }) => {
	await signInInBrowser(page, 'foreman@tacksheet.test', 'not-the-password');
	await expect(page.getByRole('alert')).toHaveText(/do not match/);
	await expect(page.getByLabel('E-mail')).toHaveValue('foreman@tacksheet.test');
	await expect(page.getByLabel('Password')).toHaveValue('');
	await page.goto('/projects');
	await expect(page).toHaveURL(/\/signin\?returnTo=%2Fprojects/);
});

test('signing out ends the session', async ({ page }) => {
	await signInInBrowser(page, 'viewer@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.getByTestId('user-menu').click();
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/signin/);
	await page.goto('/projects/1');
	await expect(page).toHaveURL(/\/signin\?returnTo=%2Fprojects%2F1/);
	expect((await page.request.get('/api/projects')).status()).toBe(401);
});

test('a sign-in link taken from the mail stand-in signs the user in', async ({ page, browser }) => {
	await page.goto('/signin/link?returnTo=%2Fprojects%2F1%2Fdrawings');
	await page.getByLabel('E-mail').fill('turnover@tacksheet.test');
	await page.getByRole('button', { name: 'Send the link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();

	const admin = await browser.newPage();
	await signInInBrowser(admin, 'admin@tacksheet.test');
	await expect(admin).toHaveURL(/\/projects$/);
	const text = await latestMailText(admin, 'turnover@tacksheet.test');
	expect(text).toContain('TACKSHEET');
	const link = /https?:\/\/\S+\/auth\/callback\/nodemailer\S+/.exec(text)?.[0];
	expect(link, text).toBeTruthy();
	await admin.close();

	await page.goto(link!);
	await expect(page).toHaveURL(/\/projects\/1\/drawings$/);
	await expect(page.getByTestId('user-menu')).toContainText('Tess Okafor-Lind');

	// The link works once.
	await page.context().clearCookies();
	await page.goto(link!);
	await expect(page.getByText(/expired or was already used/)).toBeVisible();
});

test('a link asked for an unknown address says the same, and sends nothing', async ({ page }) => {
	await page.goto('/signin/link');
	await page.getByLabel('E-mail').fill('nobody-here@tacksheet.test');
	await page.getByRole('button', { name: 'Send the link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	await signInInBrowser(page, 'admin@tacksheet.test');
	await page.goto('/admin/mail');
	await expect(page.getByText('nobody-here@tacksheet.test')).toHaveCount(0);
});
