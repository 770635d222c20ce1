/**
 * What a stopped server left behind in the export folder: its half-written zips go at the
 * next start, and finished zips stay.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import * as exportJobs from '$lib/server/exports';
import { config } from '$lib/server/config';

describe('export folder at start', () => {
	it('removes every half-written zip and keeps the finished ones', async () => {
		const folder = path.join(config.uploadsDir, 'exports');
		fs.mkdirSync(folder, { recursive: true });
		fs.writeFileSync(path.join(folder, 'a.zip.part'), 'half');
		fs.writeFileSync(path.join(folder, 'b.zip.part'), 'half');
		fs.writeFileSync(path.join(folder, 'c.zip'), 'whole');
		expect(await exportJobs.removeUnfinished()).toBe(2);
		expect(fs.readdirSync(folder)).toEqual(['c.zip']);
	});

	it('does nothing when there is no export folder yet', async () => {
		fs.rmSync(path.join(config.uploadsDir, 'exports'), { recursive: true, force: true });
		expect(await exportJobs.removeUnfinished()).toBe(0);
	});
});
