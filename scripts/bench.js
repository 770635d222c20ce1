// `npm run bench`: speed and memory figures, printed, never asserted. Each section is a
// module under scripts/bench/ that prints its own lines.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';

if (!fs.existsSync('build/handler.js')) {
	const result = spawnSync('npm', ['run', 'build'], { stdio: 'inherit' });
	if (result.status !== 0) process.exit(result.status ?? 1);
}

const sections = [
	'startup',
	'uploads',
	'first-render',
	'pins',
	'weld-log',
	'export',
	'nde',
	'suggestions',
	'load'
];
for (const name of sections) {
	const { run } = await import(`./bench/${name}.js`);
	console.log(`\n## ${name}`);
	await run();
}
