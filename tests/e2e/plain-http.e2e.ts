import { expect, test } from '@playwright/test';

/**
 * A page opened over plain http at another address than this machine is not a secure context
 * (W3C Secure Contexts §3.1), so the browser gives it no service worker or stored files: it
 * says so. At localhost it is one, and says nothing.
 */
const port = Number(process.env.E2E_PORT || 4173);

test.use({
	launchOptions: {
		executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
		args: ['--host-resolver-rules=MAP fieldserver.test 127.0.0.1']
	}
});

test('plain http at a site address says that work without signal needs https', async ({ page }) => {
	await page.goto(`http://fieldserver.test:${port}/signin`);
	expect(await page.evaluate(() => window.isSecureContext)).toBe(false);
	const warning = page.getByTestId('plain-http-warning');
	await expect(warning).toContainText('Work without signal needs https');
	await expect(warning).toContainText(`fieldserver.test:${port}`);
});

test('at localhost the page is a secure context and shows no such warning', async ({ page }) => {
	await page.goto('/signin');
	expect(await page.evaluate(() => window.isSecureContext)).toBe(true);
	await expect(page.getByRole('button', { name: 'Sign in' })).toBeVisible();
	await expect(page.getByTestId('plain-http-warning')).toHaveCount(0);
});
