// A turnover set of 100 sheets carrying 2,000 pins: how long the job takes end to end, the
// server's peak memory while it runs, and how quickly the server still answers meanwhile: from
// outside (a stream of /api/health requests) and from inside (the server's event-loop delay).
// The sheets are copies of a real demo isometric, so each page has the content of a drawing.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import crypto from 'node:crypto';
import Database from 'better-sqlite3';
import { PDFDocument } from 'pdf-lib';
import { fileURLToPath } from 'node:url';
import { benchPort, percentile, rssMb, startBenchServer } from './server.js';
import { signIn } from './session.js';

const DRAWINGS = 10;
const SHEETS_PER_DRAWING = 10;
const PINS_PER_SHEET = 20;
const AREA = 'Bench turnover';
const GOAL_S = 20;
const GOAL_MB = 500;
const STATES = [
	'awaiting_fitup',
	'fitup_rejected',
	'ready_to_weld',
	'awaiting_visual',
	'repair',
	'awaiting_nde',
	'accepted',
	'void'
];

/** Line work added to each sheet, so a page weighs what a dense CAD isometric does. */
const EXTRA_SEGMENTS = 4000;

async function benchPdf(sourceFile, seed) {
	const source = await PDFDocument.load(fs.readFileSync(sourceFile));
	const out = await PDFDocument.create();
	const pages = await out.copyPages(
		source,
		Array.from({ length: SHEETS_PER_DRAWING }, () => 0)
	);
	let state = seed;
	const random = () => (state = (state * 16807) % 2147483647) / 2147483647;
	for (const page of pages) {
		out.addPage(page);
		const { width, height } = page.getSize();
		let d = '';
		for (let i = 0; i < EXTRA_SEGMENTS; i++) {
			const x = random() * width;
			const y = random() * height;
			d += `M ${x.toFixed(2)} ${y.toFixed(2)} L ${(x + random() * 30).toFixed(2)} ${(y + random() * 30).toFixed(2)} `;
		}
		page.drawSvgPath(d, { x: 0, y: height, borderWidth: 0.3, opacity: 0.15 });
	}
	return out.save();
}

/** Drawings, sheets, joints and pins written straight into the server's database. */
async function seedSet(server) {
	const db = new Database(path.join(server.dir, 'tacksheet.db'), { timeout: 5000 });
	const uploads = path.join(server.dir, 'uploads');
	const demo = db
		.prepare(
			`SELECT r.file_key AS fileKey, p.x0, p.y0, p.x1, p.y1, p.rotation FROM revisions r
			JOIN drawings d ON d.id = r.drawing_id JOIN pages p ON p.revision_id = r.id
			WHERE d.number = 'LBM-20-ISO-1102' AND r.status = 'current' AND p.page_index = 0`
		)
		.get();
	const files = [];
	for (let n = 1; n <= DRAWINGS; n++)
		files.push(await benchPdf(path.join(uploads, demo.fileKey), n));
	const insert = db.transaction(() => {
		let pins = 0;
		for (let n = 1; n <= DRAWINGS; n++) {
			const number = `BENCH-ISO-${String(n).padStart(3, '0')}`;
			const drawingId = db
				.prepare(
					`INSERT INTO drawings (project_id, number, title, kind, area) VALUES (1, ?, 'Bench sheet set', 'isometric', ?)`
				)
				.run(number, AREA).lastInsertRowid;
			const bytes = files[n - 1];
			const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
			const fileKey = `revisions/bench-${n}.pdf`;
			fs.mkdirSync(path.join(uploads, 'revisions'), { recursive: true });
			fs.writeFileSync(path.join(uploads, fileKey), bytes);
			const revisionId = db
				.prepare(
					`INSERT INTO revisions (drawing_id, label, status, file_key, file_name, sha256, bytes, page_count)
					VALUES (?, '0', 'current', ?, ?, ?, ?, ?)`
				)
				.run(
					drawingId,
					fileKey,
					`${number}.pdf`,
					sha256,
					bytes.byteLength,
					SHEETS_PER_DRAWING
				).lastInsertRowid;
			for (let s = 0; s < SHEETS_PER_DRAWING; s++) {
				db.prepare(
					`INSERT INTO pages (revision_id, page_index, x0, y0, x1, y1, rotation) VALUES (?, ?, ?, ?, ?, ?, ?)`
				).run(revisionId, s, demo.x0, demo.y0, demo.x1, demo.y1, demo.rotation);
				for (let k = 0; k < PINS_PER_SHEET; k++) {
					const weld = s * PINS_PER_SHEET + k + 1;
					const jointId = db
						.prepare(
							`INSERT INTO joints (project_id, drawing_id, number, sort_key, kind, criteria_set_id, state, repair_cycle)
							VALUES (1, ?, ?, ?, 'butt', 'asme-b31.3-normal', ?, ?)`
						)
						.run(
							drawingId,
							String(weld),
							String(weld).padStart(8, '0'),
							STATES[weld % 8],
							weld % 8 === 4 ? 1 : 0
						).lastInsertRowid;
					const x = demo.x0 + 60 + (k % 5) * ((demo.x1 - demo.x0 - 120) / 4);
					const y = demo.y0 + 60 + Math.floor(k / 5) * ((demo.y1 - demo.y0 - 120) / 3);
					db.prepare(
						`INSERT INTO pins (joint_id, revision_id, page_index, x, y) VALUES (?, ?, ?, ?, ?)`
					).run(jointId, revisionId, s, x, y);
					pins++;
				}
			}
		}
		return pins;
	});
	const pins = insert();
	db.close();
	const sourceMb = files.reduce((sum, f) => sum + f.byteLength, 0) / DRAWINGS / 1024 / 1024;
	return { pins, sheets: DRAWINGS * SHEETS_PER_DRAWING, sourceMb };
}

/**
 * The server's event-loop delay since the last call (p99 and longest stall), read through the
 * preloaded loop-delay.js: one signal, then wait for the file it writes.
 */
async function loopDelay(server, file) {
	const before = fs.existsSync(file) ? JSON.parse(fs.readFileSync(file, 'utf8')).seq : 0;
	process.kill(server.pid, 'SIGUSR2');
	for (let i = 0; i < 200; i++) {
		await new Promise((r) => setTimeout(r, 10));
		if (!fs.existsSync(file)) continue;
		const figures = JSON.parse(fs.readFileSync(file, 'utf8'));
		if (figures.seq > before) return figures;
	}
	throw new Error('the bench server did not report its event-loop delay');
}

export async function run({ port = benchPort(1) } = {}) {
	const loopFile = path.join(
		fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-loop-')),
		'delay.json'
	);
	const preload = fileURLToPath(new URL('./loop-delay.js', import.meta.url));
	const server = await startBenchServer({
		port,
		env: {
			NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ''} --import=${preload}`.trim(),
			LOOP_DELAY_FILE: loopFile
		}
	});
	try {
		const seeded = await seedSet(server);
		const cookie = await signIn(server.origin, 'turnover@tacksheet.test');
		const headers = { cookie, origin: server.origin, 'content-type': 'application/json' };
		const baseline = rssMb(server.pid);
		await loopDelay(server, loopFile);
		const started = performance.now();
		const response = await fetch(`${server.origin}/api/projects/1/exports`, {
			method: 'POST',
			headers,
			body: JSON.stringify({ scope: { area: AREA } })
		});
		if (response.status !== 202) throw new Error(`export answered ${response.status}`);
		const { id } = await response.json();

		let peak = baseline;
		const sampler = setInterval(() => (peak = Math.max(peak, rssMb(server.pid))), 25);
		const latencies = [];
		let running = true;
		// A steady stream of light requests beside the job: how long one waits shows whether
		// the export leaves the event loop free.
		const prober = (async () => {
			while (running) {
				const t = performance.now();
				await (await fetch(`${server.origin}/api/health`)).arrayBuffer();
				latencies.push(performance.now() - t);
				await new Promise((r) => setTimeout(r, 20));
			}
		})();
		let job;
		for (;;) {
			job = await (await fetch(`${server.origin}/api/exports/${id}`, { headers })).json();
			if (!['queued', 'running'].includes(job.status)) break;
			await new Promise((r) => setTimeout(r, 50));
		}
		const stalls = await loopDelay(server, loopFile);
		running = false;
		await prober;
		const seconds = (performance.now() - started) / 1000;
		clearInterval(sampler);
		if (job.status !== 'done')
			throw new Error(`export ended ${job.status}: ${job.report.join(' ')}`);
		const download = await fetch(`${server.origin}${job.fileUrl}`, { headers });
		const zip = Buffer.from(await download.arrayBuffer());
		latencies.sort((a, b) => a - b);
		console.log(
			`${seeded.sheets} sheets (${DRAWINGS} drawings of ${SHEETS_PER_DRAWING}, ${seeded.sourceMb.toFixed(1)} MB each), ${seeded.pins} pins: zip of ${(zip.length / 1024 / 1024).toFixed(1)} MB in ${seconds.toFixed(1)} s (goal < ${GOAL_S} s)`
		);
		console.log(
			`server memory: ${baseline.toFixed(0)} MB before, peak ${peak.toFixed(0)} MB during the job (goal < ${GOAL_MB} MB)`
		);
		console.log(
			`/api/health while the job ran: median ${percentile(latencies, 50).toFixed(1)} ms, p95 ${percentile(latencies, 95).toFixed(1)} ms, worst ${latencies.at(-1).toFixed(1)} ms over ${latencies.length} requests`
		);
		console.log(
			`server event loop during the job (perf_hooks.monitorEventLoopDelay): p50 ${stalls.p50.toFixed(1)} ms, p99 ${stalls.p99.toFixed(1)} ms, longest stall ${stalls.max.toFixed(1)} ms`
		);
		console.log(`report: ${job.report.slice(-2).join(' ')}`);
	} finally {
		await server.stop();
	}
}

if (import.meta.url === `file://${process.argv[1]}`) await run();
