/**
 * `npm test` on a fresh machine: the step before the tests finds Chromium, installs Debian's
 * when this user may, and otherwise stops at once with the one command to run.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { plan } from '../../scripts/ensure-chromium.js';

const script = path.resolve('scripts/ensure-chromium.js');
const none = { found: false, explicit: false, root: false, aptGet: true, sudo: false };

describe('finding Chromium before the tests', () => {
	it('goes on when the browser is there', () => {
		expect(plan({ ...none, found: true })).toEqual({ action: 'ready' });
	});

	it("installs Debian's chromium as root, or with sudo that asks no password", () => {
		expect(plan({ ...none, root: true })).toEqual({ action: 'install', sudo: false });
		expect(plan({ ...none, sudo: true })).toEqual({ action: 'install', sudo: true });
	});

	it('otherwise stops with the one command to run', () => {
		const step = plan(none);
		expect(step.action).toBe('stop');
		if (step.action === 'stop') expect(step.message).toContain('sudo apt-get install -y chromium');
		expect(plan({ ...none, aptGet: false, root: true }).action).toBe('stop');
	});

	it('stops at once, naming it, when CHROMIUM_PATH points at nothing', () => {
		const result = spawnSync(process.execPath, [script], {
			env: { PATH: process.env.PATH, CHROMIUM_PATH: '/nonexistent/chromium' },
			encoding: 'utf8'
		});
		expect(result.status).toBe(1);
		expect(result.stderr).toContain('/nonexistent/chromium');
		// Nothing was installed meanwhile.
		expect(result.stdout).not.toContain('apt-get');
	});

	it('finds a browser that is there', () => {
		const result = spawnSync(process.execPath, [script], {
			env: { PATH: process.env.PATH, CHROMIUM_PATH: process.execPath },
			encoding: 'utf8'
		});
		expect(result.status).toBe(0);
	});
});
