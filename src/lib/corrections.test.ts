import { describe, expect, it } from 'vitest';
import { correctionRefusal, correctionRequestRefusal, type CorrectableRecord } from './corrections';

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

describe('a correction as the server takes it', () => {
	const joint = { id: 7, number: '12' };
	const context = { voided: false, welded: false, repairCycle: 0, records: [fitup] };

	it('names a record of this joint, of the same stage', () => {
		expect(
			correctionRequestRefusal(1, { ...fitup, jointId: 7 }, { stage: 'fitup' }, joint, context)
		).toBeNull();
		expect(
			correctionRequestRefusal(1, { ...fitup, jointId: 8 }, { stage: 'fitup' }, joint, context)
		).toMatchObject({ status: 400, field: 'supersedes' });
		expect(
			correctionRequestRefusal(9, undefined, { stage: 'fitup' }, joint, context)
		).toMatchObject({ status: 400, message: 'Inspection #9 is not a record of joint 12.' });
		expect(
			correctionRequestRefusal(1, { ...fitup, jointId: 7 }, { stage: 'visual' }, joint, context)!
				.message
		).toMatch(/is a fit-up record; a correction keeps the stage/);
	});

	it('answers 409 where the card offers no correction', () => {
		const correction = { ...visual, id: 3, supersedesId: 2 };
		const refusal = correctionRequestRefusal(
			2,
			{ ...visual, jointId: 7 },
			{ stage: 'visual' },
			joint,
			{ voided: false, welded: true, repairCycle: 0, records: [fitup, visual, correction] }
		);
		expect(refusal).toMatchObject({ status: 409, field: 'supersedes' });
		expect(refusal!.message).toMatch(/already been corrected by #3; correct #3 instead/);
	});
});
