/**
 * Which signed inspection records may still be corrected. Pure, so the joint card offers
 * "Correct" exactly where the server (src/lib/server/inspections.ts) would take a correction.
 *
 * Who: any inspector of the project (`inspection.record`), not only the one who signed. A QC
 * department re-gauges with another inspector, and a record must not stay wrong because its
 * signer has left the job; the correction carries its own signature, time and reason, and the
 * record it replaces stays readable, so nothing is hidden.
 */
import type { InspectionStage } from './joint-state';

export interface CorrectableRecord {
	id: number;
	stage: InspectionStage;
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

/**
 * Why a record cannot be corrected, or null when it can. A record is corrected once (its
 * correction is then the one to correct); a fit-up stands once the joint is welded; a
 * visual or NDE result stands once the weld it judged has been repaired.
 */
export function correctionRefusal(
	record: CorrectableRecord,
	context: CorrectionContext
): string | null {
	if (context.voided) return 'The joint is void.';
	const later = context.records.find((r) => r.supersedesId === record.id);
	if (later) return `Corrected by #${later.id}.`;
	if (record.stage === 'fitup') {
		return context.welded ? 'The joint has been welded since this fit-up.' : null;
	}
	return record.repairCycle === context.repairCycle
		? null
		: 'The weld it judged has since been repaired.';
}
