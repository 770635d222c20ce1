// NDE lots at scale. (1) One lot of 5,000 butt welds by 40 welders: proposing a selection
// (GET …/selection?seed=, nothing written) and committing one. (2) The lots API on the
// 100,000-joint bench data of the weld-log section, its welds formed into lots at start.
// Rows go in straight through better-sqlite3, as the weld-log section does.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { benchPort, startBenchServer, timeRequests } from './server.js';
import { signIn } from './session.js';
import { seed as seedWeldLog } from './weld-log.js';

// BENCH_PORT moves every section's port when several benches share a machine.
const PORT = benchPort(4);
const ADMIN = { email: 'bench-admin@tacksheet.test', password: 'bench-password-0123' };
const LOT_WELDS = 5000;
const LOT_WELDERS = 40;
const REQUESTS = 100;
const DAY_MS = 86_400_000;
const START = Date.UTC(2026, 5, 1);

/** One project whose 5,000 butt welds of one line, visually accepted, make one RT 5 % lot. */
export function seedOneLot(file) {
	const db = new Database(file);
	db.pragma('journal_mode = WAL');
	db.pragma('synchronous = OFF');
	const adminId = db.prepare('select id from users where email = ?').get(ADMIN.email).id;
	db.transaction(() => {
		const projectId = db
			.prepare("insert into projects (code, name) values ('BENCH-LOT', 'Bench lot') returning id")
			.get().id;
		const welders = Array.from(
			{ length: LOT_WELDERS },
			(_, n) =>
				db
					.prepare(
						'insert into welders (project_id, stamp, stamp_key, name) values (?, ?, upper(?), ?) returning id'
					)
					.get(
						projectId,
						`L${String(n + 1).padStart(2, '0')}`,
						`L${String(n + 1).padStart(2, '0')}`,
						`Lot welder ${n + 1}`
					).id
		);
		const drawing = db.prepare(
			"insert into drawings (project_id, number, kind, line) values (?, ?, 'isometric', '6-P-5000-A1') returning id"
		);
		const joint = db.prepare(
			`insert into joints (project_id, drawing_id, number, sort_key, kind, line, size_text, diameter_mm,
				criteria_set_id, state, state_since) values (?, ?, ?, ?, 'butt', '', '6', 168.275,
				'asme-b31.3-normal', 'awaiting_lot', ?) returning id`
		);
		const weld = db.prepare(
			'insert into welds (joint_id, repair_cycle, welded_on, recorded_at) values (?, 0, ?, ?) returning id'
		);
		const pass = db.prepare('insert into weld_welders (weld_id, welder_id, pass) values (?, ?, ?)');
		const inspection = db.prepare(
			"insert into inspections (joint_id, stage, repair_cycle, decision, inspector_id, inspected_at) values (?, ?, 0, 'accept', ?, ?)"
		);
		let drawingId = 0;
		for (let k = 0; k < LOT_WELDS; k++) {
			if (k % 20 === 0)
				drawingId = drawing.get(projectId, `BL-ISO-${String(k / 20 + 1).padStart(4, '0')}`).id;
			const at = START + (k % 120) * DAY_MS + k;
			const id = joint.get(
				projectId,
				drawingId,
				String((k % 20) + 1),
				String((k % 20) + 1).padStart(8, '0'),
				at
			).id;
			inspection.run(id, 'fitup', adminId, at);
			const weldId = weld.get(id, new Date(at).toISOString().slice(0, 10), at + 3_600_000).id;
			pass.run(weldId, welders[k % LOT_WELDERS], 'root');
			pass.run(weldId, welders[(k + 1) % LOT_WELDERS], 'fill');
			pass.run(weldId, welders[(k + 1) % LOT_WELDERS], 'cap');
			inspection.run(id, 'visual', adminId, at + 7_200_000);
		}
	})();
	db.close();
}

async function freshServer(env) {
	const empty = await startBenchServer({ port: PORT, env });
	await signIn(empty.origin, ADMIN.email, ADMIN.password);
	await empty.stop();
}

async function oneLot() {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-nde-'));
	const env = {
		DATABASE_URL: path.join(dir, 'tacksheet.db'),
		UPLOADS_DIR: path.join(dir, 'uploads'),
		TACKSHEET_DEMO: '0',
		ADMIN_EMAIL: ADMIN.email,
		ADMIN_PASSWORD: ADMIN.password
	};
	try {
		await freshServer(env);
		seedOneLot(env.DATABASE_URL);
		const server = await startBenchServer({ port: PORT, env });
		try {
			console.log(
				`one lot: ${LOT_WELDS.toLocaleString('en')} welds by ${LOT_WELDERS} welders, formed into its lot at start; server ready in ${(server.readyMs / 1000).toFixed(1)} s`
			);
			const cookie = await signIn(server.origin, ADMIN.email, ADMIN.password);
			const init = {
				headers: { cookie, origin: server.origin, 'content-type': 'application/json' }
			};
			const api = `${server.origin}/api/projects/1/nde/lots`;
			const lot = (await (await fetch(`${api}?pageSize=1`, init)).json()).items[0];
			const propose = `${api}/${lot.id}/selection?seed=20261`;
			const first = await (await fetch(propose, init)).json();
			await timeRequests(propose, 3, init);
			const t = await timeRequests(propose, 20, init);
			console.log(
				`propose a selection in the lot (${first.required} asked, ${first.picks.length} drawn, every welder represented) over 20: median ${t.median.toFixed(1)} ms, p95 ${t.p95.toFixed(1)} ms (goal < 200 ms)`
			);
			const started = performance.now();
			const committed = await fetch(`${api}/${lot.id}/selection`, {
				...init,
				method: 'POST',
				body: JSON.stringify({ seed: 20261 })
			});
			const body = await committed.json();
			console.log(
				`commit that selection (${body.selected?.length ?? committed.status} welds to NDE, states and lot refreshed in one transaction): ${(performance.now() - started).toFixed(0)} ms`
			);
			const detail = await timeRequests(`${api}/${lot.id}`, 10, init);
			console.log(
				`GET the lot in full (5,000 welds with their standing) over 10: median ${detail.median.toFixed(1)} ms`
			);
		} finally {
			await server.stop();
		}
	} finally {
		fs.rmSync(dir, { recursive: true, force: true });
	}
}

async function plantLots() {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-nde-'));
	const env = {
		DATABASE_URL: path.join(dir, 'tacksheet.db'),
		UPLOADS_DIR: path.join(dir, 'uploads'),
		TACKSHEET_DEMO: '0',
		ADMIN_EMAIL: ADMIN.email,
		ADMIN_PASSWORD: ADMIN.password
	};
	try {
		await freshServer(env);
		seedWeldLog(env.DATABASE_URL);
		// The weld-log data asks RT of most joints on their drawings; here they are sampled instead.
		const db = new Database(env.DATABASE_URL);
		db.prepare("update joints set nde_required = ''").run();
		const welded = db.prepare('select count(*) as n from welds where repair_cycle = 0').get().n;
		db.close();
		const server = await startBenchServer({ port: PORT, env });
		try {
			const cookie = await signIn(server.origin, ADMIN.email, ADMIN.password);
			const init = { headers: { cookie } };
			const api = `${server.origin}/api/projects/1/nde/lots`;
			const total = (await (await fetch(`${api}?pageSize=1`, init)).json()).total;
			console.log(
				`100,000-joint bench data: ${welded.toLocaleString('en')} original welds formed into ${total.toLocaleString('en')} lots by line at the first start after the upgrade; server ready in ${(server.readyMs / 1000).toFixed(1)} s`
			);
			for (const [label, search] of [
				['first page', ''],
				['open lots, page 100', '?status=open&page=100'],
				['stage filter', '?stage=open&page=7'],
				['search', '?q=6-P-1234']
			]) {
				await timeRequests(`${api}${search}`, 5, init);
				const t = await timeRequests(`${api}${search}`, REQUESTS, init);
				console.log(
					`GET nde/lots (${label}, 25 lots with their welders) over ${REQUESTS}: median ${t.median.toFixed(1)} ms, p95 ${t.p95.toFixed(1)} ms (goal < 50 ms)`
				);
			}
		} finally {
			await server.stop();
		}
	} finally {
		fs.rmSync(dir, { recursive: true, force: true });
	}
}

export async function run() {
	await oneLot();
	await plantLots();
}

if (import.meta.url === `file://${process.argv[1]}`) await run();
