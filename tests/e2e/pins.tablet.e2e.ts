/**
 * The weld map on a tablet: place a pin, fill its card, drag it, and find it again at the
 * same PDF point after a reload at another zoom, also on a page with /Rotate 90; and a second
 * session sees a moved pin without reloading.
 */
import { expect, test, type Page } from '@playwright/test';
import { signInInBrowser, signedInClient } from './support';

interface Box {
	x0: number;
	y0: number;
	x1: number;
	y1: number;
	rotation: number;
}

/** PDF user-space point under a screen point, worked out from the sheet on screen. */
async function pdfPointAt(
	page: Page,
	screenX: number,
	screenY: number,
	box: Box
): Promise<[number, number]> {
	const sheet = (await page.getByTestId('sheet').boundingBox())!;
	const w = box.x1 - box.x0;
	const h = box.y1 - box.y0;
	const turned = box.rotation === 90 || box.rotation === 270;
	const perUnit = sheet.width / (turned ? h : w);
	const u = (screenX - sheet.x) / perUnit;
	const v = (screenY - sheet.y) / perUnit;
	// Sheet units are the page with its rotation applied, y down; PDF space is unrotated, y up.
	if (box.rotation === 90) return [box.x0 + v, box.y0 + u];
	if (box.rotation === 180) return [box.x1 - u, box.y0 + v];
	if (box.rotation === 270) return [box.x1 - v, box.y1 - u];
	return [box.x0 + u, box.y1 - v];
}

async function pinCentre(page: Page, number: string): Promise<[number, number]> {
	const target = page.locator(`[data-testid=pin][data-number="${number}"] circle`).first();
	const b = (await target.boundingBox())!;
	return [b.x + b.width / 2, b.y + b.height / 2];
}

/** A point on the sheet at least 50 px from every pin, so a tap there places a new one. */
async function emptySpot(page: Page): Promise<[number, number]> {
	const sheet = (await page.getByTestId('sheet').boundingBox())!;
	const centres = await page
		.locator('[data-testid=pin] circle:first-child')
		.evaluateAll((circles) =>
			circles
				.map((c) => c.getBoundingClientRect())
				.map((r) => [r.x + r.width / 2, r.y + r.height / 2])
		);
	for (const fy of [0.45, 0.55, 0.65, 0.35, 0.75]) {
		for (const fx of [0.15, 0.25, 0.35, 0.45, 0.55]) {
			const spot: [number, number] = [sheet.x + sheet.width * fx, sheet.y + sheet.height * fy];
			if (centres.every(([x, y]) => Math.hypot(x - spot[0], y - spot[1]) > 50)) return spot;
		}
	}
	throw new Error('no empty spot on the sheet');
}

async function openDrawing(page: Page, number: string) {
	const admin = await signedInClient('admin@tacksheet.test');
	const found = (await (await admin.get(`/api/projects/1/drawings?q=${number}`)).json()).items[0];
	const revision = await (await admin.get(`/api/revisions/${found.currentRevision.id}`)).json();
	await admin.dispose();
	await page.goto(`/projects/1/drawings/${found.id}`);
	await expect(page.locator('[data-rendered-page="1"]')).toBeVisible();
	return { drawing: found, revision };
}

async function storedPin(page: Page, revisionId: number, number: string) {
	const items = (await (await page.request.get(`/api/revisions/${revisionId}/pins`)).json()).items;
	return items.find((p: { number: string }) => p.number === number);
}

for (const drawingNumber of ['LBM-20-ISO-1105', 'LBM-20-ISO-1103']) {
	test(`place, fill, drag and find a pin again on ${drawingNumber}`, async ({ page }) => {
		test.setTimeout(90_000);
		await signInInBrowser(page, 'inspector@tacksheet.test');
		await expect(page).toHaveURL(/\/projects$/);
		const { revision } = await openDrawing(page, drawingNumber);
		const box: Box = revision.pages[0];
		if (drawingNumber.endsWith('1103')) expect(box.rotation).toBe(90);

		await page.getByTestId('place-toggle').click();
		const tapAt = await emptySpot(page);
		const expected = await pdfPointAt(page, ...tapAt, box);
		await page.touchscreen.tap(...tapAt);
		const card = page.getByTestId('joint-card');
		await expect(card).toBeVisible();
		const title = (await card.getByRole('heading', { level: 2 }).textContent())!;
		const number = /Weld (\S+)/.exec(title)![1];

		const placed = await storedPin(page, revision.id, number);
		expect(Math.abs(placed.x - expected[0])).toBeLessThan(1);
		expect(Math.abs(placed.y - expected[1])).toBeLessThan(1);

		await card.getByLabel('Kind').selectOption('fillet');
		await card.getByLabel('Required fillet size').fill('1/4');
		await card.getByLabel('Material').fill('ASTM A105');
		await card.getByRole('button', { name: 'Save joint' }).click();
		await expect(card.getByText('Saved.')).toBeVisible();
		await expect(card.getByText('Joint details changed')).toBeVisible();
		// 1/4 in = 6.35 mm, shown in the other unit beside what was typed.
		await expect(card.getByText(/= 6\.[34] mm/)).toBeVisible();

		// Drag the selected pin 60 px right and 40 px down (a drag never places a pin).
		const [px, py] = await pinCentre(page, number);
		await page.mouse.move(px, py);
		await page.mouse.down();
		for (let i = 1; i <= 6; i++) await page.mouse.move(px + i * 10, py + (i * 40) / 6);
		await page.mouse.up();
		const dropTarget = await pdfPointAt(page, px + 60, py + 40, box);
		await expect
			.poll(async () => (await storedPin(page, revision.id, number)).x, { timeout: 5000 })
			.not.toBe(placed.x);
		const moved = await storedPin(page, revision.id, number);
		expect(Math.abs(moved.x - dropTarget[0])).toBeLessThan(1);
		expect(Math.abs(moved.y - dropTarget[1])).toBeLessThan(1);

		// Reload, zoom in, and the pin is drawn on the same PDF point.
		await page.reload();
		await expect(page.locator('[data-rendered-page="1"]')).toBeVisible();
		await page.getByRole('button', { name: /zoom in/i }).click();
		await page.getByRole('button', { name: /zoom in/i }).click();
		await page.waitForTimeout(600);
		const [qx, qy] = await pinCentre(page, number);
		const seen = await pdfPointAt(page, qx, qy, box);
		expect(Math.abs(seen[0] - moved.x)).toBeLessThan(1);
		expect(Math.abs(seen[1] - moved.y)).toBeLessThan(1);
	});
}

test('a pin moved in one session moves in the other without a reload', async ({ browser }) => {
	test.setTimeout(90_000);
	const watcher = await browser.newPage({ viewport: { width: 1024, height: 768 }, hasTouch: true });
	await signInInBrowser(watcher, 'foreman@tacksheet.test');
	await expect(watcher).toHaveURL(/\/projects$/);
	const { revision } = await openDrawing(watcher, 'LBM-20-SP-1102-03');
	const pins = (await (await watcher.request.get(`/api/revisions/${revision.id}/pins`)).json())
		.items;
	const pin = pins.find((p: { state: string }) => p.state !== 'void');
	const before = await watcher
		.locator(`[data-testid=pin][data-number="${pin.number}"]`)
		.getAttribute('transform');

	const inspector = await signedInClient('inspector@tacksheet.test');
	const response = await inspector.patch(`/api/pins/${pin.pinId}`, {
		data: { x: pin.x + 30, y: pin.y - 20, version: pin.version }
	});
	expect(response.status()).toBe(200);
	await expect
		.poll(
			() =>
				watcher.locator(`[data-testid=pin][data-number="${pin.number}"]`).getAttribute('transform'),
			{ timeout: 8000 }
		)
		.not.toBe(before);
	// The same move again with the old version is refused: someone else moved it.
	const stale = await inspector.patch(`/api/pins/${pin.pinId}`, {
		data: { x: pin.x, y: pin.y, version: pin.version }
	});
	expect(stale.status()).toBe(409);
	await inspector.dispose();
	await watcher.close();
});

test('the document controller reviews pins carried to a new revision', async ({ page }) => {
	await signInInBrowser(page, 'doccon@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	const { revision } = await openDrawing(page, 'LBM-20-ISO-1101');
	const flagged = async () =>
		(await (await page.request.get(`/api/revisions/${revision.id}/pins`)).json()).items.filter(
			(p: { needsReview: boolean; state: string }) => p.needsReview && p.state !== 'void'
		).length;
	const before = await flagged();
	expect(before).toBeGreaterThan(0);
	const review = page.getByTestId('review-list');
	await expect(review).toContainText(`${before} pin${before === 1 ? '' : 's'} to review`);
	await review.getByRole('button').first().click();
	await page
		.getByTestId('pin-review')
		.getByRole('button', { name: 'Confirm the position' })
		.click();
	await expect(page.getByTestId('joint-card').getByText('Position confirmed')).toBeVisible();
	await expect.poll(flagged).toBe(before - 1);
	const history = page.getByTestId('joint-card').getByText('Pin confirmed on the new revision');
	await page.getByRole('button', { name: 'Close the joint card' }).click();
	await review.getByRole('button').first().click();
	await expect(history).toHaveCount(0);
});
