/**
 * The drawings issue on a tablet: the document controller uploads a new revision and a new
 * drawing in one batch and finds the old revision marked superseded; an inspector then reads
 * a two-sheet isometric with touch and compares two revisions. The console stays clean.
 */
import fs from 'node:fs';
import { expect, test, type Locator, type Page } from '@playwright/test';
import { signInInBrowser } from './support';
import { bulkyPdf, drawingPdf } from '../fixtures/pdfs';

/** Drawings no other browser test uploads to, so the API upload tests may run before or after. */
const REVISED = 'LBM-20-ISO-1104';
const ADDED = 'LBM-20-ISO-1199';

function watchConsole(page: Page, who: string, problems: string[]) {
	page.on('console', (message) => {
		if (message.type() === 'error') problems.push(`${who} console: ${message.text()}`);
	});
	page.on('pageerror', (error) => problems.push(`${who} page error: ${error.message}`));
}

async function zoomPercent(page: Page): Promise<number> {
	const text = (await page.getByTestId('zoom-level').textContent()) ?? '';
	return Number.parseInt(text, 10);
}

/** Mean lightness (0 black to 255 white) of a canvas, read in the page. */
function lightness(canvas: Locator): Promise<number> {
	return canvas.evaluate((element) => {
		const c = element as HTMLCanvasElement;
		const pixels = c.getContext('2d')?.getImageData(0, 0, c.width, c.height).data;
		if (!pixels) return -1;
		let sum = 0;
		for (let i = 0; i < pixels.length; i += 4)
			sum += (pixels[i] + pixels[i + 1] + pixels[i + 2]) / 3;
		return sum / (pixels.length / 4);
	});
}

test('a document controller issues drawings, an inspector reads and compares them by touch', async ({
	page,
	browser
}, testInfo) => {
	const problems: string[] = [];
	watchConsole(page, 'doccon', problems);

	const bulky = testInfo.outputPath(`${REVISED}_rev1.pdf`);
	const fresh = testInfo.outputPath(`${ADDED}.pdf`);
	fs.writeFileSync(bulky, await bulkyPdf(20, `${REVISED} rev 1`));
	fs.writeFileSync(fresh, await drawingPdf({ label: ADDED }));

	await test.step('the document controller uploads a revision and a new drawing at once', async () => {
		await signInInBrowser(page, 'doccon@tacksheet.test');
		await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
		await page.goto('/projects/1/drawings');
		await page.getByRole('link', { name: 'Upload drawings' }).click();
		await expect(page.getByRole('heading', { name: 'Upload drawings' })).toBeVisible();

		await page.getByTestId('file-input').setInputFiles([bulky, fresh]);
		const revision = page.getByTestId('upload-item').filter({ hasText: `${REVISED}_rev1.pdf` });
		const added = page.getByTestId('upload-item').filter({ hasText: `${ADDED}.pdf` });
		await expect(revision).toContainText(`New revision of ${REVISED} (current: 0)`);
		await expect(revision.getByLabel('Revision', { exact: true })).toHaveValue('1');
		await expect(revision).toContainText(/· 20 MB/);
		await expect(added).toContainText('New drawing');
		await expect(added.getByLabel('Drawing number')).toHaveValue(ADDED);
		await expect(added.getByLabel('Revision', { exact: true })).toHaveValue('0');
		await added.getByLabel('Title').fill('Methanol sample line to analyser house');

		// On localhost a 20 MB upload can start and finish between two polls of an assertion,
		// so the page itself records every state of the progress bars it shows.
		await page.evaluate(() => {
			const seen: string[] = [];
			(window as unknown as { progressSeen: string[] }).progressSeen = seen;
			new MutationObserver(() => {
				for (const bar of document.querySelectorAll('[role="progressbar"]'))
					seen.push(`${bar.getAttribute('aria-label')}=${bar.getAttribute('aria-valuenow')}`);
			}).observe(document.body, { subtree: true, childList: true, attributes: true });
		});
		await page.getByRole('button', { name: 'Upload 2 files' }).click();

		await expect(revision.getByRole('status')).toHaveText(
			/Revision 1 is now current; the previous one is superseded\. \d+ weld marks? carried over/,
			{ timeout: 30_000 }
		);
		await expect(added.getByRole('status')).toHaveText(/Registered with revision 0\./);
		await expect(page.getByRole('progressbar')).toHaveCount(0);
		const seen = await page.evaluate(
			() => (window as unknown as { progressSeen: string[] }).progressSeen
		);
		for (const name of [`${REVISED}_rev1.pdf`, `${ADDED}.pdf`]) {
			const states = seen.filter((s) => s.startsWith(`Upload of ${name}=`));
			expect(states.length, `progress bar of ${name}`).toBeGreaterThan(0);
			// Full once the file is sent, while the server checks the PDF.
			expect(states.at(-1)).toBe(`Upload of ${name}=100`);
		}
	});

	await test.step('the old revision is kept, marked superseded, with a way to the current one', async () => {
		await page.getByRole('link', { name: 'Back to the register' }).click();
		await expect(page.getByRole('link', { name: ADDED, exact: true })).toBeVisible();
		const row = page
			.getByRole('row')
			.filter({ has: page.getByRole('link', { name: REVISED, exact: true }) });
		await row.getByRole('button', { name: '2 revisions' }).click();
		const history = page.getByRole('list', { name: `History of ${REVISED}` });
		await expect(history.getByRole('listitem')).toHaveCount(2);
		await history.getByRole('link', { name: 'Revision 0' }).click();

		const banner = page.getByTestId('superseded-banner');
		await expect(banner).toContainText('revision 1 is current');
		await expect(banner).toContainText('This is revision 0');
		await expect(page.getByTestId('sheet-viewer')).toHaveAttribute('data-rendered-page', '1');
		await banner.getByRole('link', { name: 'Open revision 1' }).click();
		await expect(page.getByTestId('revision-label')).toHaveText(/^Rev 1/);
		await expect(page.getByTestId('superseded-banner')).toHaveCount(0);
		await expect(page.getByTestId('sheet-viewer')).toHaveAttribute('data-rendered-page', '1');
	});

	const tablet = await browser.newContext({
		viewport: { width: 1024, height: 768 },
		hasTouch: true
	});
	const inspector = await tablet.newPage();
	watchConsole(inspector, 'inspector', problems);

	try {
		await test.step('an inspector zooms and turns the sheets of a two-sheet isometric by touch', async () => {
			await signInInBrowser(inspector, 'inspector@tacksheet.test');
			await expect(inspector.getByRole('heading', { name: 'Projects' })).toBeVisible();
			expect(await inspector.evaluate(() => navigator.maxTouchPoints)).toBeGreaterThan(0);
			await inspector.goto('/projects/1/drawings');
			await inspector.getByRole('link', { name: 'LBM-20-ISO-1102', exact: true }).tap();

			const viewer = inspector.getByTestId('sheet-viewer');
			await expect(viewer).toHaveAttribute('data-rendered-page', '1');
			const indicator = inspector.getByTestId('sheet-indicator');
			await expect(indicator).toHaveText('Sheet 1 of 2');
			await expect(inspector.getByTestId('zoom-level')).toHaveText(/^\d+ %$/);
			const fitted = await zoomPercent(inspector);

			const zoomIn = inspector.getByRole('button', { name: 'Zoom in' });
			await zoomIn.tap();
			await expect.poll(() => zoomPercent(inspector)).toBeGreaterThan(fitted);
			// Past 100 % the whole-sheet render (one canvas pixel per sheet unit at this pixel ratio)
			// is too coarse, so once the zoom settles the viewer renders the visible part again.
			for (let step = 0; step < 12 && (await zoomPercent(inspector)) < 150; step++) {
				const before = await zoomPercent(inspector);
				await zoomIn.tap();
				await expect.poll(() => zoomPercent(inspector)).toBeGreaterThan(before);
			}
			expect(await zoomPercent(inspector)).toBeGreaterThanOrEqual(150);

			const detail = inspector.getByTestId('detail-canvas');
			// Canvas pixels per sheet unit: offsetWidth is in sheet units, as panzoom's scale is a
			// transform. Once the zoom settles the visible part is drawn again at the resolution
			// on screen (zoom × pixel ratio), finer than the whole-sheet tiles or render below it.
			const pixelsPerUnit = (canvas: Locator) =>
				canvas.evaluate((element) => {
					const c = element as HTMLCanvasElement;
					return c.offsetWidth > 0 ? c.width / c.offsetWidth : 0;
				});
			const onScreen = async () =>
				((await zoomPercent(inspector)) / 100) *
				(96 / 72) *
				(await inspector.evaluate(() => window.devicePixelRatio));
			await expect(viewer).toHaveAttribute('data-detail', 'sharp');
			await expect
				.poll(async () => (await pixelsPerUnit(detail)) / (await onScreen()))
				.toBeGreaterThan(0.9);
			await expect(detail).toBeVisible();

			const thumbnails = inspector.getByRole('navigation', { name: 'Sheets of this revision' });
			await thumbnails.getByRole('button', { name: 'Sheet 2' }).tap();
			await expect(indicator).toHaveText('Sheet 2 of 2');
			await expect(viewer).toHaveAttribute('data-rendered-page', '2');
			await expect(thumbnails.getByRole('button', { name: 'Sheet 2' })).toHaveAttribute(
				'aria-current',
				'true'
			);
			await expect(inspector).toHaveURL(/[?&]page=2/);

			const zoomed = await zoomPercent(inspector);
			await inspector.keyboard.press('w');
			await expect.poll(() => zoomPercent(inspector)).toBeLessThan(zoomed);
		});

		await test.step('the inspector compares two revisions: difference, then flip', async () => {
			await inspector.goto('/projects/1/drawings');
			await inspector.getByRole('link', { name: 'LBM-20-ISO-1101', exact: true }).tap();
			await inspector.getByRole('link', { name: 'Compare revisions' }).tap();

			const sheet = inspector.getByTestId('compare-sheet');
			await expect(sheet).toHaveAttribute('data-compare-ready', '1');
			const canvas = inspector.getByTestId('compare-canvas');
			await expect.poll(() => lightness(canvas)).toBeGreaterThan(200);

			const modes = inspector.getByRole('group', { name: 'How to compare' });
			await modes.getByRole('button', { name: 'Difference' }).tap();
			await expect(modes.getByRole('button', { name: 'Difference' })).toHaveAttribute(
				'aria-pressed',
				'true'
			);
			// Paper that is the same on both revisions cancels out to black.
			await expect.poll(() => lightness(canvas)).toBeLessThan(60);

			await modes.getByRole('button', { name: 'Flip' }).tap();
			const flip = inspector.getByTestId('flip-controls');
			await expect(flip).toBeVisible();
			await flip.getByRole('button', { name: 'Rev 0' }).tap();
			await expect(flip.getByRole('button', { name: 'Rev 0' })).toHaveAttribute(
				'aria-pressed',
				'true'
			);
			await expect(flip.getByRole('slider')).toHaveValue('0');
			await expect.poll(() => lightness(canvas)).toBeGreaterThan(200);
			await flip.getByRole('button', { name: 'Rev 1' }).tap();
			await expect(flip.getByRole('slider')).toHaveValue('1');
			await expect(sheet).toHaveAttribute('data-compare-ready', '1');
		});
	} finally {
		await tablet.close();
	}
	expect(problems).toEqual([]);
});
