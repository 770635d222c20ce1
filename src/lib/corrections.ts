/**
 * Which signed inspection records may still be corrected, and what a correction must keep.
 * Pure: the joint card offers "Correct" exactly where the server (src/lib/server/inspections.ts)
 * takes a correction, because both ask this module with the rows they hold.
 *
 * Who: any inspector of the project (`inspection.record`), not only the one who signed. A QC
 * department re-gauges with another inspector, and a record must not stay wrong because its
 * signer has left the job; the correction carries its own signature, time and reason, and the
 * record it replaces stays readable, so nothing is hidden.
 */
import { displayWeldNumber, type InspectionStage } from './joint-state';
import { stageWord, type Refusal } from './domain';

export interface CorrectableRecord {
	id: number;
	stage: InspectionStage;
	method?: string | null;
	repairCycle: number;
	supersedesId: number | null;
}

export interface CorrectionContext {
	voided: boolean;
	/** Any weld recorded on the joint. */
	welded: boolean;
	/** The joint's repair cycle now: 0 for the original weld, 1 for R1 … */
	repairCycle: number;
	records: readonly CorrectableRecord[];
}

/** Why a record cannot be corrected, as the rule sees it. */
export type CorrectionProblem =
	{ kind: 'void' } | { kind: 'corrected'; by: number } | { kind: 'welded' } | { kind: 'repaired' };

/**
 * A record is corrected once (its correction is then the one to correct); a fit-up stands
 * once the joint is welded; a visual or NDE result stands once the weld it judged has been
 * repaired; nothing on a void joint changes.
 */
export function correctionProblem(
	record: CorrectableRecord,
	context: CorrectionContext
): CorrectionProblem | null {
	if (context.voided) return { kind: 'void' };
	const later = context.records.find((r) => r.supersedesId === record.id);
	if (later) return { kind: 'corrected', by: later.id };
	if (record.stage === 'fitup') return context.welded ? { kind: 'welded' } : null;
	return record.repairCycle === context.repairCycle ? null : { kind: 'repaired' };
}

/** Why a record cannot be corrected, in the card's few words, or null when it can. */
export function correctionRefusal(
	record: CorrectableRecord,
	context: CorrectionContext
): string | null {
	const problem = correctionProblem(record, context);
	switch (problem?.kind) {
		case undefined:
			return null;
		case 'void':
			return 'The joint is void.';
		case 'corrected':
			return `Corrected by #${problem.by}.`;
		case 'welded':
			return 'The joint has been welded since this fit-up.';
		case 'repaired':
			return 'The weld it judged has since been repaired.';
	}
}

/**
 * The server's answer to a correction naming record `id`: it must be a record of this joint,
 * of the same stage (and NDE method), and correctable by the rule above. `record` is the row
 * the id names, if any; `context.records` every record of the joint.
 */
export function correctionRequestRefusal(
	id: number,
	record: (CorrectableRecord & { jointId: number }) | undefined,
	input: { stage: InspectionStage; method?: string | null },
	joint: { id: number; number: string },
	context: CorrectionContext
): Refusal | null {
	const field = 'supersedes';
	if (!record || record.jointId !== joint.id) {
		return {
			status: 400,
			field,
			message: `Inspection #${id} is not a record of joint ${joint.number}.`
		};
	}
	if (record.stage !== input.stage || (record.stage === 'nde' && record.method !== input.method)) {
		return {
			status: 400,
			field,
			message: `Inspection #${id} is a ${stageWord(record.stage, record.method)} record; a correction keeps the stage${record.method ? ' and method' : ''} of the record it replaces.`
		};
	}
	const problem = correctionProblem(record, context);
	switch (problem?.kind) {
		case undefined:
			return null;
		case 'void':
			return {
				status: 409,
				message: `Joint ${joint.number} is void; nothing more is recorded on it.`
			};
		case 'corrected':
			return {
				status: 409,
				field,
				message: `Inspection #${id} has already been corrected by #${problem.by}; correct #${problem.by} instead.`
			};
		case 'welded':
			return {
				status: 409,
				field: 'stage',
				message: `Joint ${displayWeldNumber(joint.number, context.repairCycle)} has been welded since that fit-up record; it stands as it was, and the weld's own inspections follow.`
			};
		case 'repaired':
			return {
				status: 409,
				field,
				message: `Inspection #${id} belongs to weld ${displayWeldNumber(joint.number, record.repairCycle)}; the joint has since been repaired (${displayWeldNumber(joint.number, context.repairCycle)}), so that record stands as it was.`
			};
	}
}
