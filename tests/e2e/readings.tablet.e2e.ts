/**
 * An inspector on a tablet finds every reading the code judges on the card: the root side of a
 * girth weld (folded away until wanted), and the indications of a radiograph, each judged live
 * with its clause and the caution. Limits: ASME B31.3-2018 Table 341.3.2 criterion B
 * (incomplete penetration at most 1 mm (1/32 in) and 0.2Tw deep) and criterion A (cracks), the
 * demo project's criteria set. Nothing is signed here.
 */
import { expect, test, type Page } from '@playwright/test';
import { signInInBrowser, signedInClient } from './support';

interface LogRow {
	drawingId: number;
	number: string;
	weldNumber: string;
	kind: string;
	sheet: number | null;
}

async function jointIn(state: string): Promise<LogRow> {
	const admin = await signedInClient('admin@tacksheet.test');
	const log = await (await admin.get(`/api/projects/1/joints?state=${state}&pageSize=200`)).json();
	await admin.dispose();
	const row = (log.items as LogRow[]).find((item) => item.kind === 'butt' && item.sheet !== null);
	expect(row, `a butt weld in state ${state}`).toBeTruthy();
	return row!;
}

async function openCard(page: Page, row: LogRow) {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${row.drawingId}?page=${row.sheet}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible({ timeout: 60_000 });
	await page.getByTestId('weld-search').fill(row.number);
	await page.getByTestId('weld-search').press('Enter');
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toContainText(row.weldNumber);
	return card;
}

test('the root side of a girth weld is on the card, judged live', async ({ page }) => {
	test.setTimeout(150_000);
	const row = await jointIn('awaiting_visual');
	const card = await openCard(page, row);
	const form = card.getByTestId('record-inspection');
	const root = form.locator('[data-group="root-side"]');
	await expect(root).toBeVisible();
	await expect(root).not.toHaveAttribute('open', '');
	await root.getByText('Root side, where it can be seen').click();

	const length = form.getByRole('textbox', {
		name: 'Incomplete penetration — total length in any 12 in (300 mm)'
	});
	await length.fill('1');
	await length.blur();
	// A length of incomplete penetration wants its depth.
	await expect(form.getByTestId('verdict')).toContainText('Incomplete penetration — depth');
	const depth = form.getByRole('textbox', { name: 'Incomplete penetration — depth' });
	await depth.fill('3/64');
	await depth.blur();
	await expect(form.getByTestId('verdict')).toHaveAttribute('data-verdict', 'outside');
	const finding = form.locator('[data-check="penetration.depth"]');
	await expect(finding).toContainText('criterion B');
	await expect(card.getByText(/verdicts are an aid/i).first()).toBeVisible();
	await root.screenshot({ path: 'test-results/readings-root-side.tablet.png' });

	await depth.fill('1/32');
	await depth.blur();
	await expect(finding).toContainText('within');
});

test('radiograph indications are judged by the joint’s criteria set', async ({ page }) => {
	test.setTimeout(150_000);
	const row = await jointIn('awaiting_nde');
	const card = await openCard(page, row);
	const form = card.getByTestId('record-inspection');
	await expect(form).toContainText('Record the NDE result');
	await form.getByRole('button', { name: /^RT/ }).click();
	const list = form.getByTestId('indications');
	await expect(list).toContainText('No indications listed');
	await expect(form.getByTestId('nde-verdict')).toHaveAttribute('data-verdict', 'within');

	await list.getByRole('button', { name: 'Add an indication' }).click();
	const first = list.locator('[data-indication="0"]');
	await first.getByRole('combobox', { name: /Type/ }).selectOption('incompletePenetration');
	await first.getByRole('textbox', { name: 'Length' }).fill('1-1/16 in');
	// Radiography shows no depth: criterion B's depth is for the inspector.
	await expect(form.getByTestId('nde-verdict')).toHaveAttribute('data-verdict', 'judge');
	await expect(form.getByTestId('nde-findings')).toContainText('Incomplete penetration (IP)');

	await list.getByRole('button', { name: 'Add an indication' }).click();
	const second = list.locator('[data-indication="1"]');
	await second.getByRole('combobox', { name: /Type/ }).selectOption('crack');
	await expect(form.getByTestId('nde-verdict')).toHaveAttribute('data-verdict', 'outside');
	await expect(form.getByTestId('nde-verdict')).toContainText(/verdicts are an aid/i);

	await first.getByRole('textbox', { name: 'Length' }).fill('long');
	await expect(first).toContainText('cannot read "long"');
	await form.screenshot({ path: 'test-results/readings-nde.tablet.png' });
});
