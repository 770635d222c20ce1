/**
 * The acceptance engine: pure, shared by the browser (live verdict) and the server (stored verdict).
 * Verdicts are an aid; acceptance rests with a qualified inspector under the code, edition and contract in force.
 */
import { deriveCriteriaSet as derive, type CriteriaSetChanges } from './derive';
import { api1104 } from './sets/api-1104';
import { asmeB1625 } from './sets/asme-b16-25';
import { asmeB313CategoryD, asmeB313Normal, asmeB313SevereCyclic } from './sets/asme-b31-3';
import { awsD11Cyclic, awsD11Static } from './sets/aws-d1-1';
import { iso5817B, iso5817C, iso5817D } from './sets/iso-5817';
import type { CriteriaSet } from './types';

export const acceptanceNotice =
	'The verdict is an aid: acceptance rests with a qualified inspector under the code, edition and contract in force.';

/** Built-in sets, in the order a picker lists them. */
export const criteriaSets: readonly CriteriaSet[] = [
	awsD11Static,
	awsD11Cyclic,
	asmeB313Normal,
	asmeB313SevereCyclic,
	asmeB313CategoryD,
	api1104,
	asmeB1625,
	iso5817B,
	iso5817C,
	iso5817D
];

export const builtInCriteriaSetIds = criteriaSets.map((set) => set.id);

export function getCriteriaSet(id: string): CriteriaSet | undefined {
	return criteriaSets.find((set) => set.id === id);
}

/** deriveCriteriaSet with the built-in ids reserved. */
export function deriveCriteriaSet(base: CriteriaSet, changes: CriteriaSetChanges): CriteriaSet {
	return derive(base, changes, builtInCriteriaSetIds);
}

export { CriteriaSetError, type CriteriaSetChanges, type LimitOverride } from './derive';
export {
	allowanceWords,
	exprWords,
	hasLengthPart,
	lengthWords,
	limitUnit,
	ruleWords,
	typedValue,
	type LimitUnit
} from './describe';
export { evaluate } from './evaluate';
export { evaluateIndications, indicationLabels } from './indications';
export { jointInputOf, parseReading, type JointRecord, type ParsedReading } from './inputs';
export { wpsClause } from './wps';
export * from './geometry';
export * from './readings';
export * from './types';
