/**
 * Uploads that must not land: no drawing in the file, a sheet no drawing has, more pages than
 * the limit (refused while the server keeps answering others), the same number, label or file
 * sent several times at once, and a browser's cookie with another site's Origin.
 */
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';
import { drawingPdf, emptyDocumentPdf, handWrittenPdf } from '../../fixtures/pdfs';

let doccon: APIRequestContext;
test.beforeAll(async () => {
	doccon = await signedInClient('doccon@tacksheet.test');
});
test.afterAll(async () => doccon.dispose());

function pdfPart(bytes: Uint8Array) {
	return { name: 'drawing.pdf', mimeType: 'application/pdf', buffer: Buffer.from(bytes) };
}

function upload(
	url: string,
	fields: Record<string, string>,
	bytes: Uint8Array,
	headers: Record<string, string> = { origin: BASE_URL },
	client = doccon
) {
	return client.post(url, { multipart: { ...fields, file: pdfPart(bytes) }, headers });
}

const newDrawing = (number: string) => ({ number, title: 'Guard', kind: 'isometric' });

test('a PDF with no drawing in it → 422, whether it has no pages or one blank one', async () => {
	for (const [name, bytes] of [
		['no pages', handWrittenPdf({ pages: 0 })],
		['one blank default page', await emptyDocumentPdf()]
	] as const) {
		const response = await upload(
			'/api/projects/1/drawings',
			newDrawing(`LBM-20-X-GUARD-${name.replaceAll(' ', '-')}`),
			bytes
		);
		expect(response.status(), name).toBe(422);
		expect((await response.json()).error, name).toMatch(/no pages|blank/);
	}
});

test('a sheet of 1e9 × 1e9 pt → 422 naming the largest sheet allowed', async () => {
	const response = await upload(
		'/api/projects/1/drawings',
		newDrawing('LBM-20-X-GUARD-HUGE'),
		handWrittenPdf({ width: 1e9, height: 1e9 })
	);
	expect(response.status()).toBe(422);
	expect((await response.json()).error).toMatch(/at most 200 in/);
});

test('20,000 pages → 422 naming the page limit, while the server keeps answering', async () => {
	const bytes = handWrittenPdf({ pages: 20_000 });
	let answered = false;
	const refused = upload('/api/projects/1/drawings', newDrawing('LBM-20-X-GUARD-MANY'), bytes).then(
		(r) => {
			answered = true;
			return r;
		}
	);
	const anonymous = await newRequest.newContext({ baseURL: BASE_URL });
	// Health is asked once the upload is under way, and answers before the upload does.
	await new Promise((r) => setTimeout(r, 300));
	const health = await anonymous.get('/api/health');
	expect(health.status()).toBe(200);
	expect(answered, 'the upload answered before health did').toBe(false);
	const response = await refused;
	expect(response.status()).toBe(422);
	expect((await response.json()).error).toMatch(/20000 pages.*at most 500/);
	await anonymous.dispose();
});

test('one drawing number sent four times at once → one 201, three 409', async () => {
	const files = await Promise.all([1, 2, 3, 4].map((i) => drawingPdf({ label: `PARALLEL ${i}` })));
	const statuses = await Promise.all(
		files.map(async (bytes) =>
			(
				await upload('/api/projects/1/drawings', newDrawing('LBM-20-X-GUARD-PARALLEL'), bytes)
			).status()
		)
	);
	expect(statuses.sort()).toEqual([201, 409, 409, 409]);
});

test('one revision label, or the identical file, sent at once → one 201, the rest 409', async () => {
	const created = await upload(
		'/api/projects/1/drawings',
		newDrawing('LBM-20-X-GUARD-REVISIONS'),
		await drawingPdf({ label: 'GUARD REV 0' })
	);
	expect(created.status()).toBe(201);
	const url = `/api/projects/1/drawings/${(await created.json()).drawing.id}/revisions`;
	const files = await Promise.all([1, 2, 3].map((i) => drawingPdf({ label: `GUARD REV A${i}` })));
	const byLabel = await Promise.all(
		files.map(async (bytes) => (await upload(url, { label: 'A' }, bytes)).status())
	);
	expect(byLabel.sort()).toEqual([201, 409, 409]);
	const same = await drawingPdf({ label: 'GUARD SAME FILE' });
	const byFile = await Promise.all(
		['B', 'C', 'D'].map(async (label) => (await upload(url, { label }, same)).status())
	);
	expect(byFile.sort()).toEqual([201, 409, 409]);
});

test("a browser's cookie with another site's Origin is refused, whatever Authorization says", async () => {
	const bytes = await drawingPdf({ label: 'CROSS SITE' });
	const response = await upload(
		'/api/projects/1/drawings',
		newDrawing('LBM-20-X-GUARD-CROSS'),
		bytes,
		{
			origin: 'http://elsewhere.test',
			authorization: 'Basic ZG9jY29uOng='
		}
	);
	expect(response.status()).toBe(403);
	// A script with a personal API token and no cookie needs no Origin.
	const tokenAnswer = await doccon.post('/api/tokens', {
		data: { name: 'upload script' },
		headers: { origin: BASE_URL }
	});
	const { token } = await tokenAnswer.json();
	const script = await newRequest.newContext({ baseURL: BASE_URL });
	const scripted = await upload(
		'/api/projects/1/drawings',
		newDrawing('LBM-20-X-GUARD-SCRIPTED'),
		bytes,
		{ authorization: `Bearer ${token}` },
		script
	);
	expect(scripted.status()).toBe(201);
	await script.dispose();
});
