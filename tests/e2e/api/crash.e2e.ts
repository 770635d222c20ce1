/**
 * The server killed outright (SIGKILL) while inspectors write and while a turnover set is
 * being written, then started again on the same files: the database is intact, no write it
 * acknowledged is lost or stored twice, no half-written zip is left, and the export that was
 * running reads failed. Runs its own server from the production build beside the test server.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { expect, test } from '@playwright/test';

const PORT = Number(process.env.E2E_PORT || 4173) + 1;
const ORIGIN = `http://localhost:${PORT}`;
const DIR = path.resolve(`test-results/crash-${PORT}`);
const DB_FILE = path.join(DIR, 'tacksheet.db');
const EXPORTS = path.join(DIR, 'uploads', 'exports');

function start(): ChildProcess {
	return spawn(process.execPath, ['scripts/start.js'], {
		env: {
			...process.env,
			PORT: String(PORT),
			ORIGIN,
			DATABASE_URL: DB_FILE,
			UPLOADS_DIR: path.join(DIR, 'uploads'),
			AUTH_SECRET: 'crash-test-secret-not-for-production-0123456789',
			TACKSHEET_DEMO: '1',
			TACKSHEET_SKIP_BUILD: '1'
		},
		stdio: 'ignore'
	});
}

async function healthy(child: ChildProcess) {
	for (let waited = 0; waited < 180_000; waited += 100) {
		if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode}`);
		const ok = await fetch(`${ORIGIN}/api/health`)
			.then((r) => r.ok)
			.catch(() => false);
		if (ok) return;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error('the server did not come up');
}

async function killHard(child: ChildProcess) {
	const exited = new Promise((r) => child.once('exit', r));
	child.kill('SIGKILL');
	await exited;
}

async function signIn(email: string): Promise<string> {
	const response = await fetch(`${ORIGIN}/auth/callback/credentials`, {
		method: 'POST',
		headers: { origin: ORIGIN, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, password: 'tacksheet-demo', callbackUrl: '/' }),
		redirect: 'manual'
	});
	return response.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');
}

function readDb<T>(read: (db: Database.Database) => T): T {
	const db = new Database(DB_FILE, { readonly: true });
	try {
		return read(db);
	} finally {
		db.close();
	}
}

let server: ChildProcess | null = null;
test.afterAll(async () => {
	if (server && server.exitCode === null) await killHard(server);
});

test('killed during writes and during an export, the server starts again with nothing lost', async () => {
	test.setTimeout(300_000);
	fs.rmSync(DIR, { recursive: true, force: true });
	server = start();
	await healthy(server);
	const cookie = await signIn('inspector@tacksheet.test');
	const json = async (url: string) =>
		(await fetch(ORIGIN + url, { headers: { cookie } })).json() as Promise<{
			items: { pinId: number; jointId: number; version: number; state: string }[];
		}>;
	const first = (
		(await await fetch(`${ORIGIN}/api/projects/1/drawings?pageSize=1`, {
			headers: { cookie }
		}).then((r) => r.json())) as { items: { currentRevision: { id: number } }[] }
	).items[0];
	const pins = (await json(`/api/revisions/${first.currentRevision.id}/pins`)).items.filter(
		(p) => p.state !== 'void'
	);
	expect(pins.length).toBeGreaterThan(3);

	// Writes: each writer moves its own pin again and again, until the server is killed.
	const acknowledged: { pinId: number; x: number }[] = [];
	let sent = 0;
	let stop = false;
	const writers = pins.slice(0, 8).map(async (pin, w) => {
		let version = pin.version;
		for (let n = 1; !stop; n++) {
			const x = 100 + w + n / 1e4;
			sent++;
			const response = await fetch(`${ORIGIN}/api/pins/${pin.pinId}`, {
				method: 'PATCH',
				headers: { cookie, origin: ORIGIN, 'content-type': 'application/json' },
				body: JSON.stringify({ x, y: 200, version })
			}).catch(() => null);
			if (!response) return;
			if (response.status !== 200) throw new Error(`pin move answered ${response.status}`);
			version = ((await response.json()) as { version: number }).version;
			acknowledged.push({ pinId: pin.pinId, x });
		}
	});
	await new Promise((r) => setTimeout(r, 1500));
	await killHard(server);
	stop = true;
	await Promise.all(writers);
	expect(acknowledged.length).toBeGreaterThan(0);

	server = start();
	await healthy(server);
	const stored = readDb((db) => {
		expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
		return db
			.prepare(`select entity_id as pinId, after from audit_events where action = 'pin_move'`)
			.all() as { pinId: string; after: string }[];
	});
	const counts = new Map<string, number>();
	for (const row of stored) {
		const key = `${row.pinId}:${JSON.parse(row.after).x}`;
		counts.set(key, (counts.get(key) ?? 0) + 1);
	}
	for (const move of acknowledged)
		expect(counts.get(`${move.pinId}:${move.x}`) ?? 0, `pin ${move.pinId} to ${move.x}`).toBe(1);
	// Nothing beyond what was sent: at most the writes in flight at the kill were stored unanswered.
	expect(stored.length).toBeGreaterThanOrEqual(acknowledged.length);
	expect(stored.length).toBeLessThanOrEqual(sent);

	// An export, killed while it runs (while its zip is being written, when that is caught).
	const admin = await signIn('admin@tacksheet.test');
	const queued = await fetch(`${ORIGIN}/api/projects/1/exports`, {
		method: 'POST',
		headers: { cookie: admin, origin: ORIGIN, 'content-type': 'application/json' },
		body: JSON.stringify({ scope: { all: true }, includeSuperseded: true })
	});
	expect(queued.status).toBe(202);
	const { id } = (await queued.json()) as { id: number };
	// Killed as soon as the zip is being written, or once the job is past half way.
	let status = 'queued';
	for (let waited = 0; waited < 120_000; waited += 5) {
		const partial =
			fs.existsSync(EXPORTS) && fs.readdirSync(EXPORTS).some((name) => name.endsWith('.part'));
		const row = readDb(
			(db) =>
				db.prepare('select status, progress from exports where id = ?').get(id) as {
					status: string;
					progress: number;
				}
		);
		status = row.status;
		if (status !== 'queued' && (status !== 'running' || partial || row.progress > 0.5)) break;
		await new Promise((r) => setTimeout(r, 5));
	}
	expect(status, 'the export was still running when the server was killed').toBe('running');
	await killHard(server);

	server = start();
	await healthy(server);
	expect(
		fs.existsSync(EXPORTS) ? fs.readdirSync(EXPORTS).filter((name) => name.endsWith('.part')) : []
	).toEqual([]);
	const job = (await (
		await fetch(`${ORIGIN}/api/exports/${id}`, { headers: { cookie: admin } })
	).json()) as { status: string; report: string[] };
	expect(job.status).toBe('failed');
	expect(job.report.join(' ')).toMatch(/stopped/);
	readDb((db) => expect(db.pragma('integrity_check', { simple: true })).toBe('ok'));
	const stopped = new Promise((r) => server!.once('exit', r));
	server.kill('SIGTERM');
	await stopped;
	fs.rmSync(DIR, { recursive: true, force: true });
});
