/**
 * The administrator derives a project set from ASME B31.3 normal fluid service with a
 * stricter undercut limit and puts it on a joint; the inspector's live verdict on that joint
 * then judges by the project limit. Base: ASME B31.3-2018 Table 341.3.2 criterion H, undercut
 * ≤ 1 mm (1/32 in) and ≤ Tw/4. The project clause "PS-201 §4" (1/64 in) is invented.
 */
import { expect, test } from '@playwright/test';
import { BASE_URL, signInInBrowser, signedInClient } from './support';

interface Pin {
	jointId: number;
	number: string;
	label: string;
	pageIndex: number;
	state: string;
	kind: string;
	version: number;
}

test('a project set derived by the administrator governs the live verdict', async ({
	page,
	browser
}) => {
	test.setTimeout(120_000);
	// A butt weld awaiting visual on project 1, away from the drawing the tablet test uses.
	const admin = await signedInClient('admin@tacksheet.test');
	const drawings = (await (await admin.get('/api/projects/1/drawings?pageSize=50')).json()).items;
	let target: { drawingId: number; pin: Pin } | undefined;
	for (const drawing of drawings) {
		if (drawing.number === 'LBM-20-ISO-1102' || !drawing.currentRevision) continue;
		const pins: Pin[] = (
			await (await admin.get(`/api/revisions/${drawing.currentRevision.id}/pins`)).json()
		).items;
		const pin = pins.find((p) => p.state === 'awaiting_visual' && p.kind === 'butt');
		if (pin) {
			target = { drawingId: drawing.id, pin };
			break;
		}
	}
	expect(target, 'a butt weld awaiting visual on project 1').toBeTruthy();
	const { drawingId, pin } = target!;
	const before = await (await admin.get(`/api/joints/${pin.jointId}`)).json();

	// The administrator derives the set, changing the undercut limit beside the base's.
	await signInInBrowser(page, 'admin@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto('/projects/1/settings/criteria');
	await page
		.locator('li[data-set-id="asme-b31.3-normal"]')
		.getByRole('button', { name: 'Copy as a project set' })
		.click();
	const editor = page.getByTestId('criteria-editor');
	await editor.getByLabel('Id', { exact: true }).fill('ps-201-e2e');
	await editor.getByLabel('Name', { exact: true }).fill('PS-201 process piping');
	const undercut = editor.locator('tr[data-check="undercut.depth"]');
	await expect(undercut.getByTestId('base-value')).toHaveText(
		'at most (the lesser of 1/32 in and 0.25 × thickness, none for longitudinal seams) at any length'
	);
	await expect(undercut).toContainText('Table 341.3.2, undercut, criterion H');
	await undercut.getByLabel('Change for this project').check();
	await undercut.getByLabel('Rule').selectOption('max');
	await undercut.getByLabel('Maximum', { exact: true }).fill('1/64');
	// A changed limit without its clause is refused, nothing lost.
	await editor.getByRole('button', { name: 'Create the set' }).click();
	await expect(editor.getByRole('alert')).toContainText('project specification clause');
	await undercut.getByLabel('Project specification clause (required)').fill('PS-201 §4');
	await editor.getByRole('button', { name: 'Create the set' }).click();
	await expect(page.getByText('Created ps-201-e2e, version 1.')).toBeVisible();
	await expect(page.locator('li[data-set-id="ps-201-e2e"]')).toContainText('Undercut depth');

	// …and chooses it on the joint card.
	await page.goto(`/projects/1/drawings/${drawingId}?page=${pin.pageIndex + 1}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible();
	await page.getByTestId('weld-search').fill(pin.number);
	await page.getByTestId('weld-search').press('Enter');
	const adminCard = page.getByTestId('joint-card');
	await adminCard.getByLabel('Criteria set').selectOption('ps-201-e2e');
	await adminCard.getByRole('button', { name: 'Save weld details' }).click();
	await expect(adminCard.getByText('Saved.')).toBeVisible();

	// The inspector's live verdict: 1/32 in is deeper than the project's 1/64 in.
	const inspector = await browser.newPage();
	await signInInBrowser(inspector, 'inspector@tacksheet.test');
	await expect(inspector).toHaveURL(/\/projects$/);
	await inspector.goto(`/projects/1/drawings/${drawingId}?page=${pin.pageIndex + 1}`);
	await expect(inspector.locator('[data-rendered-page]')).toBeVisible();
	await inspector.getByTestId('weld-search').fill(pin.number);
	await inspector.getByTestId('weld-search').press('Enter');
	const form = inspector.getByTestId('joint-card').getByTestId('record-inspection');
	await expect(form).toContainText('Record the visual inspection');
	await form.getByRole('textbox', { name: 'Undercut depth' }).fill('1/32');
	await form.getByRole('textbox', { name: 'Undercut depth' }).blur();
	await expect(form.getByText('PS-201 §4').first()).toBeVisible();
	await expect(form.getByText(/outside/i).first()).toBeVisible();
	await expect(form.getByText('PS-201 process piping').first()).toBeVisible();
	await expect(inspector.getByText(/verdicts are an aid/i).first()).toBeVisible();
	await inspector.close();

	// The joint goes back to its set, so later tests find the demo job as it was.
	const now = await (await admin.get(`/api/joints/${pin.jointId}`)).json();
	const restored = await admin.patch(`/api/joints/${pin.jointId}`, {
		headers: { origin: BASE_URL },
		data: { criteriaSetId: before.criteriaSetId, version: now.version }
	});
	expect(restored.status()).toBe(200);
	await admin.dispose();
});
