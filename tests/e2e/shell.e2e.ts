import { expect, test, type ConsoleMessage } from '@playwright/test';
import { signInInBrowser } from './support';

test('the app loads in Barlow, with no errors in the console', async ({ page }) => {
	const problems: string[] = [];
	page.on('console', (message: ConsoleMessage) => {
		if (message.type() === 'error' || message.type() === 'warning') problems.push(message.text());
	});
	page.on('pageerror', (error) => problems.push(error.message));

	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	await expect(page.getByRole('link', { name: /Tacksheet/ })).toBeVisible();

	const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily);
	expect(family.split(',')[0].replaceAll(/["']/g, '').trim()).toBe('Barlow');
	// The font file itself was served by the app and is in use, not a fallback.
	const loaded = await page.evaluate(async () => {
		await document.fonts.ready;
		return [...document.fonts].filter(
			(f) => f.family.replaceAll(/["']/g, '') === 'Barlow' && f.status === 'loaded'
		).length;
	});
	expect(loaded).toBeGreaterThan(0);

	await page.locator('main a[href="/projects/1"]').click();
	await expect(page.getByRole('heading', { name: 'Welds by state' })).toBeVisible();
	await page.getByRole('link', { name: 'Drawings' }).click();
	await expect(page.getByRole('cell', { name: 'LBM-20-ISO-1101', exact: true })).toBeVisible();

	expect(problems).toEqual([]);
});

test('health answers ok', async ({ request }) => {
	const response = await request.get('/api/health');
	expect(response.status()).toBe(200);
	expect(await response.json()).toEqual({ status: 'ok' });
});
