// `npm start`: the production server with demo data. Builds first when there is no build
// (or the sources are newer than it); the server applies migrations and seeds an empty
// database before it answers its first request.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { applyDefaults } from './env.js';

function newestMtime(entry) {
	if (!fs.existsSync(entry)) return 0;
	const stat = fs.statSync(entry);
	if (!stat.isDirectory()) return stat.mtimeMs;
	let newest = stat.mtimeMs;
	for (const child of fs.readdirSync(entry))
		newest = Math.max(newest, newestMtime(path.join(entry, child)));
	return newest;
}

const built = path.resolve('build/handler.js');
const sources = [
	'src',
	'static',
	'drizzle',
	'package-lock.json',
	'svelte.config.js',
	'vite.config.ts'
];
const stale =
	!fs.existsSync(built) || sources.some((s) => newestMtime(s) > fs.statSync(built).mtimeMs);
if (stale && process.env.TACKSHEET_SKIP_BUILD !== '1') {
	console.log('Building Tacksheet (first start, or the sources changed)…');
	const result = spawnSync('npm', ['run', 'build'], { stdio: 'inherit' });
	if (result.status !== 0) process.exit(result.status ?? 1);
}

const env = applyDefaults();
const { startServer } = await import('../server.js');
await startServer();
console.log(`Tacksheet is ready at ${env.ORIGIN}`);
