import crypto from 'node:crypto';
import yauzl from 'yauzl';
import { expect, test } from '@playwright/test';
import { signInInBrowser } from './support';
import { CAUTION } from '../../src/lib/caution';

/** Every entry of a zip, read with yauzl (a zip reader from the registry, not our writer). */
function unzip(file: string): Promise<Map<string, Buffer>> {
	return new Promise((resolve, reject) => {
		yauzl.open(file, { lazyEntries: true }, (error, zip) => {
			if (error || !zip) return reject(error);
			const entries = new Map<string, Buffer>();
			zip.on('entry', (entry: yauzl.Entry) => {
				zip.openReadStream(entry, (err, stream) => {
					if (err || !stream) return reject(err);
					const chunks: Buffer[] = [];
					stream.on('data', (c: Buffer) => chunks.push(c));
					stream.on('end', () => {
						entries.set(entry.fileName, Buffer.concat(chunks));
						zip.readEntry();
					});
				});
			});
			zip.on('end', () => resolve(entries));
			zip.on('error', reject);
			zip.readEntry();
		});
	});
}

test('the turnover team exports the whole project, downloads the zip and checks its manifest', async ({
	page
}) => {
	test.setTimeout(120_000);
	await signInInBrowser(page, 'turnover@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	// The whole project with superseded revisions: a scope of its own, so no other test's
	// export of the project is mistaken for this one.
	await page.goto('/projects/1/turnover?scope=all&superseded=1');
	await expect(page.getByRole('heading', { name: 'The set will hold' })).toBeVisible();
	await expect(page.getByText(/welds? (are|is) in scope but not accepted/)).toBeVisible();
	await expect(page.getByText(/weld marks? still to be checked/)).toBeVisible();

	const started = page.waitForResponse(
		(r) => r.url().endsWith('/api/projects/1/exports') && r.request().method() === 'POST'
	);
	await page.getByRole('button', { name: 'Export the turnover set' }).click();
	const response = await started;
	expect(response.status()).toBe(202);
	const { id } = (await response.json()) as { id: number };

	// The job runs off the request: reloading the page does not stop it.
	await page.reload();
	const item = page.getByTestId(`export-${id}`);
	await expect(item).toBeVisible();

	// Its progress, read from the job itself, only ever moves forward to done.
	const seen: number[] = [];
	await expect
		.poll(
			async () => {
				const job = (await (await page.request.get(`/api/exports/${id}`)).json()) as {
					status: string;
					progress: number;
				};
				seen.push(job.progress);
				return job.status;
			},
			{ timeout: 90_000, intervals: [100] }
		)
		.toBe('done');
	expect(seen.at(-1)).toBe(1);
	for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);

	// The page follows the job to the end on its own, and the download goes through sign-in.
	await expect(item.getByText('Ready')).toBeVisible({ timeout: 10_000 });
	const downloading = page.waitForEvent('download');
	await item.getByRole('link', { name: 'Download zip' }).click();
	const download = await downloading;
	expect(download.suggestedFilename()).toMatch(/^LBM-20-turnover-set-\d+-\d{4}-\d{2}-\d{2}\.zip$/);
	const entries = await unzip((await download.path())!);
	// Photos other tests attached to records in scope travel in photos/, named by their record.
	const photos = [...entries.keys()].filter((name) => name.startsWith('photos/'));
	for (const name of photos) expect(name).toMatch(/^photos\/record-\d+-photo-\d+\.jpg$/);
	expect([...entries.keys()]).toEqual([
		'marked-up-set.pdf',
		'weld-log.xlsx',
		'weld-log.csv',
		'inspections.csv',
		'nde-register.csv',
		...photos,
		'manifest.json'
	]);
	const manifest = JSON.parse(entries.get('manifest.json')!.toString('utf8')) as {
		files: { name: string; bytes: number; sha256: string }[];
		notice: string;
	};
	// The caution travels with the verdicts: in the manifest and atop both CSV files.
	expect(manifest.notice).toBe(CAUTION);
	for (const name of ['weld-log.csv', 'inspections.csv'])
		expect(
			entries
				.get(name)!
				.toString('utf8')
				.replace(/^\uFEFF/, ''),
			name
		).toMatch(/^"Notice: Verdicts are an aid\./);
	expect(manifest.files.map((f) => f.name)).toEqual([...entries.keys()].slice(0, -1));
	for (const file of manifest.files) {
		const bytes = entries.get(file.name)!;
		// Node's crypto, the same SHA-256 as `sha256sum` (FIPS 180-4).
		expect(crypto.createHash('sha256').update(bytes).digest('hex'), file.name).toBe(file.sha256);
		expect(bytes.byteLength, file.name).toBe(file.bytes);
	}

	// Removing the zip keeps the record and offers to export the set again.
	await item.getByRole('button', { name: 'Remove file' }).click();
	await item.getByRole('button', { name: 'Remove zip' }).click();
	await expect(item.getByTestId('export-removed')).toContainText(/zip removed on .* by /);
	await expect(item.getByText('Zip removed', { exact: true })).toBeVisible();
	await expect(item.getByRole('link', { name: 'Download zip' })).toHaveCount(0);
	expect((await page.request.get(`/api/exports/${id}/file`)).status()).toBe(410);
	await item.getByRole('link', { name: 'export again' }).click();
	await expect(page).toHaveURL(/scope=all&superseded=1/);
	await expect(page.getByRole('button', { name: 'Export the turnover set' })).toBeVisible();
});

test('a changed scope is shown again before it can be exported', async ({ page }) => {
	await signInInBrowser(page, 'turnover@tacksheet.test');
	await expect(page.getByRole('heading', { name: 'Projects' })).toBeVisible();
	await page.goto('/projects/1/turnover?scope=all');
	const exportButton = page.getByRole('button', { name: 'Export the turnover set' });
	await expect(exportButton).toBeVisible();

	// Choosing other drawings leaves the whole project's preview on screen, so it cannot be
	// exported by mistake until the new scope is shown.
	await page.getByLabel('Chosen drawings').check();
	await expect(page.getByText('The choices changed.')).toBeVisible();
	await expect(exportButton).toHaveCount(0);

	await page.getByLabel('An area').check();
	await page.getByRole('button', { name: 'Show what the set holds' }).click();
	await expect(page).toHaveURL(/scope=area/);
	await expect(page.getByText('The choices changed.')).toHaveCount(0);
	await expect(exportButton).toBeVisible();
});
