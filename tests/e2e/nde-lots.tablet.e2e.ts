/**
 * NDE lots on a tablet: six butt welds of one line by one welder form an RT 5 % lot
 * (ASME B31.3-2018 341.4.1(b)(1)); the QC manager closes the lot and commits the proposed
 * selection, seed shown; the inspector records an RT reject on the selected weld, and the two
 * tracers it calls of the same welder's work (ASME B31.3-2018 341.3.4(a)) turn to awaiting
 * NDE on the sheet.
 */
import { expect, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signInInBrowser, signedInClient } from './support';

const LINE = `3"-E2E-${Date.now() % 100000}-A1A`;
const headers = { origin: BASE_URL };

interface Answer {
	joint: { id: number; number: string; state: string; version: number };
}

async function ok(response: Awaited<ReturnType<APIRequestContext['post']>>): Promise<Answer> {
	expect(response.ok(), `${response.url()}: ${await response.text()}`).toBe(true);
	return (await response.json()) as Answer;
}

test('the QC manager closes a lot and selects; a reject calls two tracers onto the sheet', async ({
	page,
	browser
}) => {
	test.setTimeout(120_000);
	const inspector = await signedInClient('inspector@tacksheet.test');
	const foreman = await signedInClient('foreman@tacksheet.test');
	const drawing = (await (await inspector.get('/api/projects/1/drawings?q=LBM-20-ISO-1104')).json())
		.items[0];
	const revisionId = drawing.currentRevision.id;

	// Six welds of a line of their own, fit up, welded by B14 alone and visually accepted.
	const joints: Answer['joint'][] = [];
	for (let n = 0; n < 6; n++) {
		const { joint } = await ok(
			await inspector.post(`/api/revisions/${revisionId}/pins`, {
				headers,
				data: {
					pageIndex: 0,
					x: 120 + n * 38,
					y: 120,
					joint: {
						kind: 'butt',
						size: '3',
						thickness: '0.216 in',
						criteriaSetId: 'asme-b31.3-normal',
						wps: 'WPS-CS-01 GTAW/SMAW',
						line: LINE
					}
				}
			})
		);
		joints.push(joint);
		// Every joint write carries the version it last saw.
		const fitup = await ok(
			await inspector.post(`/api/joints/${joint.id}/inspections`, {
				headers,
				data: {
					version: joint.version,
					stage: 'fitup',
					readings: {
						rootOpening: '1/8',
						bevelAngle: '37-1/2°',
						rootFace: '1/16',
						misalignment: '1/32'
					},
					decision: 'accept'
				}
			})
		);
		const welded = await ok(
			await foreman.post(`/api/joints/${joint.id}/welds`, {
				headers,
				data: {
					version: fitup.joint.version,
					weldedOn: '2026-12-01',
					welders: { root: 'B14', fill: 'B14', cap: 'B14' }
				}
			})
		);
		// ASME B31.3-2018 Table 341.3.2: undercut 1/32 in is within criterion H for Tw = 0.216 in.
		const visual = await ok(
			await inspector.post(`/api/joints/${joint.id}/inspections`, {
				headers,
				data: {
					version: welded.joint.version,
					stage: 'visual',
					readings: {
						reinforcement: '1/16',
						porosity: '0',
						undercutDepth: '1/32',
						crack: false,
						overlap: false,
						craterUnfilled: false,
						incompleteFusion: false
					},
					decision: 'accept'
				}
			})
		);
		// Not selected: it waits on its lot's sample.
		expect(visual.joint.state).toBe('awaiting_lot');
	}
	await inspector.dispose();
	await foreman.dispose();

	// The QC manager closes the lot, then proposes and commits its selection.
	await signInInBrowser(page, 'admin@tacksheet.test');
	await expect(page).toHaveURL(/\/projects$/);
	await page.goto(`/projects/1/nde?q=${encodeURIComponent(LINE)}`);
	await expect(page.getByTestId('nde-caution')).toContainText(
		'NDE extent per project settings; verify against the code and contract in force.'
	);
	const lot = page.getByTestId('lot-detail');
	await expect(lot.getByRole('heading', { level: 2 })).toHaveText(`Line ${LINE} · RT 5 %`);
	await expect(lot.getByTestId('lot-figures')).toContainText(/Welds in the lot\s*6/);
	await lot.getByRole('button', { name: 'Close the lot' }).click();
	await lot.getByRole('button', { name: `Close Line ${LINE} · RT 5 %` }).click();
	await expect(page.getByText(/Lot closed: it takes no more welds/)).toBeVisible();
	await expect(lot.locator('[data-stage]').first()).toHaveAttribute('data-stage', 'closed');

	await lot.getByRole('button', { name: 'Propose a selection' }).click();
	const proposal = lot.getByTestId('proposal');
	await expect(proposal.getByTestId('proposal-seed')).toHaveText(/^\d+$/);
	const seed = await proposal.getByTestId('proposal-seed').textContent();
	// 5 % of six welds, rounded up: one, and it represents B14.
	await expect(proposal.getByTestId('proposal-picks').locator('li')).toHaveCount(1);
	await proposal.getByRole('button', { name: 'Commit this selection' }).click();
	await expect(page.getByText(`Selected 1 weld with seed ${seed}`)).toBeVisible();
	const selectedRow = lot.getByTestId('lot-weld').first();
	const selectedId = Number(await selectedRow.getAttribute('data-joint'));
	const selected = joints.find((j) => j.id === selectedId)!;
	expect(selected, 'the selected weld is one of the line’s').toBeTruthy();
	await expect(lot.getByTestId('lot-rounds')).toContainText(`seed ${seed}`);

	// The inspector records the RT reject on the joint card.
	const sheet = await browser.newPage({ viewport: { width: 1024, height: 768 }, hasTouch: true });
	await signInInBrowser(sheet, 'inspector@tacksheet.test');
	await expect(sheet).toHaveURL(/\/projects$/);
	await sheet.goto(`/projects/1/drawings/${drawing.id}?page=1`);
	// The pins stand on the sheet (drawn from its tiles while pdf.js may still be loading).
	await expect(sheet.locator('[data-testid=pin]:not([data-gathered])').first()).toBeVisible({
		timeout: 30_000
	});
	await sheet.getByTestId('weld-search').fill(selected.number);
	await sheet.getByTestId('weld-search').press('Enter');
	const card = sheet.getByTestId('joint-card');
	await expect(card.getByTestId('joint-nde-selection')).toContainText('Random');
	const form = card.getByTestId('record-inspection');
	await expect(form).toContainText('Record the NDE result');
	await form.getByRole('button', { name: /^RT/ }).click();
	await form.getByLabel('Report number').fill('RT-E2E-001');
	await form.getByLabel('Technician').fill('T. Example, Level II');
	await form.getByRole('button', { name: /^Add an indication/ }).click();
	// A crack: none permitted on RT (ASME B31.3-2018 Table 341.3.2); the engine's verdict shows.
	await form.getByLabel('1. Type').selectOption('crack');
	await form.getByLabel('Length', { exact: true }).fill('3/8');
	await form.getByRole('button', { name: /^Reject/ }).click();
	await form.getByRole('button', { name: 'Sign and record' }).click();
	await expect(card.getByTestId('joint-state')).toHaveText('Repair');
	// The indication is kept with the result, with the engine's outcome on it.
	const kept = card.getByTestId('joint-nde-indications');
	await expect(kept).toContainText('Crack: length 3/8');
	await expect(kept).toContainText('outside the limit');

	// Two tracers of B14's work in the same lot, named on the card and awaiting NDE on the sheet.
	const tracers = card.getByTestId('joint-nde-tracers');
	await expect(tracers).toContainText('Its reject called');
	await expect(tracers.getByText(/tracer, B14/)).toHaveCount(2);
	const others = joints.filter((j) => j.id !== selected.id);
	await expect(async () => {
		let awaiting = 0;
		for (const j of others) {
			const state = await sheet
				.locator(`[data-testid=pin][data-number="${j.number}"]`)
				.getAttribute('data-state');
			if (state === 'awaiting_nde') awaiting++;
			else expect(state).toBe('awaiting_lot');
		}
		expect(awaiting).toBe(2);
	}).toPass({ timeout: 10_000 });

	// The lot page follows: under progressive examination, two tracers open.
	await page.reload();
	await expect(lot.locator('[data-stage]').first()).toHaveAttribute('data-stage', 'progressive');
	await expect(lot.getByTestId('lot-calls')).toContainText('tracers (341.3.4(a))');
	await sheet.close();
});
