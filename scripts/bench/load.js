// Many inspectors at once, on loopback, for a bounded time: each reads sheets and joints,
// moves pins and records fit-ups with the version it last saw (a stale one is 409, as it
// should be). Prints requests, 409s, 5xx and latency, then checks the ledger: every write
// the server acknowledged is stored exactly once, nothing it refused is stored, and each pin
// ends where its last acknowledged move put it.
import path from 'node:path';
import Database from 'better-sqlite3';
import { benchPort, percentile, startBenchServer } from './server.js';
import { signIn } from './session.js';

const USERS = Number(process.env.LOAD_USERS || 50);
const SECONDS = Number(process.env.LOAD_SECONDS || 60);
const FITUP = { rootOpening: '1/8', bevelAngle: '37-1/2°', rootFace: '1/16', misalignment: '1/32' };

function random(n) {
	return Math.floor(Math.random() * n);
}

export async function run({ port = benchPort(3) } = {}) {
	const server = await startBenchServer({ port });
	try {
		const origin = server.origin;
		const admin = await signIn(origin, 'inspector@tacksheet.test');
		const get = async (url, cookie = admin) =>
			(await fetch(origin + url, { headers: { cookie } })).json();
		// The sheets and pins of the first project, as the inspectors will find them.
		const register = await get('/api/projects/1/drawings?pageSize=200');
		const revisions = register.items.map((d) => d.currentRevision?.id).filter(Boolean);
		const pins = [];
		for (const id of revisions)
			for (const pin of (await get(`/api/revisions/${id}/pins`)).items)
				if (pin.state !== 'void') pins.push({ ...pin, revisionId: id });
		const awaitingFitup = pins.filter((p) => p.state === 'awaiting_fitup').map((p) => p.jointId);
		// Sixty pins shared by everyone, so some writes meet a newer version.
		const contested = pins.slice(0, 60);
		const cookies = [];
		for (let i = 0; i < USERS; i++) cookies.push(await signIn(origin, 'inspector@tacksheet.test'));

		const started = Date.now();
		const until = started + SECONDS * 1000;
		const times = [];
		const statuses = new Map();
		let networkErrors = 0;
		let seq = 0;
		const acknowledged = { moves: [], inspections: [] };

		async function call(cookie, url, init = {}) {
			const t = performance.now();
			try {
				const response = await fetch(origin + url, {
					...init,
					headers: { cookie, origin, 'content-type': 'application/json', ...(init.headers ?? {}) }
				});
				const body = await response.json().catch(() => null);
				times.push(performance.now() - t);
				statuses.set(response.status, (statuses.get(response.status) ?? 0) + 1);
				return { status: response.status, body };
			} catch {
				networkErrors++;
				return { status: 0, body: null };
			}
		}

		async function inspector(cookie) {
			const versions = new Map();
			while (Date.now() < until) {
				const roll = Math.random();
				const pin = contested[random(contested.length)];
				if (roll < 0.6) {
					if (Math.random() < 0.5) await call(cookie, `/api/revisions/${pin.revisionId}/pins`);
					else {
						const joint = await call(cookie, `/api/joints/${pin.jointId}`);
						if (joint.status === 200) versions.set(pin.jointId, joint.body.version);
					}
				} else if (roll < 0.9) {
					const version = versions.get(pin.jointId) ?? pin.version;
					const n = ++seq;
					// A point inside the sheet no other write uses, so the ledger can find each one.
					const to = { x: 60 + (n % 400) + n / 1e6, y: 60 + random(400), version };
					const moved = await call(cookie, `/api/pins/${pin.pinId}`, {
						method: 'PATCH',
						body: JSON.stringify(to)
					});
					if (moved.status === 200) {
						versions.set(pin.jointId, moved.body.version);
						acknowledged.moves.push({
							pinId: pin.pinId,
							x: to.x,
							y: to.y,
							version: moved.body.version
						});
					} else if (moved.status === 409) versions.delete(pin.jointId);
				} else if (awaitingFitup.length > 0) {
					const jointId = awaitingFitup[random(awaitingFitup.length)];
					const recorded = await call(cookie, `/api/joints/${jointId}/inspections`, {
						method: 'POST',
						body: JSON.stringify({
							stage: 'fitup',
							readings: FITUP,
							decision: 'accept',
							reason: 'Recorded by the load bench.',
							...(versions.has(jointId) ? { version: versions.get(jointId) } : {})
						})
					});
					if (recorded.status === 201) acknowledged.inspections.push(recorded.body.inspection.id);
					else if (recorded.status === 409) versions.delete(jointId);
				}
				await new Promise((r) => setTimeout(r, 20 + random(80)));
			}
		}

		await Promise.all(cookies.map((cookie) => inspector(cookie)));
		const seconds = (Date.now() - started) / 1000;
		times.sort((a, b) => a - b);
		const count = (test) => [...statuses].filter(([s]) => test(s)).reduce((n, [, c]) => n + c, 0);
		console.log(
			`${USERS} inspectors for ${SECONDS} s on loopback: ${times.length} requests (${(times.length / seconds).toFixed(0)}/s), ` +
				`409: ${count((s) => s === 409)}, other 4xx: ${count((s) => s >= 400 && s < 500 && s !== 409)}, ` +
				`5xx: ${count((s) => s >= 500)}, network errors: ${networkErrors}; ` +
				`latency p50 ${percentile(times, 50).toFixed(1)} ms, p95 ${percentile(times, 95).toFixed(1)} ms, p99 ${percentile(times, 99).toFixed(1)} ms`
		);
		await server.stop({ keep: true });
		console.log(ledger(path.join(server.dir, 'tacksheet.db'), acknowledged, started));
	} finally {
		await server.stop();
	}
}

/** Compares what the server acknowledged with what its database holds. */
function ledger(file, acknowledged, since) {
	const db = new Database(file, { readonly: true });
	try {
		const problems = [];
		const integrity = db.pragma('integrity_check', { simple: true });
		if (integrity !== 'ok') problems.push(`integrity_check: ${integrity}`);
		const stored = new Map();
		for (const row of db
			.prepare(`select entity_id, after from audit_events where action = 'pin_move' and at >= ?`)
			.all(since)) {
			const after = JSON.parse(row.after);
			const key = `${row.entity_id}:${after.x}`;
			stored.set(key, (stored.get(key) ?? 0) + 1);
		}
		for (const move of acknowledged.moves) {
			const n = stored.get(`${move.pinId}:${move.x}`) ?? 0;
			if (n !== 1) problems.push(`pin ${move.pinId} move to x=${move.x} stored ${n} times`);
		}
		const movesStored = [...stored.values()].reduce((a, b) => a + b, 0);
		if (movesStored !== acknowledged.moves.length)
			problems.push(`${movesStored} pin moves stored, ${acknowledged.moves.length} acknowledged`);
		const last = new Map();
		for (const move of acknowledged.moves)
			if ((last.get(move.pinId)?.version ?? -1) < move.version) last.set(move.pinId, move);
		for (const move of last.values()) {
			const pin = db.prepare('select x, y from pins where id = ?').get(move.pinId);
			if (pin.x !== move.x || pin.y !== move.y)
				problems.push(
					`pin ${move.pinId} is at ${pin.x},${pin.y}, its last move said ${move.x},${move.y}`
				);
		}
		const inspections = db
			.prepare('select id from inspections where inspected_at >= ?')
			.all(since)
			.map((row) => row.id);
		const known = new Set(acknowledged.inspections);
		if (inspections.length !== known.size || inspections.some((id) => !known.has(id)))
			problems.push(
				`${inspections.length} fit-ups stored since the start, ${known.size} acknowledged`
			);
		const writes = acknowledged.moves.length + acknowledged.inspections.length;
		return problems.length === 0
			? `ledger: ${writes} acknowledged writes (${acknowledged.moves.length} pin moves, ${acknowledged.inspections.length} fit-ups), each stored exactly once, none stored unacknowledged, every pin where its last move put it; integrity_check ok`
			: `LEDGER MISMATCH (${problems.length}): ${problems.slice(0, 10).join('; ')}`;
	} finally {
		db.close();
	}
}

if (import.meta.url === `file://${process.argv[1]}`) await run();
