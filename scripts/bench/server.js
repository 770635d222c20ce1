// A production server on a spare port with its own fresh database, for the benchmarks.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

/**
 * A port for a bench server: `BENCH_PORT` (default 4310) plus the section's offset, so runs on
 * one machine can each keep to their own range.
 */
export function benchPort(offset = 0) {
	return Number(process.env.BENCH_PORT || 4310) + offset;
}

export async function startBenchServer({ port = benchPort(0), env = {} } = {}) {
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-bench-'));
	const origin = `http://localhost:${port}`;
	const started = performance.now();
	const child = spawn(process.execPath, ['scripts/start.js'], {
		env: {
			...process.env,
			PORT: String(port),
			ORIGIN: origin,
			DATABASE_URL: path.join(dir, 'tacksheet.db'),
			UPLOADS_DIR: path.join(dir, 'uploads'),
			AUTH_SECRET: 'bench-secret-not-for-production-0123456789',
			TACKSHEET_SKIP_BUILD: '1',
			...env
		},
		stdio: ['ignore', 'pipe', 'inherit']
	});
	child.stdout.resume();
	for (;;) {
		if (child.exitCode !== null) throw new Error(`bench server exited with ${child.exitCode}`);
		try {
			const response = await fetch(`${origin}/api/health`);
			if (response.ok) break;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 50));
	}
	const readyMs = performance.now() - started;
	return {
		origin,
		pid: child.pid,
		dir,
		readyMs,
		/** Stops the server; `keep` leaves its data folder to be read, for a later stop() to remove. */
		async stop({ keep = false } = {}) {
			if (child.exitCode === null && child.signalCode === null) {
				child.kill('SIGTERM');
				await new Promise((r) => child.once('exit', r));
			}
			if (!keep) fs.rmSync(dir, { recursive: true, force: true });
		}
	};
}

/** Resident memory of a process in MB, from /proc (Linux). */
export function rssMb(pid) {
	const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0);
	return kb / 1024;
}

export function percentile(sorted, p) {
	return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

export async function timeRequests(url, count, init) {
	const times = [];
	for (let i = 0; i < count; i++) {
		const t = performance.now();
		const response = await fetch(url, init);
		await response.arrayBuffer();
		times.push(performance.now() - t);
	}
	times.sort((a, b) => a - b);
	return { median: percentile(times, 50), p95: percentile(times, 95) };
}
