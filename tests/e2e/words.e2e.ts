/**
 * As the crew reads it: the state bar read by colour and by glyph, the palette as the page
 * draws it checked under simulated protanopia and deuteranopia (Machado et al. 2009,
 * CIEDE2000), and the caution carried by the files and answers that hold verdicts.
 */
import { expect, test, type Page } from '@playwright/test';
import ExcelJS from 'exceljs';
import { latestMail, readDatabase, signInInBrowser } from './support';
import { CAUTION } from '../../src/lib/caution';
import { deltaE2000, rgbToLab, simulate, type Rgb } from '../../src/lib/palette-check';

async function demoProjectId(page: Page): Promise<number> {
	const projects: { id: number; code: string }[] = await (
		await page.request.get('/api/projects')
	).json();
	return projects.find((p) => p.code === 'LBM-20')!.id;
}

/** `rgb(12, 34, 56)` as the browser computes a colour → sRGB 0…1. */
function cssRgb(text: string): Rgb {
	const [r, g, b] = text.match(/\d+(\.\d+)?/g)!.map(Number);
	return [r / 255, g / 255, b / 255];
}

test('the state bar carries glyphs and counts, and its colours stay apart for red-green colour blindness', async ({
	page
}) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	await page.goto(`/projects/${projectId}`);
	await expect(page.getByRole('heading', { name: 'Welds by state' })).toBeVisible();
	const bar = page.getByTestId('state-bar').first();
	const segments = bar.locator('[data-state]');
	const count = await segments.count();
	expect(count).toBeGreaterThan(3);
	// Every coloured segment has its drawn glyph (named for screen readers) and its count.
	const items = bar.getByRole('listitem');
	await expect(items).toHaveCount(count);
	for (let n = 0; n < count; n++) {
		const glyph = items.nth(n).locator('svg[role="img"]');
		await expect(glyph).toHaveAttribute('aria-label', /\w/);
		await expect(items.nth(n)).toHaveText(/\d/);
	}
	// The colours as the browser paints them, state by state.
	const colours = await segments.evaluateAll((els) =>
		els.map((el) => ({
			state: el.getAttribute('data-state')!,
			colour: getComputedStyle(el).backgroundColor
		}))
	);
	for (const vision of ['protanopia', 'deuteranopia'] as const) {
		const seen = colours.map((c) => ({
			state: c.state,
			lab: rgbToLab(simulate(cssRgb(c.colour), vision))
		}));
		for (let i = 0; i < seen.length; i++)
			for (let k = i + 1; k < seen.length; k++)
				expect(
					deltaE2000(seen[i].lab, seen[k].lab),
					`${seen[i].state} / ${seen[k].state} (${vision})`
				).toBeGreaterThanOrEqual(11);
	}
});

test('the files and answers that carry verdicts carry the caution', async ({ page }) => {
	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	const projectId = await demoProjectId(page);
	// The weld log as JSON, CSV and workbook.
	const log = await (await page.request.get(`/api/projects/${projectId}/joints?pageSize=5`)).json();
	expect(log.notice).toBe(CAUTION);
	const csv = (await (await page.request.get(`/api/projects/${projectId}/joints.csv`)).text())
		.replace(/^\uFEFF/, '')
		.split('\r\n');
	expect(csv[0]).toBe(`"Notice: ${CAUTION}"`);
	expect(csv[1]).toContain('Against verdict');
	const xlsx = await (await page.request.get(`/api/projects/${projectId}/joints.xlsx`)).body();
	const workbook = new ExcelJS.Workbook();
	await workbook.xlsx.load(xlsx as unknown as ArrayBuffer);
	expect(workbook.getWorksheet('Notes')!.getRow(2).getCell(1).value).toBe(CAUTION);
	// A joint's answer.
	const joint = await (await page.request.get(`/api/joints/${log.items[0].id}`)).json();
	expect(joint.notice).toBe(CAUTION);
	// And on the screen beside the log.
	await page.goto(`/projects/${projectId}/log`);
	await expect(page.getByRole('note').filter({ hasText: 'Verdicts are an aid.' })).toBeVisible();
});

test("an invitation's link lives 72 hours, and its mail names the project, the role and who invited", async ({
	page
}) => {
	const email = `invited-${Date.now()}@tacksheet.test`;
	await signInInBrowser(page, 'admin@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	await page.goto('/admin/users');
	await expect(page.getByRole('link', { name: 'LBM-20' }).first()).toHaveAttribute(
		'href',
		/\/admin\/projects\/\d+\/members$/
	);
	const form = page.locator('section[aria-labelledby="invite-heading"]');
	await form.getByLabel('E-mail').fill(email);
	await form.getByLabel('Name').fill('Invited Person');
	await form.locator('select[name="projectId"]').selectOption({ label: 'LBM-20' });
	await form.locator('select[name="role"]').selectOption({ label: 'Welding inspector' });
	const sent = Date.now();
	await page.getByRole('button', { name: 'Invite' }).click();
	await expect(page.getByText(`Invitation sent to ${email}.`)).toBeVisible();
	const expires = readDatabase(
		(db) =>
			db
				.prepare('select max(expires) as e from verification_tokens where identifier = ?')
				.get(email) as {
				e: number;
			}
	).e;
	const hours = (expires - sent) / 3_600_000;
	expect(hours).toBeGreaterThan(71.9);
	expect(hours).toBeLessThan(72.1);
	const mail = latestMail(email)!.text;
	expect(mail).toContain('72 hours');
	expect(mail).toContain('LBM-20');
	expect(mail).toContain('Welding inspector');
	expect(mail).toContain('Alex Marwood');
});
