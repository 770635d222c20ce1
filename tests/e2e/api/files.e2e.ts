/**
 * Drawing files are served in parts on request (so pdf.js can fetch a large sheet in pieces),
 * and every answer carries the security headers.
 */
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { BASE_URL, signedInClient } from '../support';

let viewer: APIRequestContext;
let fileUrl: string;
let whole: Buffer;
test.beforeAll(async () => {
	viewer = await signedInClient('viewer@tacksheet.test');
	const first = (await (await viewer.get('/api/projects/1/drawings?pageSize=1')).json()).items[0];
	fileUrl = `/api/revisions/${first.currentRevision.id}/file`;
	whole = await (await viewer.get(fileUrl)).body();
});
test.afterAll(async () => viewer.dispose());

// RFC 9110 §14 (range requests): Accept-Ranges, 206 with Content-Range, 416 with bytes */length.
test('a drawing file is served in parts: 206 for a range, 416 past the end', async () => {
	const full = await viewer.get(fileUrl);
	expect(full.headers()['accept-ranges']).toBe('bytes');
	const first = await viewer.get(fileUrl, { headers: { range: 'bytes=0-99' } });
	expect(first.status()).toBe(206);
	expect(first.headers()['content-range']).toBe(`bytes 0-99/${whole.length}`);
	expect(first.headers()['content-length']).toBe('100');
	expect(Buffer.compare(await first.body(), whole.subarray(0, 100))).toBe(0);
	const tail = await viewer.get(fileUrl, { headers: { range: 'bytes=-50' } });
	expect(tail.status()).toBe(206);
	expect(Buffer.compare(await tail.body(), whole.subarray(whole.length - 50))).toBe(0);
	const past = await viewer.get(fileUrl, { headers: { range: `bytes=${whole.length + 10}-` } });
	expect(past.status()).toBe(416);
	expect(past.headers()['content-range']).toBe(`bytes */${whole.length}`);
	// A range of another copy of the file (If-Range with an old ETag) gets the whole file.
	const stale = await viewer.get(fileUrl, {
		headers: { range: 'bytes=0-99', 'if-range': '"not-this-file"' }
	});
	expect(stale.status()).toBe(200);
	expect((await stale.body()).length).toBe(whole.length);
});

test('every answer carries the security headers', async () => {
	const anonymous = await newRequest.newContext({ baseURL: BASE_URL });
	const page = await viewer.get('/projects/1/drawings');
	const csp = page.headers()['content-security-policy'] ?? '';
	expect(csp).toContain("frame-ancestors 'none'");
	expect(csp).toMatch(/script-src 'self'[^;]*'nonce-/);
	const asset = /\/_app\/immutable\/[^"]+\.js/.exec(await page.text())?.[0];
	expect(asset).toBeTruthy();
	for (const [what, response] of [
		['page', page],
		['sign-in page', await anonymous.get('/signin')],
		['JSON', await viewer.get('/api/me')],
		['refusal', await anonymous.get('/api/me')],
		['drawing file', await viewer.get(fileUrl)],
		['script asset', await anonymous.get(asset!)],
		['not found', await anonymous.get('/no-such-page')]
	] as const) {
		const headers = response.headers();
		expect(headers['x-content-type-options'], what).toBe('nosniff');
		expect(headers['referrer-policy'], what).toBe('same-origin');
		expect(headers['content-security-policy'] ?? '', what).toContain("frame-ancestors 'none'");
	}
	await anonymous.dispose();
});
