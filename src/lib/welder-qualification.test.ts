import { describe, expect, it } from 'vitest';
import { checkQualification, validThrough } from './welder-qualification';

// ASME BPVC Section IX QW-322.1(a): six months without the process and it lapses; counted in
// calendar months from the later of the test and the last use.
describe('how long a welder qualification holds', () => {
	const tested = { process: 'GTAW', qualifiedOn: '2026-01-10', expiresOn: null, lastUsedOn: null };

	it('runs six calendar months from the later of the test and the last use', () => {
		expect(validThrough(tested)).toBe('2026-07-10');
		expect(validThrough({ ...tested, lastUsedOn: '2026-03-31' })).toBe('2026-09-30');
		// A last use before the test does not shorten it.
		expect(validThrough({ ...tested, lastUsedOn: '2025-12-01' })).toBe('2026-07-10');
	});

	it('ends at the record’s own expiry when that comes first, and says the same as the check', () => {
		const record = { ...tested, expiresOn: '2026-05-01' };
		expect(validThrough(record)).toBe('2026-05-01');
		expect(checkQualification(record, '2026-05-01').ok).toBe(true);
		expect(checkQualification(record, '2026-05-02')).toMatchObject({
			ok: false,
			problem: 'expired'
		});
		expect(checkQualification(tested, '2026-07-11')).toMatchObject({
			ok: false,
			problem: 'lapsed',
			lapsedOn: '2026-07-11'
		});
	});
});
