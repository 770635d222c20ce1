// Suggestions for a 100-sheet upload: every sheet of 100 demo-style drawings read by the
// weld-number finder as an upload would (worker thread, one file after another). Prints the
// time per sheet (goal < 200 ms a sheet), the process's peak memory and the event loop's
// longest stall meanwhile. The finder is TypeScript, so the run itself is
// scripts/bench/suggestions.ts under tsx.
import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';

export async function run() {
	const tsx = createRequire(import.meta.url).resolve('tsx/cli');
	const result = spawnSync(
		process.execPath,
		[tsx, '--tsconfig', '.svelte-kit/tsconfig.json', 'scripts/bench/suggestions.ts'],
		{ stdio: 'inherit' }
	);
	if (result.status !== 0) throw new Error(`the suggestions bench ended with ${result.status}`);
}
