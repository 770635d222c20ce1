/**
 * A project's own criteria set: a built-in (or earlier project) set with some limits changed.
 * Pure: storage keeps the returned object as it is (it is plain JSON).
 */
import { checkIds, type CheckId, type CriteriaSet, type Limit } from './types';

export interface LimitOverride {
	rule: Limit['rule'];
	/** the project specification clause that sets it */
	clause?: string;
	note?: string;
	kinds?: Limit['kinds'];
	stages?: Limit['stages'];
}

export interface CriteriaSetChanges {
	id: string;
	name: string;
	overrides: Readonly<Partial<Record<CheckId, LimitOverride>>>;
	/** default: the base's version + 1 when revising the same set, else 1 */
	version?: number;
}

export class CriteriaSetError extends Error {
	constructor(
		readonly field: string,
		message: string
	) {
		super(message);
		this.name = 'CriteriaSetError';
	}
}

/**
 * Derives a set from `base` with the overridden limits marked `project`. Throws CriteriaSetError
 * for a blank id or name, an id taken by a built-in set, or a check the engine does not know.
 */
export function deriveCriteriaSet(
	base: CriteriaSet,
	changes: CriteriaSetChanges,
	reservedIds: readonly string[] = []
): CriteriaSet {
	const id = changes.id.trim();
	const name = changes.name.trim();
	if (id === '') throw new CriteriaSetError('id', 'A criteria set needs an id');
	if (name === '') throw new CriteriaSetError('name', 'A criteria set needs a name');
	if (reservedIds.includes(id)) {
		throw new CriteriaSetError('id', `"${id}" is a built-in criteria set; choose another id`);
	}
	const revising = id === base.id;
	const limits: Partial<Record<CheckId, Limit>> = { ...base.limits };
	const changed = new Set<CheckId>(revising ? (base.changed ?? []) : []);
	for (const [check, override] of Object.entries(changes.overrides)) {
		if (!(checkIds as readonly string[]).includes(check)) {
			throw new CriteriaSetError(`overrides.${check}`, `Unknown check "${check}"`);
		}
		if (!override) continue;
		const checkId = check as CheckId;
		const previous = base.limits[checkId];
		const limit: Limit = {
			rule: override.rule,
			clause:
				override.clause ??
				`project limit, replacing ${base.standard} ${previous?.clause ?? '(no limit)'}`,
			confidence: 'project',
			kinds: override.kinds ?? previous?.kinds,
			stages: override.stages ?? previous?.stages
		};
		if (override.note) limit.note = override.note;
		// Where the base's check applies only past a reading (a fillet over a root opening), so does the project's.
		if (previous?.appliesOver) limit.appliesOver = previous.appliesOver;
		if (!limit.kinds) delete limit.kinds;
		if (!limit.stages) delete limit.stages;
		limits[checkId] = limit;
		changed.add(checkId);
	}
	return {
		...base,
		id,
		name,
		version: changes.version ?? (revising ? base.version + 1 : 1),
		basedOn: revising ? base.basedOn : { id: base.id, version: base.version },
		changed: checkIds.filter((check) => changed.has(check)),
		limits
	};
}
