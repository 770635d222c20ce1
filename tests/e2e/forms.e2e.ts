/**
 * Forms in the browser on the demo job: the welder register's add form shows a refusal beside
 * its field and keeps what was typed, then adds the welder and empties; the members page
 * changes a role in place; and the weld log's first page arrives in the page itself, so the
 * rows are there before any script runs and a shared address opens the same filter.
 */
import { expect, test, type Page } from '@playwright/test';
import { signInInBrowser } from './support';

async function demoProjectId(page: Page): Promise<number> {
	const projects: { id: number; code: string }[] = await (
		await page.request.get('/api/projects')
	).json();
	return projects.find((p) => p.code === 'LBM-20')!.id;
}

test('the foreman adds a welder: a missing date is named beside its field, then the welder is added', async ({
	page
}) => {
	await signInInBrowser(page, 'foreman@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	await page.goto(`/projects/${projectId}/welders`);
	const form = page.locator('form[action="?/create"]');
	await form.getByLabel('Stamp').fill('E2E-7');
	await form.getByLabel('Name').fill('Jo Penhallow');
	await form.getByLabel('Process').fill('gtaw');
	await form.getByRole('button', { name: 'Add welder' }).click();
	await expect(form.getByText('Give the date the process was qualified.')).toBeVisible();
	await expect(form.getByLabel('Stamp')).toHaveValue('E2E-7');
	await expect(page.getByTestId('welder').filter({ hasText: 'E2E-7' })).toHaveCount(0);

	await form.getByLabel('Qualified on').fill('2026-09-01');
	await form.getByRole('button', { name: 'Add welder' }).click();
	await expect(page.getByText('Welder E2E-7 (Jo Penhallow) added.')).toBeVisible();
	const row = page.locator('[data-testid="welder"][data-stamp="E2E-7"]');
	await expect(row).toContainText('GTAW');
	await expect(form.getByLabel('Stamp')).toHaveValue('');

	// The same stamp again is refused on the stamp, whatever its case.
	await form.getByLabel('Stamp').fill('e2e-7');
	await form.getByLabel('Name').fill('Someone else');
	await form.getByRole('button', { name: 'Add welder' }).click();
	await expect(form.getByText(/Stamp E2E-7 is already Jo Penhallow's/)).toBeVisible();
});

test('the administrator changes a member’s role from the members list', async ({ page }) => {
	await signInInBrowser(page, 'admin@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	await page.goto(`/admin/projects/${projectId}/members`);
	const role = page.getByLabel('Role of viewer@tacksheet.test');
	await role.selectOption('turnover');
	await role.locator('xpath=ancestor::form').getByRole('button', { name: 'Change' }).click();
	await expect(page.getByText('viewer@tacksheet.test is now Turnover on LBM-20.')).toBeVisible();
	await expect(page.getByLabel('Role of viewer@tacksheet.test')).toHaveValue('turnover');
	await role.selectOption('viewer');
	await role.locator('xpath=ancestor::form').getByRole('button', { name: 'Change' }).click();
	await expect(page.getByText('viewer@tacksheet.test is now Viewer on LBM-20.')).toBeVisible();
});

test('the weld log’s first page is in the page as sent, filtered as its address says', async ({
	page
}) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	const api: { total: number; items: { weldNumber: string }[] } = await (
		await page.request.get(`/api/projects/${projectId}/joints?state=accepted`)
	).json();
	expect(api.total).toBeGreaterThan(0);
	// The HTML as the server sends it, before any script: the rows and the count are in it.
	const html = await (await page.request.get(`/projects/${projectId}/log?state=accepted`)).text();
	expect(html).toContain(`${api.total.toLocaleString('en-GB')} joints match`);
	expect(html).toContain(`>${api.items[0].weldNumber}<`);
	expect(html).not.toContain('Loading the weld log');
	// A filter the schema refuses is named on the page, not a blank grid.
	await page.goto(`/projects/${projectId}/log?state=melted`);
	await expect(page.getByText('Choose one of the joint states.')).toBeVisible();
});
