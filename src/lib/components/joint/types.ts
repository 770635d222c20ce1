/** The joint as GET /api/joints/{id} returns it, for the joint card. */
import type { CriteriaSet } from '$lib/acceptance';
import type { JointState } from '$lib/joint-state';

export interface JointDetail {
	id: number;
	projectId: number;
	drawingId: number;
	number: string;
	label: string;
	kind: 'butt' | 'fillet' | 'socket' | 'branch';
	location: 'shop' | 'field';
	line: string;
	spool: string;
	sizeText: string;
	diameterMm: number | null;
	thicknessText: string;
	thicknessMm: number | null;
	requiredSizeText: string;
	requiredSizeMm: number | null;
	material: string;
	wps: string;
	criteriaSetId: string;
	/** the project's own set the joint is judged by; null for a built-in set */
	criteriaSet: CriteriaSet | null;
	ndeRequired: string;
	voidReason: string | null;
	voidedAt: number | null;
	state: JointState;
	stateLabel: string;
	next: string;
	owner: 'foreman' | 'inspector' | null;
	repairCycle: number;
	version: number;
	/** The joint this one replaced after a cut-out, and the one that replaced this. */
	replaces: { id: number; number: string } | null;
	replacedBy: { id: number; number: string } | null;
	pins: {
		pinId: number;
		revisionId: number;
		label: string;
		status: 'current' | 'superseded';
		pageIndex: number;
		x: number;
		y: number;
		needsReview: boolean;
	}[];
	welds: {
		id: number;
		repairCycle: number;
		weldedOn: string;
		wps: string;
		process: string;
		recordedAt: number;
		overrideReason: string | null;
		welders: { pass: string; stamp: string; name: string }[];
	}[];
	inspections: {
		id: number;
		stage: 'fitup' | 'visual' | 'nde';
		method: string | null;
		repairCycle: number;
		verdict: 'within' | 'outside' | 'judge' | null;
		/** the criteria set and version the server judged the readings by (none for NDE) */
		criteriaSetId: string | null;
		criteriaSetVersion: number | null;
		decision: 'accept' | 'reject';
		reason: string | null;
		againstVerdict: boolean;
		reportNo: string | null;
		inspectedAt: number;
		supersedesId: number | null;
		technician: string | null;
		inspector: string | null;
		readings: { id: string; text: string; value: number | boolean | null; unit: string | null }[];
		/** Photos attached to the record, oldest first. */
		photos: { id: number; caption: string; width: number; height: number }[];
	}[];
	changes: {
		at: number;
		action: string;
		entity: string;
		before: unknown;
		after: unknown;
		by: string | null;
	}[];
}

export type InspectionRecord = JointDetail['inspections'][number];
