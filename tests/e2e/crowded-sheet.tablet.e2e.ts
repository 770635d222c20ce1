/**
 * A crowded isometric at the default zoom on a tablet: pins too close to tell apart gather
 * into one mark with a count; a tap inside it offers "Which weld?" and the chosen weld's card
 * opens. A tap on the centre of a pin opens that pin's card and no neighbour's, and labels
 * never overlap.
 */
import { expect as baseExpect, test, type Page } from '@playwright/test';
import { signInInBrowser, signedInClient } from './support';

const CROWDED = 'LBM-20-ISO-1102';
/** Opening and drawing a dense sheet takes a while on a busy test machine. */
const expect = baseExpect.configure({ timeout: 20_000 });

async function openCrowded(page: Page) {
	const admin = await signedInClient('admin@tacksheet.test');
	const found = (await (await admin.get(`/api/projects/1/drawings?q=${CROWDED}`)).json()).items[0];
	await admin.dispose();
	await page.goto(`/projects/1/drawings/${found.id}`);
	await expect(page.locator('[data-rendered-page="1"]')).toBeVisible({ timeout: 60_000 });
	// Give panzoom's fit and the first layout a moment to settle.
	await page.waitForTimeout(500);
}

async function centreOf(page: Page, selector: string): Promise<[number, number]> {
	const box = (await page.locator(selector).first().boundingBox())!;
	return [box.x + box.width / 2, box.y + box.height / 2];
}

test('tap inside a cluster, pick the right weld from "Which weld?"', async ({ page }) => {
	test.setTimeout(90_000);
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await openCrowded(page);

	const cluster = page.getByTestId('pin-cluster').first();
	await expect(cluster).toBeVisible();
	const count = Number(await cluster.getAttribute('data-count'));
	const numbers = (await cluster.getAttribute('data-numbers'))!.split(' ');
	expect(count).toBeGreaterThan(1);
	expect(numbers).toHaveLength(count);

	// The mark's own circle is the 34 px disc in the middle of its touch target.
	const [cx, cy] = await centreOf(page, '[data-testid=pin-cluster] >> nth=0');
	await page.touchscreen.tap(cx + 4, cy - 3);
	const list = page.getByTestId('which-weld');
	await expect(list).toBeVisible();
	await expect(list.getByRole('heading', { name: 'Which weld?' })).toBeVisible();
	const options = list.getByTestId('which-weld-option');
	await expect(options).toHaveCount(count);
	await page.screenshot({ path: test.info().outputPath('which-weld.png') });

	const wanted = numbers[numbers.length - 1];
	await list.locator(`[data-testid=which-weld-option][data-number="${wanted}"]`).tap();
	await expect(list).toBeHidden();
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(new RegExp(`Weld ${wanted}\\b`));
	// The chosen weld now stands on its own, selected, out of the cluster.
	await expect(
		page.locator(`[data-testid=pin][data-number="${wanted}"]:not([data-gathered])`)
	).toBeVisible();
});

test('a tap on a pin opens that weld, and no two labels overlap', async ({ page }) => {
	test.setTimeout(120_000);
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await openCrowded(page);
	// Closer in, most pins stand on their own; the two welds of an elbow may still share a spot.
	for (let i = 0; i < 3; i++) {
		await page.getByRole('button', { name: /zoom in/i }).click();
		await page.waitForTimeout(400);
	}
	await page.waitForTimeout(800);

	// Only pins inside the visible frame of the sheet can be tapped.
	const view = (await page.getByRole('region', { name: /^Sheet 1 of/ }).boundingBox())!;
	const lone = page.locator('[data-testid=pin]:not([data-gathered])');
	const numbers = await lone.evaluateAll(
		(pins, v) =>
			pins
				.filter((p) => {
					const r = p.getBoundingClientRect();
					const x = r.left + r.width / 2;
					const y = r.top + r.height / 2;
					return x > v.x + 30 && x < v.x + v.width - 30 && y > v.y + 30 && y < v.y + v.height - 30;
				})
				.map((p) => p.getAttribute('data-number')!),
		view
	);
	expect(numbers.length).toBeGreaterThanOrEqual(2);

	const labels = await page
		.locator('[data-testid=pin]:not([data-gathered]) text')
		.evaluateAll((texts) =>
			texts.map((t) => {
				const r = t.getBoundingClientRect();
				return { x0: r.left, y0: r.top, x1: r.right, y1: r.bottom };
			})
		);
	for (let i = 0; i < labels.length; i++)
		for (let j = i + 1; j < labels.length; j++) {
			const a = labels[i];
			const b = labels[j];
			const overlap = a.x0 < b.x1 - 1 && b.x0 < a.x1 - 1 && a.y0 < b.y1 - 1 && b.y0 < a.y1 - 1;
			expect(overlap, `labels ${numbers[i]} and ${numbers[j]}`).toBe(false);
		}

	const card = page.getByTestId('joint-card');
	for (const number of numbers.slice(0, 6)) {
		const glyph = page.locator(`[data-testid=pin][data-number="${number}"]:not([data-gathered]) g`);
		const box = (await glyph.first().boundingBox())!;
		await page.touchscreen.tap(box.x + box.width / 2, box.y + box.height / 2);
		await expect(card.getByRole('heading', { level: 2 })).toHaveText(
			new RegExp(`Weld ${number}\\b`)
		);
		await card.getByRole('button', { name: 'Close the joint card' }).tap();
		await expect(card).toBeHidden();
		// The closed card leaves the layout as it was: wait out the double-tap window.
		await page.waitForTimeout(350);
	}
});
