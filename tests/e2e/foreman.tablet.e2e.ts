/**
 * The foreman on a tablet records a weld with two welder stamps (root, then fill and cap) on a
 * joint ready to weld, and calls the visual hold point from the outstanding board. The
 * inspector's queue on the board shows the request as it is made, and the inspectors' e-mail
 * is in the mail stand-in.
 */
import { expect, test } from '@playwright/test';
import { latestMailText, pickDrawing, signInInBrowser, signedInClient } from './support';

interface OwedItem {
	jointId: number;
	number: string;
	label: string;
	drawingId: number;
	drawingNumber: string;
	page: number | null;
}

interface RegisterWelder {
	stamp: string;
	status: string;
	processes: { process: string; current: boolean }[];
}

test('a weld with two stamps, then a visual request that reaches the inspector', async ({
	page,
	browser
}) => {
	test.setTimeout(120_000);
	const admin = await signedInClient('admin@tacksheet.test');
	const board = await (await admin.get('/api/projects/1/outstanding?limit=200')).json();
	const ready: OwedItem[] = board.owed.foreman.find(
		(g: { state: string }) => g.state === 'ready_to_weld'
	).items;
	const joint = ready.find((i) => i.page !== null);
	expect(joint, 'a joint ready to weld with a pin on a current sheet').toBeTruthy();
	const register: RegisterWelder[] = (await (await admin.get('/api/projects/1/welders')).json())
		.items;
	// The demo WPS is GTAW root, SMAW fill and cap: one welder current in each, two people.
	const current = (w: RegisterWelder, process: string) =>
		w.status === 'active' && w.processes.some((p) => p.process === process && p.current);
	const rootWelder = register.find((w) => current(w, 'GTAW'))!;
	const fillWelder = register.find((w) => w !== rootWelder && current(w, 'SMAW'))!;
	expect(rootWelder && fillWelder, 'two welders current in GTAW and SMAW').toBeTruthy();
	await admin.dispose();

	// The inspector watches the board; it follows the foreman's work without a reload.
	const inspector = await browser.newPage({
		viewport: { width: 1024, height: 768 },
		hasTouch: true
	});
	await signInInBrowser(inspector, 'inspector@tacksheet.test');
	await expect(inspector).toHaveURL(/\/projects$/);
	await inspector.goto('/projects/1/outstanding');
	await pickDrawing(inspector, joint!.drawingNumber);
	const inspectorQueue = inspector.getByTestId('owed-by-inspector');
	await expect(inspectorQueue.getByTestId('owed-awaiting_visual')).toBeVisible();

	await signInInBrowser(page, 'foreman@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${joint!.drawingId}?page=${joint!.page}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible();
	await page.getByTestId('weld-search').fill(joint!.number);
	await page.getByTestId('weld-search').press('Enter');
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(
		new RegExp(`Weld ${joint!.label}`)
	);
	const weld = card.getByTestId('record-weld');
	await weld.getByLabel('Root welder').selectOption(rootWelder.stamp);
	await weld.getByLabel('Fill welder').selectOption(fillWelder.stamp);
	await weld.getByLabel('Cap welder').selectOption(fillWelder.stamp);
	await weld.getByRole('button', { name: 'Record the weld' }).click();
	await expect(card.getByTestId('joint-state')).toHaveText('Awaiting visual');

	// The inspector's queue has the weld now, not yet requested.
	const inspectorRow = inspectorQueue.locator(
		`[data-testid=owed-row][data-joint="${joint!.jointId}"]`
	);
	await expect(inspectorRow).toBeVisible({ timeout: 10_000 });
	await expect(inspectorRow.getByTestId('requested')).toHaveCount(0);

	await page.goto('/projects/1/outstanding');
	await pickDrawing(page, joint!.drawingNumber);
	const row = page.locator(`[data-testid=owed-row][data-joint="${joint!.jointId}"]`);
	await row.getByRole('checkbox').check();
	await page.getByRole('button', { name: /Request visual inspection \(1\)/ }).click();
	await expect(page.getByText(/Requested visual inspection of 1 weld/)).toBeVisible();
	await expect(row.getByTestId('requested')).toBeVisible();

	await expect(inspectorRow.getByTestId('requested')).toBeVisible({ timeout: 10_000 });
	await inspector.close();

	// The e-mail to the project's inspectors, read as the administrator on the mail page.
	const adminPage = await browser.newPage();
	await signInInBrowser(adminPage, 'admin@tacksheet.test');
	await expect(adminPage).toHaveURL(/\/projects$/);
	const text = await latestMailText(adminPage, 'inspector@tacksheet.test');
	expect(text).toContain('Visual inspection requested: 1 weld');
	expect(text).toContain(`Weld ${joint!.label}, drawing ${joint!.drawingNumber}:`);
	expect(text).toContain(`/projects/1/drawings/${joint!.drawingId}?page=${joint!.page}&weld=`);
	await adminPage.close();
});
