/**
 * Drawing uploads over HTTP against the production server: good ones are registered with
 * their sheets and hash; every bad one gets its status and a message, and leaves no file
 * and no row behind.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { expect, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';
import { bulkyPdf, damagedPdf, drawingPdf, passwordProtectedPdf } from '../../fixtures/pdfs';

const UPLOADS = path.resolve(`test-results/e2e-${process.env.E2E_PORT || 4173}/uploads`);

function filesOnDisk(): string[] {
	const list: string[] = [];
	for (const folder of ['revisions', 'tmp']) {
		const dir = path.join(UPLOADS, folder);
		if (fs.existsSync(dir)) for (const name of fs.readdirSync(dir)) list.push(`${folder}/${name}`);
	}
	return list.sort();
}

async function registerTotal(client: APIRequestContext): Promise<number> {
	return (await (await client.get('/api/projects/1/drawings?pageSize=1')).json()).total;
}

function pdfPart(bytes: Uint8Array, name = 'drawing.pdf') {
	return { name, mimeType: 'application/pdf', buffer: Buffer.from(bytes) };
}

let doccon: APIRequestContext;
test.beforeAll(async () => {
	doccon = await signedInClient('doccon@tacksheet.test');
});
test.afterAll(async () => doccon.dispose());

async function upload(
	url: string,
	fields: Record<string, string>,
	bytes: Uint8Array,
	name?: string
) {
	return doccon.post(url, {
		multipart: { ...fields, file: pdfPart(bytes, name) },
		headers: { origin: BASE_URL }
	});
}

test('a new drawing is registered with its first revision, sheets and SHA-256; the file comes back', async () => {
	const bytes = await drawingPdf({ label: 'UPLOAD-NEW', pages: 2 });
	const response = await upload(
		'/api/projects/1/drawings',
		{ number: 'LBM-20-ISO-9001', title: 'Test line', kind: 'isometric', revision: '0' },
		bytes
	);
	expect(response.status()).toBe(201);
	const body = await response.json();
	expect(body.drawing).toMatchObject({ number: 'LBM-20-ISO-9001', kind: 'isometric' });
	expect(body.revision).toMatchObject({
		label: '0',
		status: 'current',
		pageCount: 2,
		sha256: crypto.createHash('sha256').update(bytes).digest('hex'),
		pages: [
			{ index: 0, width: 1224, height: 792, rotation: 0 },
			{ index: 1, width: 1224, height: 792, rotation: 0 }
		]
	});
	const file = await doccon.get(body.revision.fileUrl);
	expect(file.status()).toBe(200);
	expect(file.headers()['content-type']).toBe('application/pdf');
	expect(file.headers()['etag']).toBe(`"${body.revision.sha256}"`);
	expect(file.headers()['content-disposition']).toMatch(/filename="LBM-20-ISO-9001_rev0\.pdf"/);
	expect(Buffer.compare(await file.body(), Buffer.from(bytes))).toBe(0);
	const again = await doccon.get(body.revision.fileUrl, {
		headers: { 'if-none-match': `"${body.revision.sha256}"` }
	});
	expect(again.status()).toBe(304);

	// A second revision supersedes the first.
	const next = await upload(
		`/api/projects/1/drawings/${body.drawing.id}/revisions`,
		{ label: 'a', note: 'Re-issued' },
		await drawingPdf({ label: 'UPLOAD-NEW rev A' })
	);
	expect(next.status()).toBe(201);
	const revision = (await next.json()).revision;
	expect(revision).toMatchObject({ label: 'A', status: 'current', note: 'Re-issued' });
	expect((await (await doccon.get(`/api/revisions/${body.revision.id}`)).json()).status).toBe(
		'superseded'
	);
});

const bad: {
	name: string;
	status: number;
	message: RegExp;
	send: () => Promise<{
		url: string;
		fields: Record<string, string>;
		bytes: Uint8Array;
		file?: string;
	}>;
}[] = [
	{
		name: 'not a PDF (whatever its name)',
		status: 415,
		message: /not a PDF/,
		send: async () => ({
			url: '/api/projects/1/drawings',
			fields: { number: 'BAD-1', kind: 'isometric' },
			bytes: new TextEncoder().encode('GIF89a this is a picture, not a drawing'.repeat(60)),
			file: 'looks-like.pdf'
		})
	},
	{
		name: 'a damaged PDF',
		status: 422,
		message: /damaged/,
		send: async () => ({
			url: '/api/projects/1/drawings',
			fields: { number: 'BAD-2', kind: 'isometric' },
			bytes: damagedPdf()
		})
	},
	{
		name: 'a password-protected PDF',
		status: 422,
		message: /password/,
		send: async () => ({
			url: '/api/projects/1/drawings',
			fields: { number: 'BAD-3', kind: 'isometric' },
			bytes: passwordProtectedPdf()
		})
	},
	{
		name: 'a drawing number already registered',
		status: 409,
		message: /already registered/,
		send: async () => ({
			url: '/api/projects/1/drawings',
			fields: { number: 'LBM-20-ISO-1102', kind: 'isometric' },
			bytes: await drawingPdf({ label: 'DUP' })
		})
	},
	{
		name: 'a revision label the drawing already has',
		status: 409,
		message: /already has a revision 1/,
		send: async () => ({
			url: '/api/projects/1/drawings/1/revisions',
			fields: { label: '1' },
			bytes: await drawingPdf({ label: 'SAME LABEL' })
		})
	},
	{
		name: 'a missing kind',
		status: 400,
		message: /kind/,
		send: async () => ({
			url: '/api/projects/1/drawings',
			fields: { number: 'BAD-4' },
			bytes: await drawingPdf({ label: 'NO KIND' })
		})
	}
];

for (const c of bad) {
	test(`${c.name} → ${c.status}, and nothing is left behind`, async () => {
		const before = { files: filesOnDisk(), total: await registerTotal(doccon) };
		const { url, fields, bytes, file } = await c.send();
		const response = await upload(url, fields, bytes, file);
		expect(response.status()).toBe(c.status);
		expect((await response.json()).error).toMatch(c.message);
		expect(filesOnDisk()).toEqual(before.files);
		expect(await registerTotal(doccon)).toBe(before.total);
	});
}

test('the very same file again → 409 naming the revision that has it', async () => {
	const list = await (await doccon.get('/api/projects/1/drawings?q=LBM-20-ISO-1103')).json();
	const drawing = list.items[0];
	const stored = await (
		await doccon.get(`/api/revisions/${drawing.currentRevision.id}/file`)
	).body();
	const before = filesOnDisk();
	const response = await upload(
		`/api/projects/1/drawings/${drawing.id}/revisions`,
		{ label: '9' },
		new Uint8Array(stored)
	);
	expect(response.status()).toBe(409);
	expect((await response.json()).error).toMatch(/already stored as revision 0 of LBM-20-ISO-1103/);
	expect(filesOnDisk()).toEqual(before);
});

for (const megabytes of [27, 25.4]) {
	// 27 MB is refused from its declared length; 25.4 MB only once the stream passes 25 MB.
	test(`a ${megabytes} MB file over the size limit → 413, and nothing is left behind`, async () => {
		test.setTimeout(120_000);
		// The browser-test server runs with UPLOAD_MAX_MB=25.
		const before = { files: filesOnDisk(), total: await registerTotal(doccon) };
		const response = await upload(
			'/api/projects/1/drawings',
			{ number: 'BIG-1', kind: 'structural' },
			await bulkyPdf(megabytes)
		);
		expect(response.status()).toBe(413);
		expect((await response.json()).error).toMatch(/larger than the 25 MB limit/);
		expect(filesOnDisk()).toEqual(before.files);
		expect(await registerTotal(doccon)).toBe(before.total);
	});
}

test('only roles that may upload can, and only from Tacksheet itself', async () => {
	const viewer = await signedInClient('viewer@tacksheet.test');
	const bytes = await drawingPdf({ label: 'VIEWER' });
	const refused = await viewer.post('/api/projects/1/drawings', {
		multipart: { number: 'V-1', kind: 'shop', file: pdfPart(bytes) },
		headers: { origin: BASE_URL }
	});
	expect(refused.status()).toBe(403);
	const crossSite = await doccon.post('/api/projects/1/drawings', {
		multipart: { number: 'X-1', kind: 'shop', file: pdfPart(bytes) },
		headers: { origin: 'https://elsewhere.test' }
	});
	expect(crossSite.status()).toBe(403);
	await viewer.dispose();
});
