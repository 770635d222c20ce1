/**
 * A fit-up judged against the joint design of the joint's WPS: root opening, root face and
 * bevel angle each within the WPS's min–max. The finding's clause names the WPS and its
 * revision ("WPS P-101 rev 2"). Where the code leaves a dimension to the procedure (B31.3
 * 328.4.2, D1.1 detail tolerances, API 1104 joint design), the WPS supplies the number and the
 * code's open finding is dropped; where the code sets its own (B16.25 bevel), both are made.
 */
import type { ParsedReadings } from './checks';
import { atLeast, atMost } from './limits';
import type { ReadingId } from './readings';
import type {
	CheckId,
	DesignRange,
	Finding,
	JointKind,
	Limit,
	ReadingError,
	WpsCheckId,
	WpsJointDesign
} from './types';

type Dimension = 'rootOpening' | 'rootFace' | 'bevelAngle';

const DIMENSIONS: readonly {
	id: Dimension;
	check: WpsCheckId;
	code: CheckId;
	unit: 'mm' | 'deg';
}[] = [
	{ id: 'rootOpening', check: 'wps.rootOpening', code: 'rootOpening.range', unit: 'mm' },
	{ id: 'bevelAngle', check: 'wps.bevelAngle', code: 'bevelAngle.range', unit: 'deg' },
	{ id: 'rootFace', check: 'wps.rootFace', code: 'rootFace.range', unit: 'mm' }
];

/** Joint designs of groove welds: the WPS's root opening, face and bevel are theirs. */
const GROOVE: readonly JointKind[] = ['butt', 'branch'];

export const wpsClause = (wps: Pick<WpsJointDesign, 'number' | 'revision'>) =>
	`WPS ${wps.number} rev ${wps.revision}`;

const isOpen = (expr: unknown) => typeof expr === 'object' && expr !== null && 'open' in expr;

/** True where the set's limit for `check` gives no number and the WPS gives the range. */
export function wpsSettles(check: CheckId, limit: Limit, wps: WpsJointDesign): boolean {
	const dimension = DIMENSIONS.find((d) => d.code === check);
	if (!dimension || !wps[dimension.id]) return false;
	return limit.rule.type === 'range' && isOpen(limit.rule.min) && isOpen(limit.rule.max);
}

/** Problems with a WPS joint design as passed in; empty when it can be used. */
export function wpsErrors(wps: WpsJointDesign | undefined): ReadingError[] {
	if (wps === undefined) return [];
	const errors: ReadingError[] = [];
	if (typeof wps.number !== 'string' || wps.number.trim() === '') {
		errors.push({ field: 'wps.number', message: 'The WPS needs its number' });
	}
	if (typeof wps.revision !== 'string' || wps.revision.trim() === '') {
		errors.push({ field: 'wps.revision', message: 'The WPS needs its revision' });
	}
	for (const { id, unit } of DIMENSIONS) {
		const range: DesignRange | undefined = wps[id];
		if (range === undefined) continue;
		const { min, max } = range;
		const limit = unit === 'deg' ? 90 : 100;
		if (![min, max].every((value) => Number.isFinite(value) && value >= 0 && value <= limit)) {
			errors.push({
				field: `wps.${id}`,
				message: `WPS ${id}: min and max must be numbers from 0 to ${limit} ${unit === 'deg' ? 'degrees' : 'mm'}`
			});
		} else if (min > max) {
			errors.push({ field: `wps.${id}`, message: `WPS ${id}: the min is more than the max` });
		}
	}
	return errors;
}

/** The fit-up readings against the WPS joint design, and the readings it needs and lacks. */
export function wpsFindings(
	wps: WpsJointDesign,
	kind: JointKind,
	readings: ParsedReadings
): { findings: Finding[]; missing: ReadingId[] } {
	const findings: Finding[] = [];
	const missing: ReadingId[] = [];
	if (!GROOVE.includes(kind)) return { findings, missing };
	for (const { id, check, unit } of DIMENSIONS) {
		const range = wps[id];
		if (!range) continue;
		const measured = readings[id];
		if (measured === undefined) {
			missing.push(id);
			continue;
		}
		const below = !atLeast(measured, range.min);
		const above = !atMost(measured, range.max);
		const nearer = measured - range.min <= range.max - measured ? range.min : range.max;
		findings.push({
			check,
			reading: id,
			measured,
			limit: below ? range.min : above ? range.max : nearer,
			range: { min: range.min, max: range.max },
			unit,
			outcome: below || above ? 'outside' : 'within',
			clause: wpsClause(wps),
			confidence: 'project',
			note: 'Joint design of the WPS named on the joint.'
		});
	}
	return { findings, missing };
}
