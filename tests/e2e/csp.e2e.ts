/**
 * The drawing page works under the Content-Security-Policy: pdf.js (its worker, fonts and
 * decoders), the pins and the styles load, and the browser reports no violation.
 */
import { expect, test } from '@playwright/test';
import { signInInBrowser } from './support';

test('a sheet renders with its pins and no Content-Security-Policy violation', async ({ page }) => {
	const violations: string[] = [];
	page.on('console', (message) => {
		if (/Content.Security.Policy|Refused to/i.test(message.text())) violations.push(message.text());
	});
	await page.addInitScript(() => {
		document.addEventListener('securitypolicyviolation', (event) => {
			console.error(
				`Content-Security-Policy violation: ${event.violatedDirective} ${event.blockedURI}`
			);
		});
	});
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const response = await page.goto('/projects/1/drawings');
	expect(response?.headers()['content-security-policy']).toContain("default-src 'self'");
	await page.getByRole('link', { name: 'LBM-20-ISO-1101' }).first().click();
	await expect(page.getByTestId('sheet-viewer')).toHaveAttribute('data-rendered-page', '1', {
		timeout: 30_000
	});
	await expect(page.getByTestId('sheet-overlay')).toBeVisible();
	await page.screenshot({ path: test.info().outputPath('sheet-under-csp.png') });
	expect(violations).toEqual([]);
});
