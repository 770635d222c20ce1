import { afterEach, describe, expect, it } from 'vitest';
import { formatDay } from './format';

const zone = process.env.TZ;
afterEach(() => {
	if (zone === undefined) delete process.env.TZ;
	else process.env.TZ = zone;
});

describe('formatDay', () => {
	it('reads a stored weld date as the same day in any zone', () => {
		// A day stored as text has no zone: west of Greenwich it must not become the day before.
		for (const tz of ['UTC', 'America/Vancouver', 'Pacific/Auckland']) {
			process.env.TZ = tz;
			expect(formatDay('2026-10-09'), tz).toBe('09 Oct 2026');
			expect(formatDay('2026-01-01'), tz).toBe('01 Jan 2026');
		}
	});
});
