/**
 * The weld log and the progress page in the browser, on the demo job: filters (the drawing
 * through its picker), sorting, paging, the chosen columns, the CSV download, and the
 * progress figures, each checked against what the JSON API answers for the same question.
 */
import fs from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { signInInBrowser } from './support';

interface LogPage {
	items: { id: number; drawing: string; weldNumber: string; state: string }[];
	total: number;
}

async function demoProjectId(page: Page): Promise<number> {
	const response = await page.request.get('/api/projects');
	const projects: { id: number; code: string }[] = await response.json();
	return projects.find((p) => p.code === 'LBM-20')!.id;
}

async function api<T>(page: Page, path: string): Promise<T> {
	const response = await page.request.get(path);
	expect(response.status(), path).toBe(200);
	return (await response.json()) as T;
}

/** The figure above the grid: "138 joints" or "12 joints match". */
async function shownTotal(page: Page): Promise<number> {
	const text = await page.getByText(/^[\d,]+ joints/).textContent();
	return Number(text!.replace(/[^\d]/g, ''));
}

test('the log filters by state and drawing, sorts, pages, keeps its columns and downloads', async ({
	page
}) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	const joints = `/api/projects/${projectId}/joints`;

	await page.goto(`/projects/${projectId}/log`);
	const all = await api<LogPage>(page, `${joints}?pageSize=50`);
	await expect(page.getByText(/^[\d,]+ joints/)).toBeVisible();
	expect(await shownTotal(page)).toBe(all.total);

	// Page 2 holds the API's page 2, in the default order.
	const second = await api<LogPage>(page, `${joints}?pageSize=50&page=2`);
	await page.getByRole('link', { name: 'Next' }).click();
	await expect(page.getByText(/Page 2 of/)).toBeVisible();
	await expect(page.locator('tbody tr').first().getByRole('link').first()).toHaveText(
		second.items[0].weldNumber
	);
	await page.goto(`/projects/${projectId}/log`);

	// The state most joints of drawing 1102 stand in, as the API tells.
	const drawings = await api<{ items: { id: number; number: string }[] }>(
		page,
		`/api/projects/${projectId}/drawings?q=ISO-1102`
	);
	const drawingId = drawings.items.find((d) => d.number === 'LBM-20-ISO-1102')!.id;
	const onDrawing = await api<LogPage>(page, `${joints}?drawing=${drawingId}&pageSize=500`);
	const tally = new Map<string, number>();
	for (const item of onDrawing.items) tally.set(item.state, (tally.get(item.state) ?? 0) + 1);
	const state = [...tally].sort((a, b) => b[1] - a[1])[0][0];

	// State, then the drawing found by typing part of its number and chosen with the keyboard.
	await page.locator('select[name="state"]').selectOption(state);
	const picker = page.getByRole('combobox', { name: 'Drawing (all if none)' });
	await picker.fill('1102');
	await expect(page.getByRole('option', { name: /LBM-20-ISO-1102/ })).toBeVisible();
	await picker.press('Enter');
	await expect(page.getByTestId('drawing-chip')).toContainText('LBM-20-ISO-1102');
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page).toHaveURL(new RegExp(`state=${state}`));
	await expect(page).toHaveURL(new RegExp(`drawing=${drawingId}`));
	const filtered = await api<LogPage>(
		page,
		`${joints}?state=${state}&drawing=${drawingId}&pageSize=500`
	);
	expect(filtered.total).toBeGreaterThan(0);
	await expect(page.getByText(/joints? match/)).toBeVisible();
	expect(await shownTotal(page)).toBe(filtered.total);
	await expect(page.locator('tbody tr')).toHaveCount(filtered.total);
	for (const cell of await page.locator('tbody tr td:first-child').allTextContents())
		expect(cell.trim()).toBe('LBM-20-ISO-1102');
	// The chosen drawing stays shown as a chip after the page reloads its filters.
	await expect(page.getByTestId('drawing-chip')).toContainText('LBM-20-ISO-1102');

	// Sort by weld number, then the other way.
	await page.getByRole('button', { name: /^Weld no\./ }).click();
	await expect(page).toHaveURL(/sort=number/);
	const byNumber = await api<LogPage>(
		page,
		`${joints}?state=${state}&drawing=${drawingId}&sort=number&pageSize=500`
	);
	await expect(page.locator('tbody tr').first().getByRole('link').first()).toHaveText(
		byNumber.items[0].weldNumber
	);
	await page.getByRole('button', { name: /^Weld no\./ }).click();
	await expect(page).toHaveURL(/dir=desc/);
	await expect(page.locator('tbody tr').first().getByRole('link').first()).toHaveText(
		byNumber.items.at(-1)!.weldNumber
	);

	// A column chosen stays chosen after a reload.
	await expect(page.getByRole('columnheader', { name: 'Material' })).toHaveCount(0);
	await page.getByRole('button', { name: 'Columns' }).click();
	await page.getByRole('dialog').getByLabel('Material').check();
	await page.getByRole('button', { name: 'Done' }).click();
	await expect(page.getByRole('columnheader', { name: 'Material' })).toBeVisible();
	await page.reload();
	await expect(page.getByRole('columnheader', { name: 'Material' })).toBeVisible();

	// The CSV holds the filtered rows, as many as the API counts.
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Download CSV' }).click()
	]);
	const text = fs.readFileSync((await download.path())!, 'utf8').replace(/^\uFEFF/, '');
	const lines = text.split('\r\n').filter((line) => line !== '');
	// The caution's line, the header, the rows.
	expect(lines[0]).toMatch(/^"Notice: Verdicts are an aid\./);
	expect(lines[1].split(',')).toContain('Against verdict');
	expect(lines.length - 2).toBe(filtered.total);
	for (const line of lines.slice(2)) expect(line.startsWith('LBM-20-ISO-1102,')).toBe(true);
});

test('the log flags decisions against the verdict and filters on them', async ({ page }) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	const flagged = await api<LogPage>(
		page,
		`/api/projects/${projectId}/joints?againstVerdict=1&pageSize=500`
	);
	expect(flagged.total).toBeGreaterThan(0);
	await page.goto(`/projects/${projectId}/log`);
	await page.getByLabel('Against the verdict only').check();
	await page.getByRole('button', { name: 'Show' }).click();
	await expect(page).toHaveURL(/againstVerdict=1/);
	await expect(page.getByText(/joints? match/)).toBeVisible();
	expect(await shownTotal(page)).toBe(flagged.total);
	await expect(page.locator('tbody').getByText('against the verdict')).toHaveCount(flagged.total);
	// Where the flag shows, the caution shows too (the page's footer).
	await expect(page.getByRole('contentinfo').getByText('Verdicts are an aid.')).toBeVisible();
});

test('the progress page draws its chart, and its figures agree with the summary', async ({
	page
}) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	const summary = await api<{ counts: Record<string, number> }>(
		page,
		`/api/projects/${projectId}/summary`
	);
	const live = Object.entries(summary.counts)
		.filter(([state]) => state !== 'void')
		.reduce((sum, [, n]) => sum + n, 0);
	expect(summary.counts.accepted).toBeGreaterThan(0);
	// Accepted on its own records, or by its NDE lot's sample (ASME B31.3 341.3.4(b)).
	const accepted = summary.counts.accepted + (summary.counts.accepted_by_lot ?? 0);

	await page.goto(`/projects/${projectId}/progress`);
	const canvas = page.locator('canvas');
	await expect(canvas).toBeVisible();
	// Something is drawn: not every pixel of the canvas is blank.
	await expect
		.poll(() =>
			canvas.evaluate((element: HTMLCanvasElement) => {
				const context = element.getContext('2d')!;
				const { data } = context.getImageData(0, 0, element.width, element.height);
				let painted = 0;
				for (let n = 3; n < data.length; n += 4) if (data[n] > 0) painted++;
				return painted;
			})
		)
		.toBeGreaterThan(1000);

	await expect(
		page.getByRole('columnheader', { name: `Of ${live} welds (not void)` })
	).toBeVisible();
	const newest = page.locator('section[aria-labelledby="progress-figures"] tbody tr').first();
	await expect(newest.locator('td').nth(2)).toHaveText(String(accepted));
	await expect(page.getByText(`${accepted} of ${live} welds (not void) accepted`)).toBeVisible();
});
