/**
 * An inspector on a tablet records a B31.3 fit-up on a demo joint whose WPS comes from the
 * register: the card names the WPS, and the live verdict judges the root opening against the
 * WPS joint design (the invented WPS-CS-01 rev 1: 1/16–1/8 in), the finding's clause naming the
 * WPS. ASME B31.3-2018 328.4.2 leaves the joint preparation to the WPS (common practice).
 * Nothing is signed here. The register page is shown to a member who may only read it.
 */
import { expect, test } from '@playwright/test';
import { signInInBrowser, signedInClient } from './support';

interface LogRow {
	drawingId: number;
	number: string;
	weldNumber: string;
	kind: string;
	sheet: number | null;
	wps: string;
}

test('a fit-up is judged live against the joint’s WPS', async ({ page }) => {
	test.setTimeout(150_000);
	const admin = await signedInClient('admin@tacksheet.test');
	const log = await (
		await admin.get('/api/projects/1/joints?state=awaiting_fitup&pageSize=200')
	).json();
	await admin.dispose();
	const row = (log.items as LogRow[]).find(
		(item) => item.kind === 'butt' && item.sheet !== null && item.wps === 'WPS-CS-01 rev 1'
	);
	expect(row, 'a butt weld awaiting fit-up on WPS-CS-01 rev 1').toBeTruthy();

	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${row!.drawingId}?page=${row!.sheet}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible({ timeout: 60_000 });
	await page.getByTestId('weld-search').fill(row!.number);
	await page.getByTestId('weld-search').press('Enter');
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toContainText(row!.weldNumber);
	await expect(card.getByTestId('joint-wps').locator('option:checked')).toHaveText(
		'WPS-CS-01 rev 1'
	);

	const form = card.getByTestId('record-inspection');
	const gap = form.getByRole('textbox', { name: /^Root opening/ }).first();
	await gap.fill('5/32');
	await gap.blur();
	const finding = form.locator('[data-check="wps.rootOpening"]');
	await expect(finding).toContainText('WPS WPS-CS-01 rev 1');
	await expect(finding).toContainText('outside');
	await expect(form.getByTestId('verdict')).toHaveAttribute('data-verdict', 'outside');
	await form.screenshot({ path: 'test-results/wps-fitup.tablet.png' });

	await gap.fill('3/32');
	await gap.blur();
	await expect(finding).toContainText('within');
	await expect(card.getByText(/verdicts are an aid/i).first()).toBeVisible();
});

test('the WPS register is readable by every member', async ({ page }) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto('/projects/1/wps');
	const table = page.getByTestId('wps-register');
	await expect(table).toContainText('WPS-CS-01');
	await expect(table).toContainText('Superseded');
	await expect(page.getByRole('button', { name: /^Edit WPS/ })).toHaveCount(0);
	await page.screenshot({ path: 'test-results/wps-register.tablet.png', fullPage: true });
});
