/**
 * An inspector on a tablet corrects a visual inspection from the joint's history: the form
 * opens with the readings as they were typed, one reading is changed and the reason written;
 * the old record stays, marked corrected, and the new verdict shows. Then the weld, now in
 * repair, is cut out: its replacement with the N-suffixed number appears on the sheet at the
 * same point, awaiting fit-up.
 */
import { expect, test } from '@playwright/test';
import { cutOutWeldNumber } from '../../src/lib/weld-numbers';
import { BASE_URL, signInInBrowser, signedInClient } from './support';

interface Pin {
	pinId: number;
	jointId: number;
	number: string;
	label: string;
	state: string;
	kind: string;
	pageIndex: number;
	x: number;
	y: number;
	version: number;
}

// ASME B31.3-2018 normal fluid service, Table 341.3.2 criterion H: undercut at most the lesser
// of 1 mm (1/32 in) and Tw/4. 1/32 in is within on the demo's walls, 1/16 in (1.6 mm) outside.
const CLEAN = {
	reinforcement: '1/16',
	porosity: '0',
	crack: false,
	overlap: false,
	craterUnfilled: false,
	incompleteFusion: false
};

test('a visual result corrected with a reason, then the weld cut out and replaced', async ({
	page
}) => {
	test.setTimeout(120_000);
	const inspector = await signedInClient('inspector@tacksheet.test');
	// A butt weld awaiting visual on an ASME B31.3 drawing of the demo job (not the one the
	// inspection test uses).
	const drawings = (await (await inspector.get('/api/projects/1/drawings?pageSize=50')).json())
		.items as { id: number; number: string; currentRevision: { id: number } }[];
	let drawing: (typeof drawings)[number] | undefined;
	let pins: Pin[] = [];
	let pin: Pin | undefined;
	for (const candidate of drawings.filter((d) => d.number !== 'LBM-20-ISO-1102')) {
		pins = (
			await (await inspector.get(`/api/revisions/${candidate.currentRevision.id}/pins`)).json()
		).items;
		pin = pins.find(
			(p) => p.state === 'awaiting_visual' && p.kind === 'butt' && !/N/i.test(p.number)
		);
		if (pin) {
			drawing = candidate;
			break;
		}
	}
	expect(pin, 'a butt weld awaiting visual in the demo job').toBeTruthy();
	drawing = drawing!;
	const joint = await (await inspector.get(`/api/joints/${pin!.jointId}`)).json();
	expect(joint.criteriaSetId).toBe('asme-b31.3-normal');

	// The visual as first signed: undercut 1/32 in, within, accepted.
	const first = await inspector.post(`/api/joints/${pin!.jointId}/inspections`, {
		headers: { origin: BASE_URL },
		data: {
			stage: 'visual',
			readings: { ...CLEAN, undercutDepth: '1/32' },
			decision: 'accept',
			version: joint.version
		}
	});
	expect(first.status()).toBe(201);
	const original = (await first.json()).inspection;
	expect(original.verdict).toBe('within');

	await signInInBrowser(page, 'inspector@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/drawings/${drawing.id}?page=${pin!.pageIndex + 1}`);
	await expect(page.locator('[data-rendered-page]')).toBeVisible();
	await page.getByTestId('weld-search').fill(pin!.number);
	await page.getByTestId('weld-search').press('Enter');
	const card = page.getByTestId('joint-card');
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(
		new RegExp(`Weld ${pin!.label}`)
	);

	// Correct it: the form opens with the readings as typed.
	await card.getByRole('button', { name: `Correct record ${original.id}…` }).tap();
	const form = card.getByTestId('correct-inspection');
	await expect(form).toContainText(`Correct the visual inspection record ${original.id}`);
	const undercut = form.getByRole('textbox', { name: 'Undercut depth' });
	await expect(undercut).toHaveValue('1/32');
	await expect(form.getByRole('textbox', { name: /Reinforcement/ })).toHaveValue('1/16');
	await undercut.fill('1/16');
	await undercut.blur();
	await expect(form.getByText(/Table 341\.3\.2/).first()).toBeVisible();
	await expect(form.getByText(/outside/i).first()).toBeVisible();
	await expect(card.getByText(/verdicts are an aid/i).first()).toBeVisible();
	await form.getByRole('button', { name: 'Reject', exact: true }).tap();
	// Without a reason a correction cannot be signed.
	await expect(form.getByRole('button', { name: 'Sign the correction' })).toBeDisabled();
	await form
		.getByLabel(/Reason for the correction/)
		.fill('Re-gauged at the 6 o’clock toe: undercut 1/16 in');
	await page.screenshot({ path: test.info().outputPath('correction-form.png') });

	// Meanwhile someone else changes the joint: the card shows the API's 409 message, keeps
	// what was typed, and the second try goes through.
	const now = await (await inspector.get(`/api/joints/${pin!.jointId}`)).json();
	const edit = await inspector.patch(`/api/joints/${pin!.jointId}`, {
		headers: { origin: BASE_URL },
		data: { spool: 'SP-2', version: now.version }
	});
	expect(edit.status()).toBe(200);
	await form.getByRole('button', { name: 'Sign the correction' }).tap();
	await expect(form.getByRole('alert')).toContainText(/Someone else changed weld .* Reload it/);
	await expect(undercut).toHaveValue('1/16');
	await form.getByRole('button', { name: 'Sign the correction' }).tap();

	await expect(card.getByTestId('joint-state')).toHaveText('Repair');
	const old = card.locator(`[data-testid=inspection-record][data-record-id="${original.id}"]`);
	await expect(old).toHaveAttribute('data-corrected', 'yes');
	await expect(old.getByTestId('corrected-by')).toContainText(/Corrected by record \d+, /);
	await expect(old).toContainText('Undercut depth 1/32');
	const correction = card
		.getByTestId('inspection-record')
		.filter({ hasText: `Correction of record ${original.id}` });
	await expect(correction).toContainText('Visual rejected');
	await expect(correction).toContainText('verdict: outside');
	await expect(correction).toContainText('Re-gauged at the 6 o’clock toe');
	await expect(page.locator(`[data-testid=pin][data-number="${pin!.number}"]`)).toHaveAttribute(
		'data-state',
		'repair'
	);
	await old.scrollIntoViewIfNeeded();
	await page.screenshot({ path: test.info().outputPath('corrected-history.png') });

	// Only the inspector (and the QC manager) cut out: the foreman and document controller get 403.
	for (const email of ['foreman@tacksheet.test', 'doccon@tacksheet.test']) {
		const client = await signedInClient(email);
		const refused = await client.post(`/api/joints/${pin!.jointId}/cut-out`, {
			headers: { origin: BASE_URL },
			data: { reason: 'Cut out', version: 1 }
		});
		expect(refused.status(), email).toBe(403);
		await client.dispose();
	}

	// The weld in repair is cut out; its replacement opens on the card and appears on the sheet.
	const expected = cutOutWeldNumber(
		pin!.number,
		pins.map((p) => p.number)
	);
	await card.getByRole('button', { name: 'Cut out this weld…' }).tap();
	await card
		.getByLabel(/Why is it cut out/)
		.fill('Undercut along the cap; QC instruction to cut out');
	await card.getByRole('button', { name: `Cut out and replace by ${expected}` }).tap();
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(new RegExp(`Weld ${expected}$`));
	await expect(card.getByTestId('joint-state')).toHaveText('Awaiting fit-up');
	await expect(card.getByTestId('replaces')).toContainText(`Replaces weld ${pin!.number}`);
	await expect(card).toContainText(`Weld ${pin!.number} is cut out and void`);
	const replacement = page.locator(`[data-testid=pin][data-number="${expected}"]`);
	await expect(replacement).toHaveAttribute('data-state', 'awaiting_fitup');
	await expect(page.locator(`[data-testid=pin][data-number="${pin!.number}"]`)).toHaveAttribute(
		'data-state',
		'void'
	);
	await page.screenshot({ path: test.info().outputPath('cut-out.png') });

	// The new pin sits where the old one was, on the current revision.
	const after: Pin[] = (
		await (await inspector.get(`/api/revisions/${drawing.currentRevision.id}/pins`)).json()
	).items;
	const made = after.find((p) => p.number === expected)!;
	expect({ pageIndex: made.pageIndex, x: made.x, y: made.y }).toEqual({
		pageIndex: pin!.pageIndex,
		x: pin!.x,
		y: pin!.y
	});

	// The old joint's card says what replaced it.
	await card.getByTestId('replaces').getByRole('button').tap();
	await expect(card.getByRole('heading', { level: 2 })).toHaveText(
		new RegExp(`Weld ${pin!.label}`)
	);
	await expect(card.getByTestId('replaced-by')).toContainText(
		`Cut out, replaced by weld ${expected}`
	);
	await inspector.dispose();
});
