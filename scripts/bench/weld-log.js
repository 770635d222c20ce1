// The weld log at plant scale: 100,000 joints and 400,000 inspection rows in one project.
// A bench server migrates an empty database, the rows go in straight through better-sqlite3
// in one transaction, and a second server then answers the log, the summary and the CSV.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { benchPort, rssMb, startBenchServer, timeRequests } from './server.js';
import { signIn } from './session.js';

const PORT = benchPort(2);
const DRAWINGS = 5000;
const JOINTS_PER_DRAWING = 20;
const AREAS = 20;
const WELDERS = 60;
const REQUESTS = 100;
const ADMIN = { email: 'bench-admin@tacksheet.test', password: 'bench-password-0123' };
const DAY_MS = 86_400_000;
const START = Date.UTC(2026, 5, 1);

/**
 * Ten joint histories, one per `k % 10`, chosen so the states spread as on a busy job and
 * the inspections average four a joint: [state, ndeRequired, welds, inspections as
 * [stage, method, cycle, decision, supersedesPrevious]].
 */
const F = ['fitup', null, 0, 'accept'];
const HISTORIES = [
	['awaiting_fitup', '', 0, []],
	['ready_to_weld', '', 0, [F]],
	['awaiting_visual', 'RT', 1, [F]],
	['repair', 'RT', 1, [F, ['visual', null, 0, 'accept'], ['nde', 'RT', 0, 'reject']]],
	['awaiting_nde', 'RT', 1, [F, ['visual', null, 0, 'accept']]],
	...Array.from({ length: 4 }, () => [
		'accepted',
		'RT+MT+UT',
		1,
		[
			['fitup', null, 0, 'reject'],
			['fitup', null, 0, 'accept', true],
			['visual', null, 0, 'accept'],
			['nde', 'RT', 0, 'accept'],
			['nde', 'MT', 0, 'accept'],
			['nde', 'UT', 0, 'accept']
		]
	]),
	[
		'accepted',
		'RT+MT',
		2,
		[
			F,
			['fitup', null, 0, 'accept', true],
			['visual', null, 0, 'accept'],
			['nde', 'RT', 0, 'reject'],
			['nde', 'MT', 0, 'accept'],
			['visual', null, 1, 'accept'],
			['nde', 'RT', 1, 'accept'],
			['nde', 'MT', 1, 'accept'],
			['nde', 'PT', 1, 'accept']
		]
	]
];

export function seed(file) {
	const db = new Database(file);
	db.pragma('journal_mode = WAL');
	db.pragma('synchronous = OFF');
	const adminId = db.prepare('select id from users where email = ?').get(ADMIN.email).id;
	const insert = {
		project: db.prepare(
			"insert into projects (code, name, client, contractor, site) values ('BENCH-100K', 'Bench plant', 'Owner', 'Contractor', 'Site') returning id"
		),
		drawing: db.prepare(
			"insert into drawings (project_id, number, kind, line, area, system) values (?, ?, 'isometric', ?, ?, ?) returning id"
		),
		revision: db.prepare(
			"insert into revisions (drawing_id, label, status, file_key, file_name, sha256, bytes, page_count) values (?, '0', 'current', ?, 'sheet.pdf', ?, 1000, 1) returning id"
		),
		welder: db.prepare(
			// stamp_key: the stamp as the unique index compares it (ASCII stamps: upper-cased).
			'insert into welders (project_id, stamp, stamp_key, name) values (?, ?, upper(?), ?) returning id'
		),
		joint: db.prepare(
			`insert into joints (project_id, drawing_id, number, sort_key, kind, line, size_text, material,
				wps, criteria_set_id, nde_required, void_reason, state, repair_cycle, state_since)
			values (?, ?, ?, ?, 'butt', ?, '6', 'A106-B', 'WPS-01', 'asme-b31.3-normal', ?, ?, ?, ?, ?) returning id`
		),
		pin: db.prepare(
			'insert into pins (joint_id, revision_id, page_index, x, y) values (?, ?, 0, ?, ?)'
		),
		weld: db.prepare(
			"insert into welds (joint_id, repair_cycle, welded_on, wps) values (?, ?, ?, 'WPS-01') returning id"
		),
		weldWelder: db.prepare('insert into weld_welders (weld_id, welder_id, pass) values (?, ?, ?)'),
		inspection: db.prepare(
			`insert into inspections (joint_id, stage, method, repair_cycle, decision, report_no,
				inspector_id, inspected_at, supersedes_id, against_verdict) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?) returning id`
		)
	};
	let inspections = 0;
	db.transaction(() => {
		const projectId = insert.project.get().id;
		const stampOf = (n) => `W${String(n + 1).padStart(2, '0')}`;
		const welderIds = Array.from(
			{ length: WELDERS },
			(_, n) => insert.welder.get(projectId, stampOf(n), stampOf(n), `Welder ${n + 1}`).id
		);
		for (let dn = 0; dn < DRAWINGS; dn++) {
			const area = `Area ${String((dn % AREAS) + 1).padStart(2, '0')}`;
			const line = `6-P-${String(1000 + dn)}-A1`;
			const number = `BP-ISO-${String(dn + 1).padStart(4, '0')}`;
			const drawingId = insert.drawing.get(projectId, number, line, area, `SYS-${dn % 40}`).id;
			const revisionId = insert.revision.get(
				drawingId,
				`bench/${dn}.pdf`,
				`${dn}`.padStart(64, '0')
			).id;
			for (let jn = 1; jn <= JOINTS_PER_DRAWING; jn++) {
				const k = dn * JOINTS_PER_DRAWING + jn;
				const [state, nde, weldCount, history] = HISTORIES[k % 10];
				const voided = k % 50 === 49;
				const day = START + ((k * 7919) % 200) * DAY_MS;
				const jointId = insert.joint.get(
					projectId,
					drawingId,
					String(jn),
					String(jn).padStart(8, '0'),
					line,
					nde,
					voided ? 'Deleted by revision' : null,
					voided ? 'void' : state,
					Math.max(0, weldCount - 1),
					day + 3 * DAY_MS
				).id;
				insert.pin.run(jointId, revisionId, 40 + jn * 20, 300);
				for (let cycle = 0; cycle < weldCount; cycle++) {
					const weldId = insert.weld.get(
						jointId,
						cycle,
						new Date(day + (cycle + 1) * DAY_MS).toISOString().slice(0, 10)
					).id;
					insert.weldWelder.run(weldId, welderIds[k % WELDERS], 'root');
					insert.weldWelder.run(weldId, welderIds[(k + 7) % WELDERS], 'fill');
					insert.weldWelder.run(weldId, welderIds[(k + 7) % WELDERS], 'cap');
				}
				let previous = null;
				history.forEach(([stage, method, cycle, decision, supersedes], n) => {
					previous = insert.inspection.get(
						jointId,
						stage,
						method,
						cycle,
						decision,
						stage === 'nde' ? `NDE-${k}-${n}` : null,
						adminId,
						day + n * 3_600_000,
						supersedes ? previous : null,
						// About one joint in a hundred has a decision against the verdict.
						k % 97 === 0 && n === history.length - 1 ? 1 : 0
					).id;
					inspections++;
				});
			}
		}
	})();
	db.close();
	return inspections;
}

async function csvExport(server, url, cookie) {
	let peak = rssMb(server.pid);
	const sampler = setInterval(() => {
		peak = Math.max(peak, rssMb(server.pid));
	}, 25);
	const started = performance.now();
	const response = await fetch(url, { headers: { cookie } });
	let bytes = 0;
	let lines = 0;
	for await (const chunk of response.body) {
		bytes += chunk.byteLength;
		for (const byte of chunk) if (byte === 10) lines++;
	}
	const ms = performance.now() - started;
	clearInterval(sampler);
	return { ms, bytes, lines, peak };
}

export async function run() {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-log-'));
	const env = {
		DATABASE_URL: path.join(dir, 'tacksheet.db'),
		UPLOADS_DIR: path.join(dir, 'uploads'),
		TACKSHEET_DEMO: '0',
		ADMIN_EMAIL: ADMIN.email,
		ADMIN_PASSWORD: ADMIN.password
	};
	try {
		const empty = await startBenchServer({ port: PORT, env });
		// The first sign-in makes sure the admin is seeded before the server stops.
		await signIn(empty.origin, ADMIN.email, ADMIN.password);
		await empty.stop();

		const seeding = performance.now();
		const inspections = seed(env.DATABASE_URL);
		const joints = DRAWINGS * JOINTS_PER_DRAWING;
		console.log(
			`seeded ${joints.toLocaleString('en')} joints, ${inspections.toLocaleString('en')} inspections in ${((performance.now() - seeding) / 1000).toFixed(1)} s`
		);

		const server = await startBenchServer({ port: PORT, env });
		try {
			const cookie = await signIn(server.origin, ADMIN.email, ADMIN.password);
			const init = { headers: { cookie } };
			const api = `${server.origin}/api/projects/1`;
			const pages = [
				['area + age, newest first', 'area=Area%2007&sort=age&dir=desc'],
				['state + weld date', 'state=awaiting_visual&sort=weldedOn'],
				['welder + default order', 'welder=W07'],
				['text search', 'q=ISO-12'],
				['no filter, page 1000', 'page=1000&pageSize=50'],
				['state order, page 500', 'sort=state&page=500'],
				['drawing + state order', 'drawing=2345&sort=state'],
				['against the verdict', 'againstVerdict=1'],
				['text search, no match', 'q=no-such-weld']
			];
			for (const [label, search] of pages) {
				await timeRequests(`${api}/joints?${search}`, 5, init);
				const t = await timeRequests(`${api}/joints?${search}`, REQUESTS, init);
				console.log(
					`GET joints (${label}) over ${REQUESTS}: median ${t.median.toFixed(1)} ms, p95 ${t.p95.toFixed(1)} ms (goal < 50 ms)`
				);
			}
			for (const [label, url] of [
				['summary', `${api}/summary`],
				['summary with drawings', `${api}/summary?include=drawings`],
				['board', `${api}/outstanding`],
				['board, one list from 1000', `${api}/outstanding?list=awaiting_visual&offset=1000`]
			]) {
				await timeRequests(url, 5, init);
				const t = await timeRequests(url, REQUESTS, init);
				console.log(
					`GET ${label} over ${REQUESTS}: median ${t.median.toFixed(1)} ms, p95 ${t.p95.toFixed(1)} ms (goal < 50 ms)`
				);
			}
			const progress = await timeRequests(`${api}/progress`, 20, init);
			console.log(`GET progress over 20: median ${progress.median.toFixed(1)} ms`);
			if (process.env.BENCH_SKIP_FILES) return;
			const before = rssMb(server.pid);
			const csv = await csvExport(server, `${api}/joints.csv`, cookie);
			console.log(
				`CSV export of all ${(csv.lines - 1).toLocaleString('en')} rows: ${(csv.ms / 1000).toFixed(2)} s, ${(csv.bytes / 1e6).toFixed(1)} MB (goal < 10 s); server RSS ${before.toFixed(0)} MB before, peak ${csv.peak.toFixed(0)} MB during`
			);
			const xlsx = await csvExport(server, `${api}/joints.xlsx`, cookie);
			console.log(
				`Excel export of all rows: ${(xlsx.ms / 1000).toFixed(2)} s, ${(xlsx.bytes / 1e6).toFixed(1)} MB; server peak RSS ${xlsx.peak.toFixed(0)} MB`
			);
		} finally {
			await server.stop();
		}
	} finally {
		fs.rmSync(dir, { recursive: true, force: true });
	}
}

if (import.meta.url === `file://${process.argv[1]}`) await run();
