/**
 * An inspector on a tablet opens a pin waiting for visual inspection, types an undercut
 * reading beyond the joint's limit, sees the live verdict with its clause, rejects, and the
 * pin turns to repair on the sheet. Then the foreman records the repair weld.
 */
import { expect, test } from '@playwright/test';
import { signInInBrowser, signedInClient } from './support';

test('an undercut beyond the limit is rejected and the pin goes to repair', async ({
	page,
	browser
}) => {
	test.setTimeout(90_000);
	const admin = await signedInClient('admin@tacksheet.test');
	const drawing = (await (await admin.get('/api/projects/1/drawings?q=LBM-20-ISO-1102')).json())
		.items[0];
	const pins = (await (await admin.get(`/api/revisions/${drawing.currentRevision.id}/pins`)).json())
		.items;
	const pin = pins.find(
		(p: { state: string; kind: string }) => p.state === 'awaiting_visual' && p.kind === 'butt'
	);
	expect(pin, 'a butt weld awaiting visual on LBM-20-ISO-1102').toBeTruthy();
	await admin.dispose();

	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${drawing.id}?page=${pin.pageIndex + 1}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible();
	await page.getByTestId('weld-search').fill(pin.number);
	await page.getByTestId('weld-search').press('Enter');
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(new RegExp(`Weld ${pin.label}`));
	const form = card.getByTestId('record-inspection');
	await expect(form).toContainText('Record the visual inspection');

	// ASME B31.3 normal fluid service, Table 341.3.2 criterion H: undercut at most 1 mm
	// (1/32 in) and Tw/4. 1/16 in (1.6 mm) is outside.
	await form.getByRole('textbox', { name: 'Undercut depth' }).fill('1/16');
	await form.getByRole('textbox', { name: 'Undercut depth' }).blur();
	await expect(form.getByText(/Table 341\.3\.2/).first()).toBeVisible();
	await expect(form.getByText(/outside/i).first()).toBeVisible();
	// The caution is in view wherever a verdict shows.
	await expect(card.getByText(/verdicts are an aid/i).first()).toBeVisible();

	await form.getByRole('button', { name: 'Reject', exact: true }).click();
	await form.getByRole('button', { name: 'Sign and record' }).click();
	await expect(card.getByTestId('joint-state')).toHaveText('Repair');
	await expect(page.locator(`[data-testid=pin][data-number="${pin.number}"]`)).toHaveAttribute(
		'data-state',
		'repair'
	);

	// The foreman sees the repair owed and records the repair weld with a stamp.
	const foreman = await browser.newPage({ viewport: { width: 1024, height: 768 }, hasTouch: true });
	await signInInBrowser(foreman, 'foreman@tacksheet.test');
	await expect(foreman).toHaveURL(/\/projects$/);
	await foreman.goto(`/projects/1/drawings/${drawing.id}?page=${pin.pageIndex + 1}`);
	await expect(foreman.locator('[data-rendered-page]')).toBeVisible();
	await foreman.getByTestId('weld-search').fill(pin.number);
	await foreman.getByTestId('weld-search').press('Enter');
	const weld = foreman.getByTestId('record-weld');
	await expect(weld).toContainText('Record the repair weld (R1)');
	await weld.getByLabel('Root welder').selectOption({ index: 1 });
	await weld.getByRole('button', { name: 'Record the weld' }).click();
	await expect(foreman.getByTestId('joint-state')).toHaveText('Awaiting visual');
	// The inspector's sheet follows without a reload, and the weld number carries its repair suffix.
	await expect(page.locator(`[data-testid=pin][data-number="${pin.number}"]`)).toHaveAttribute(
		'data-state',
		'awaiting_visual',
		{ timeout: 10_000 }
	);
	await expect(page.locator(`[data-testid=pin][data-number="${pin.number}"]`)).toHaveAccessibleName(
		new RegExp(`${pin.number}-R1`)
	);
	await foreman.close();
});
