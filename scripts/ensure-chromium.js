// Before `npm test` and `npm run test:e2e`: the browser tests drive Debian's Chromium
// (Playwright never downloads a browser). Finds it at CHROMIUM_PATH or /usr/bin/chromium;
// when it is missing, installs Debian's `chromium` if this user may (root, or sudo without a
// password, and apt-get present), without asking anything; otherwise stops at once with the
// one command to run.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { pathToFileURL } from 'node:url';

export const DEFAULT_PATH = '/usr/bin/chromium';
const INSTALL = ['apt-get', 'install', '-y', '--no-install-recommends', 'chromium'];

/**
 * What to do, from what this machine has.
 * @param {{ found: boolean, explicit: boolean, root: boolean, aptGet: boolean, sudo: boolean }} machine
 * @returns {{ action: 'ready' } | { action: 'install', sudo: boolean } | { action: 'stop', message: string }}
 */
export function plan({ found, explicit, root, aptGet, sudo }) {
	if (found) return { action: 'ready' };
	if (explicit)
		return {
			action: 'stop',
			message: `CHROMIUM_PATH is ${process.env.CHROMIUM_PATH}, and there is no browser there. Point it at Chromium, or unset it to use ${DEFAULT_PATH}.`
		};
	if (!aptGet)
		return {
			action: 'stop',
			message: `Chromium is missing (the browser tests run in it) and there is no apt-get here to install it. Install Chromium, then run npm test again with CHROMIUM_PATH=/path/to/chromium.`
		};
	if (root || sudo) return { action: 'install', sudo: !root };
	return {
		action: 'stop',
		message: `Chromium is missing (the browser tests run in it). Install it with:\n\n  sudo apt-get install -y chromium\n\nthen run npm test again.`
	};
}

/** @param {string} command */
function onPath(command) {
	return spawnSync('sh', ['-c', `command -v ${command}`], { stdio: 'ignore' }).status === 0;
}

/** @param {string} file */
function executable(file) {
	try {
		fs.accessSync(file, fs.constants.X_OK);
		return fs.statSync(file).isFile();
	} catch {
		return false;
	}
}

/**
 * @param {boolean} sudo
 * @param {string[]} args
 */
function run(sudo, args) {
	const command = sudo ? ['sudo', '-n', ...args] : args;
	console.log(`$ ${command.join(' ')}`);
	return spawnSync(command[0], command.slice(1), {
		stdio: ['ignore', 'inherit', 'inherit'],
		env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
	}).status;
}

export function main() {
	const file = process.env.CHROMIUM_PATH || DEFAULT_PATH;
	const aptGet = onPath('apt-get');
	const root = typeof process.getuid === 'function' && process.getuid() === 0;
	const step = plan({
		found: executable(file),
		explicit: !!process.env.CHROMIUM_PATH,
		root,
		aptGet,
		sudo: !root && aptGet && onPath('sudo') && spawnSync('sudo', ['-n', 'true']).status === 0
	});
	if (step.action === 'ready') return 0;
	if (step.action === 'stop') {
		console.error(step.message);
		return 1;
	}
	console.log('Chromium is missing (the browser tests run in it): installing Debian’s chromium.');
	if (run(step.sudo, ['apt-get', 'update']) !== 0 || run(step.sudo, INSTALL) !== 0) {
		console.error(
			`Installing Chromium failed. Install it with:\n\n  sudo apt-get install -y chromium\n\nthen run npm test again.`
		);
		return 1;
	}
	if (!executable(file)) {
		console.error(`Chromium was installed, but not at ${file}. Set CHROMIUM_PATH to where it is.`);
		return 1;
	}
	return 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
	process.exit(main());
}
