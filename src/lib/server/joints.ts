/** Joints: the weld register. Their state is derived here from the records and cached. */
import { and, asc, eq, isNull } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import {
	deriveJointState,
	parseNdeRequirement,
	type DerivedState,
	type NdeMethod
} from '$lib/joint-state';

type Reader = Pick<Db, 'select'>;

/** Everything deriveJointState needs about one joint, read in one go. */
export function stateInput(jointId: number, tx: Reader = db) {
	const joint = tx
		.select({ voidedAt: schema.joints.voidedAt, ndeRequired: schema.joints.ndeRequired })
		.from(schema.joints)
		.where(eq(schema.joints.id, jointId))
		.get();
	if (!joint) return undefined;
	const selections = tx
		.select({ method: schema.ndeSelections.method })
		.from(schema.ndeSelections)
		.where(and(eq(schema.ndeSelections.jointId, jointId), isNull(schema.ndeSelections.cancelledAt)))
		.all();
	const methods = new Set<NdeMethod>(parseNdeRequirement(joint.ndeRequired));
	for (const s of selections) methods.add(s.method);
	return {
		voided: joint.voidedAt != null,
		ndeMethods: [...methods],
		welds: tx
			.select({ repairCycle: schema.welds.repairCycle })
			.from(schema.welds)
			.where(eq(schema.welds.jointId, jointId))
			.all(),
		inspections: tx
			.select({
				id: schema.inspections.id,
				stage: schema.inspections.stage,
				method: schema.inspections.method,
				repairCycle: schema.inspections.repairCycle,
				decision: schema.inspections.decision,
				supersedesId: schema.inspections.supersedesId
			})
			.from(schema.inspections)
			.where(eq(schema.inspections.jointId, jointId))
			.orderBy(asc(schema.inspections.inspectedAt), asc(schema.inspections.id))
			.all()
	};
}

/**
 * Recompute the joint's state from its records and write the cache. Call it inside the
 * transaction that changed the records, so the cache never disagrees with them.
 */
export function refreshState(
	jointId: number,
	tx: Pick<Db, 'select' | 'update'> = db,
	at: number = Date.now()
): DerivedState | undefined {
	const input = stateInput(jointId, tx);
	if (!input) return undefined;
	const derived = deriveJointState(input);
	const current = tx
		.select({ state: schema.joints.state, repairCycle: schema.joints.repairCycle })
		.from(schema.joints)
		.where(eq(schema.joints.id, jointId))
		.get();
	if (current && (current.state !== derived.state || current.repairCycle !== derived.repairCycle)) {
		tx.update(schema.joints)
			.set({
				state: derived.state,
				repairCycle: derived.repairCycle,
				stateSince: at,
				updatedAt: at
			})
			.where(eq(schema.joints.id, jointId))
			.run();
	}
	return derived;
}
