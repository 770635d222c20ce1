/**
 * The drawing's own weld numbers on a tablet: a drawing with its weld numbers printed in
 * bubbles is uploaded and read; suggestions are chosen with a lasso drawn on the sheet and
 * accepted; a pin is placed with a typed number (the next pin offered the same prefix), taken
 * back with Undo, and a joint is renumbered from its card.
 */
import { expect, test, type Page } from '@playwright/test';
import { BASE_URL, signInInBrowser, signedInClient } from './support';
import { familySpec } from '../fixtures/iso-drawings/families';
import { measuringFonts, metricsOf } from '../fixtures/iso-drawings/fonts';
import { writePdf } from '../fixtures/iso-drawings/pdf';
import { drawSheet } from '../fixtures/iso-drawings/sheet';

const NUMBER = 'LBM-20-ISO-7701';

async function uploadReadSheet(): Promise<number> {
	const doccon = await signedInClient('doccon@tacksheet.test');
	const model = drawSheet(familySpec('iso-circles', 3), metricsOf(await measuringFonts()));
	const { bytes } = await writePdf([model]);
	const made = await doccon.post('/api/projects/1/drawings', {
		multipart: {
			number: NUMBER,
			title: 'Weld numbers test isometric',
			kind: 'isometric',
			revision: '0',
			area: 'Area 7',
			file: { name: `${NUMBER}.pdf`, mimeType: 'application/pdf', buffer: Buffer.from(bytes) }
		},
		headers: { origin: BASE_URL }
	});
	expect(made.status()).toBe(201);
	const { drawing, revision } = await made.json();
	expect(drawing.area).toBe('Area 7');
	await expect
		.poll(
			async () =>
				(await (await doccon.get(`/api/revisions/${revision.id}/suggestions`)).json()).status,
			{ timeout: 60_000 }
		)
		.toBe('done');
	await doccon.dispose();
	return drawing.id;
}

async function centre(page: Page, selector: string): Promise<[number, number]> {
	const b = (await page.locator(selector).first().boundingBox())!;
	return [b.x + b.width / 2, b.y + b.height / 2];
}

test('lasso suggestions, type a number while placing, undo, renumber', async ({ page }) => {
	test.setTimeout(150_000);
	const drawingId = await uploadReadSheet();
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${drawingId}`);
	// A fresh upload: its tiles are still being made, so the first draw can take a while.
	await expect(page.locator('[data-rendered-page="1"]')).toBeVisible({ timeout: 60_000 });
	const rings = page.getByTestId('suggestion');
	await expect(rings.first()).toBeAttached();
	const before = await rings.count();
	expect(before).toBeGreaterThan(5);

	// Lasso the left half of the sheet: exactly the rings drawn there are chosen.
	const sheet = (await page.getByTestId('sheet').boundingBox())!;
	const half = sheet.x + sheet.width / 2;
	const inside = await rings.evaluateAll(
		(gs, edge) =>
			gs
				.filter((g) => {
					const r = g.getBoundingClientRect();
					return r.x + r.width / 2 < edge;
				})
				.map((g) => g.getAttribute('data-number')!),
		half - 4
	);
	expect(inside.length).toBeGreaterThan(0);
	await page.getByTestId('lasso-toggle').click();
	const corners: [number, number][] = [
		[sheet.x + 2, sheet.y + 2],
		[half - 4, sheet.y + 2],
		[half - 4, sheet.y + sheet.height - 2],
		[sheet.x + 2, sheet.y + sheet.height - 2],
		[sheet.x + 2, sheet.y + 3]
	];
	await page.mouse.move(...corners[0]);
	await page.mouse.down();
	for (const [x, y] of corners.slice(1)) await page.mouse.move(x, y, { steps: 8 });
	await page.mouse.up();
	await expect(page.getByTestId('chosen')).toContainText(
		inside.length === 1 ? `weld ${inside[0]}` : `${inside.length} welds`
	);
	await page.getByTestId('accept-chosen').click();
	for (const number of inside)
		await expect(page.locator(`[data-testid=pin][data-number="${number}"]`)).toBeAttached();
	await expect(rings).toHaveCount(before - inside.length);

	// Type the number printed on the drawing while placing; the next one is offered.
	await page.getByTestId('place-toggle').click();
	await page.getByTestId('place-number').fill('FW-900');
	await page.touchscreen.tap(sheet.x + sheet.width * 0.9, sheet.y + sheet.height * 0.12);
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toContainText('Weld FW-900');
	await expect(page.getByTestId('place-number')).toHaveValue('FW-901');

	// Undo from the card (the toast under it says the same): the pin goes, FW-900 is free again.
	await card.getByTestId('take-back').click();
	await expect(page.locator('[data-testid=pin][data-number="FW-900"]')).toHaveCount(0);
	await expect(page.getByText('Weld FW-900 taken back; the number is free again.')).toBeVisible();
	await expect(page.getByTestId('place-number')).toHaveValue('FW-900');

	// Place it again and renumber it from its card; the history keeps the old number.
	await page.touchscreen.tap(sheet.x + sheet.width * 0.9, sheet.y + sheet.height * 0.12);
	await expect(card.getByRole('heading', { level: 2 })).toContainText('Weld FW-900');
	await card.getByTestId('renumber').click();
	await card.getByTestId('renumber-input').fill('FW-950');
	await card.getByRole('button', { name: 'Renumber' }).click();
	await expect(card.getByText('Renumbered: now weld FW-950.')).toBeVisible();
	await expect(card.getByText('was FW-900, now FW-950')).toBeVisible();
	await expect(page.locator('[data-testid=pin][data-number="FW-950"]')).toBeAttached();
	// The card still offers Undo while the joint has no record.
	await expect(card.getByTestId('take-back')).toBeVisible();
	const [x, y] = await centre(page, '[data-testid=pin][data-number="FW-950"] circle');
	expect(x).toBeGreaterThan(half);
	expect(y).toBeGreaterThan(0);
});
