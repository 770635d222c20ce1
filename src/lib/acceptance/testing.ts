/** Test helpers: evaluate against a set by id and pick out one finding. */
import { evaluate } from './evaluate';
import { getCriteriaSet } from './index';
import type {
	CriteriaSet,
	EvaluateOptions,
	Evaluation,
	Finding,
	FindingCheckId,
	JointInput,
	ReadingsInput,
	Stage
} from './types';

export function evaluated(
	set: string | CriteriaSet,
	joint: JointInput,
	stage: Stage,
	readings: ReadingsInput,
	options?: EvaluateOptions
): Evaluation {
	const criteria = typeof set === 'string' ? getCriteriaSet(set) : set;
	if (!criteria) throw new Error(`no criteria set ${String(set)}`);
	const result = evaluate(criteria, joint, stage, readings, options);
	if (!result.ok)
		throw new Error(result.errors.map((error) => `${error.field}: ${error.message}`).join('; '));
	return result;
}

export function findingOf(evaluation: Evaluation, check: FindingCheckId): Finding {
	const found = evaluation.findings.find((finding) => finding.check === check);
	if (!found) {
		const made = evaluation.findings.map((finding) => finding.check).join(', ') || 'none';
		throw new Error(
			`no ${check} finding (made: ${made}; missing: ${evaluation.missing.join(', ')})`
		);
	}
	return found;
}

/** The one finding `check` makes from these readings. */
export function finding(
	set: string | CriteriaSet,
	joint: JointInput,
	stage: Stage,
	readings: ReadingsInput,
	check: FindingCheckId,
	options?: EvaluateOptions
): Finding {
	return findingOf(evaluated(set, joint, stage, readings, options), check);
}

/** Curried form for one set, joint and check, so a table of readings reads as a table. */
export function checker(
	set: string,
	check: FindingCheckId,
	stage: Stage,
	options?: EvaluateOptions
): (joint: JointInput, readings: ReadingsInput) => Finding['outcome'] {
	return (joint, readings) => finding(set, joint, stage, readings, check, options).outcome;
}

export const inches = (value: number) => value * 25.4;
