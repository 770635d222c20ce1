/**
 * Sheet tiles over HTTP against the production server: an uploaded drawing gets its tiles in
 * the background, with progress for the project; each tile comes with an ETag and answers 304
 * when unchanged; tiles follow the PDF's access rule, so a project you are not a member of
 * has none (404), and without a session there are none (401).
 */
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';
import { drawingPdf } from '../../fixtures/pdfs';

interface SheetTiles {
	pageIndex: number;
	status: 'queued' | 'rendering' | 'done' | 'failed';
	url: string;
	extension: string;
	levels: { width: number; height: number; cols: number; rows: number }[];
}

async function tilesOf(client: APIRequestContext, revisionId: number): Promise<SheetTiles[]> {
	const response = await client.get(`/api/revisions/${revisionId}/tiles`);
	expect(response.status()).toBe(200);
	return (await response.json()).items;
}

async function ready(client: APIRequestContext, revisionId: number): Promise<SheetTiles[]> {
	await expect
		.poll(async () => (await tilesOf(client, revisionId)).every((s) => s.status === 'done'), {
			timeout: 60_000
		})
		.toBe(true);
	return tilesOf(client, revisionId);
}

let doccon: APIRequestContext;
test.beforeAll(async () => {
	doccon = await signedInClient('doccon@tacksheet.test');
});
test.afterAll(async () => doccon.dispose());

test('an uploaded drawing is prepared as tiles, with progress, served with an ETag', async () => {
	const response = await doccon.post('/api/projects/1/drawings', {
		multipart: {
			number: 'LBM-20-ISO-9301',
			title: 'Tiled line',
			kind: 'isometric',
			file: {
				name: 'tiled.pdf',
				mimeType: 'application/pdf',
				buffer: Buffer.from(await drawingPdf({ label: 'TILED', pages: 2 }))
			}
		},
		headers: { origin: BASE_URL }
	});
	expect(response.status()).toBe(201);
	const revisionId: number = (await response.json()).revision.id;

	const progress = await (await doccon.get('/api/projects/1/tiles')).json();
	expect(progress).toHaveProperty('preparing');
	expect(progress).toHaveProperty('total');

	const sheets = await ready(doccon, revisionId);
	expect(sheets.map((s) => s.pageIndex)).toEqual([0, 1]);
	const sheet = sheets[1];
	expect(sheet.levels.length).toBeGreaterThanOrEqual(3);
	const url = `${sheet.url}/1/1_0.${sheet.extension}`;
	const tile = await doccon.get(url);
	expect(tile.status()).toBe(200);
	expect(tile.headers()['content-type']).toMatch(/^image\/(webp|png)$/);
	expect(tile.headers()['cache-control']).toContain('private');
	const etag = tile.headers()['etag'];
	expect(etag).toBeTruthy();
	expect((await tile.body()).byteLength).toBeGreaterThan(0);

	const again = await doccon.get(url, { headers: { 'if-none-match': etag } });
	expect(again.status()).toBe(304);
	// Another tile has another ETag.
	const other = await doccon.get(`${sheet.url}/1/0_0.${sheet.extension}`);
	expect(other.headers()['etag']).not.toBe(etag);

	// Once done, the project has nothing left to prepare for this revision.
	const after = await (await doccon.get('/api/projects/1/tiles')).json();
	expect(after.preparing.map((p: { revisionId: number }) => p.revisionId)).not.toContain(
		revisionId
	);

	for (const bad of [
		`${sheet.url}/1/9_9.${sheet.extension}`,
		`${sheet.url}/99/0_0.${sheet.extension}`,
		`${sheet.url}/1/0_0.gif`,
		`${sheet.url}/x/0_0.${sheet.extension}`,
		`/api/revisions/${revisionId}/tiles/7/0/0_0.${sheet.extension}`
	]) {
		const refused = await doccon.get(bad);
		expect(refused.status(), bad).toBe(404);
		expect((await refused.json()).error).toBeTruthy();
	}
});

test('tiles follow the PDF: no member, no tiles; no session, no tiles', async () => {
	// A drawing of VFT-3, where inspector2 is not a member.
	const vft = (await (await doccon.get('/api/projects/2/drawings?pageSize=1')).json()).items[0];
	const revisionId: number = vft.currentRevision.id;
	const [sheet] = await ready(doccon, revisionId);
	const url = `${sheet.url}/0/0_0.${sheet.extension}`;
	expect((await doccon.get(url)).status()).toBe(200);

	const outsider = await signedInClient('inspector2@tacksheet.test');
	for (const path of [url, `/api/revisions/${revisionId}/tiles`, '/api/projects/2/tiles']) {
		expect((await outsider.get(path)).status(), path).toBe(404);
	}
	// The same user reads tiles of the project they are a member of.
	const lbm = (await (await outsider.get('/api/projects/1/drawings?pageSize=1')).json()).items[0];
	expect((await outsider.get(`/api/revisions/${lbm.currentRevision.id}/tiles`)).status()).toBe(200);
	await outsider.dispose();

	const anonymous = await newRequest.newContext({ baseURL: BASE_URL });
	expect((await anonymous.get(url)).status()).toBe(401);
	await anonymous.dispose();
});
