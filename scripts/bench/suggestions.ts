// The run behind scripts/bench/suggestions.js (see there). Sheets come from the demo's own
// drawing generator with other seeds, so they carry the content of real-looking isometrics,
// spool and structural sheets on ANSI B, A3 and A1 paper.
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { DEMO_PROJECTS, demoSheetSpec } from '$lib/server/demo/scenario';
import { renderDemoSheet, type DemoSheet } from '$lib/server/demo/sheets';
import { findWeldNumbers } from '$lib/server/sheet-text/finder';

const UPLOADS = 100;
const GOAL_MS = 200;
const RULE = { shopPrefix: '', fieldPrefix: 'FW-' };

const percentile = (sorted: number[], p: number) =>
	sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
const mb = (bytes: number) => bytes / 1024 / 1024;

async function drawings(): Promise<DemoSheet[]> {
	const specs = DEMO_PROJECTS.flatMap((project) =>
		project.drawings.flatMap((drawing) =>
			drawing.revisions.map((revision) => ({ project, drawing, revision }))
		)
	);
	const out: DemoSheet[] = [];
	for (let i = 0; i < UPLOADS; i++) {
		const { project, drawing, revision } = specs[i % specs.length];
		out.push(
			await renderDemoSheet({
				...demoSheetSpec(project, drawing, revision, revision.seed + 1000 * (i + 1)),
				number: `${drawing.number}-B${i}`
			})
		);
	}
	return out;
}

const files = await drawings();
const pages = files.reduce((n, f) => n + f.pages.length, 0);
const welds = files.reduce((n, f) => n + f.welds.length, 0);

// The worker starts on first use: that first read is reported on its own.
let started = performance.now();
await findWeldNumbers(files[0].bytes, RULE);
const firstMs = performance.now() - started;

global.gc?.();
const idle = process.memoryUsage().rss;
let peak = idle;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 10);
const loop = monitorEventLoopDelay({ resolution: 10 });
loop.enable();
const perSheet: number[] = [];
let found = 0;
let matched = 0;
started = performance.now();
for (const file of files) {
	const t = performance.now();
	const result = await findWeldNumbers(file.bytes, RULE);
	perSheet.push((performance.now() - t) / file.pages.length);
	found += result.items.length;
	for (const item of result.items)
		if (
			file.welds.some(
				(w) =>
					w.number === item.number &&
					w.pageIndex === item.pageIndex &&
					Math.hypot(w.x - item.x, w.y - item.y) <= 20
			)
		)
			matched++;
}
const totalS = (performance.now() - started) / 1000;
loop.disable();
clearInterval(sampler);
perSheet.sort((a, b) => a - b);
const mean = perSheet.reduce((s, v) => s + v, 0) / perSheet.length;

console.log(
	`${UPLOADS} uploads, ${pages} sheets, ${welds} weld numbers: ${totalS.toFixed(1)} s in all; per sheet mean ${mean.toFixed(0)} ms, median ${percentile(perSheet, 50).toFixed(0)} ms, p95 ${percentile(perSheet, 95).toFixed(0)} ms, worst ${perSheet.at(-1)!.toFixed(0)} ms (goal < ${GOAL_MS} ms a sheet)`
);
console.log(`first upload, starting the reader's worker: ${firstMs.toFixed(0)} ms`);
console.log(
	`process memory: ${mb(idle).toFixed(0)} MB before, peak ${mb(peak).toFixed(0)} MB while reading (reader worker included)`
);
console.log(
	`event loop while reading (perf_hooks.monitorEventLoopDelay): p99 ${(loop.percentile(99) / 1e6).toFixed(1)} ms, longest stall ${(loop.max / 1e6).toFixed(1)} ms`
);
console.log(
	`suggestions: ${found} found, ${matched} of ${welds} weld numbers within 20 pt (recall ${((matched / welds) * 100).toFixed(1)} %, precision ${((matched / Math.max(1, found)) * 100).toFixed(1)} %)`
);
process.exit(0);
