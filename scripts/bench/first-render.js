// Time from navigation start to the first rendered sheet, for the largest demo sheet, in
// headless Chromium at a tablet's 1024×768 with a 2× pixel ratio: the heaviest first paint a
// site tablet gets from the demo job (the whole sheet rendered at 2× into one canvas).
import { chromium } from '@playwright/test';
import { percentile, startBenchServer } from './server.js';
import { signIn } from './session.js';

const LOADS = 5;
const VIEWPORT = { width: 1024, height: 768 };
const PIXEL_RATIO = 2;

async function getJson(origin, cookie, path) {
	const response = await fetch(`${origin}${path}`, { headers: { cookie } });
	if (!response.ok) throw new Error(`GET ${path} answered ${response.status}`);
	return response.json();
}

/** Every current sheet of every project the user can see; the one with the largest area wins. */
async function largestSheet(origin, cookie) {
	let largest = null;
	for (const project of await getJson(origin, cookie, '/api/projects')) {
		const register = await getJson(
			origin,
			cookie,
			`/api/projects/${project.id}/drawings?pageSize=200`
		);
		for (const drawing of register.items) {
			if (!drawing.currentRevision) continue;
			const revision = await getJson(
				origin,
				cookie,
				`/api/revisions/${drawing.currentRevision.id}`
			);
			for (const page of revision.pages) {
				const area = page.width * page.height;
				if (largest && area <= largest.area) continue;
				largest = {
					area,
					page,
					label: revision.label,
					number: drawing.number,
					href: `/projects/${project.id}/drawings/${drawing.id}?page=${page.index + 1}`
				};
			}
		}
	}
	if (!largest) throw new Error('the bench server has no drawings');
	return largest;
}

const mm = (points) => Math.round((points * 25.4) / 72);

export async function run() {
	const server = await startBenchServer();
	let browser = null;
	try {
		browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true });
		const cookie = await signIn(server.origin, 'inspector@tacksheet.test');
		const sheet = await largestSheet(server.origin, cookie);
		const cookies = cookie.split('; ').map((pair) => {
			const at = pair.indexOf('=');
			return { name: pair.slice(0, at), value: pair.slice(at + 1), url: server.origin };
		});
		const selector = `[data-rendered-page="${sheet.page.index + 1}"]`;
		const times = [];
		for (let i = 0; i < LOADS; i++) {
			// A fresh context has an empty cache: every load fetches the app, pdf.js and the PDF.
			const context = await browser.newContext({
				viewport: VIEWPORT,
				deviceScaleFactor: PIXEL_RATIO,
				hasTouch: true
			});
			await context.addCookies(cookies);
			// The moment the attribute appears, in the page's own clock, which starts at
			// navigation start; polling from here would add the round trip to every figure.
			await context.addInitScript((wanted) => {
				new MutationObserver((_, observer) => {
					if (!document.querySelector(wanted)) return;
					window.__firstRenderMs = performance.now();
					observer.disconnect();
				}).observe(document, { subtree: true, childList: true, attributes: true });
			}, selector);
			const page = await context.newPage();
			await page.goto(`${server.origin}${sheet.href}`, { waitUntil: 'commit' });
			await page.waitForSelector(selector, { state: 'attached', timeout: 60_000 });
			times.push(await page.evaluate(() => window.__firstRenderMs));
			await context.close();
		}
		times.sort((a, b) => a - b);
		console.log(
			`first rendered sheet of ${sheet.number} rev ${sheet.label} (${mm(sheet.page.width)} × ${mm(sheet.page.height)} mm), ${VIEWPORT.width}×${VIEWPORT.height} at ${PIXEL_RATIO}× pixel ratio, ${LOADS} cold loads: median ${percentile(times, 50).toFixed(0)} ms, worst ${times.at(-1).toFixed(0)} ms`
		);
	} finally {
		await browser?.close();
		await server.stop();
	}
}
