import { describe, expect, it } from 'vitest';
import { proposeFromFileName } from './drawing-names';

describe('drawing number proposed from the file name', () => {
	it.each([
		['LBM-20-ISO-1101_rev1.pdf', 'LBM-20-ISO-1101', '1'],
		['LBM-20-ISO-1101 Rev B.PDF', 'LBM-20-ISO-1101', 'B'],
		['VFT-3-ISO-0301-R2.pdf', 'VFT-3-ISO-0301', '2'],
		['C:\\scans\\PS-310_revision_A.pdf', 'PS-310', 'A'],
		['LBM-20-SP-1102-03.pdf', 'LBM-20-SP-1102-03', null],
		['plan.pdf', 'plan', null]
	])('%s → %s rev %s', (file, number, revision) => {
		expect(proposeFromFileName(file)).toEqual({ number, revision });
	});
});
