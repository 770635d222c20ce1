import { describe, expect, it } from 'vitest';
import { correctionRefusal, type CorrectableRecord } from './corrections';

const fitup: CorrectableRecord = { id: 1, stage: 'fitup', repairCycle: 0, supersedesId: null };
const visual: CorrectableRecord = { id: 2, stage: 'visual', repairCycle: 0, supersedesId: null };

describe('which records a correction may supersede', () => {
	it('takes a fit-up before welding only', () => {
		const context = { voided: false, welded: false, repairCycle: 0, records: [fitup] };
		expect(correctionRefusal(fitup, context)).toBeNull();
		expect(correctionRefusal(fitup, { ...context, welded: true })).toMatch(/welded since/);
	});

	it('takes a visual result of the weld as it stands, not of one since repaired', () => {
		const records = [fitup, visual];
		expect(
			correctionRefusal(visual, { voided: false, welded: true, repairCycle: 0, records })
		).toBeNull();
		expect(
			correctionRefusal(visual, { voided: false, welded: true, repairCycle: 1, records })
		).toMatch(/repaired/);
	});

	it('takes a record once: afterwards its correction is the one to correct', () => {
		const correction = { ...visual, id: 3, supersedesId: 2 };
		const context = { voided: false, welded: true, repairCycle: 0, records: [visual, correction] };
		expect(correctionRefusal(visual, context)).toBe('Corrected by #3.');
		expect(correctionRefusal(correction, context)).toBeNull();
		expect(correctionRefusal(correction, { ...context, voided: true })).toMatch(/void/);
	});
});
