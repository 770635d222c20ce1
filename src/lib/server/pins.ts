/**
 * Pins: a joint's mark on a sheet, in PDF user-space points. The overlay reads them per
 * revision; a move or a confirmation changes the joint, so it takes the joint's version.
 */
import { asc, eq, sql } from 'drizzle-orm';
import { db, schema } from './db';
import * as audit from './audit';
import * as events from './events';
import { DomainError, refuse } from './errors';
import { lockedJoint, pageBox } from './joints';
import { displayWeldNumber } from '$lib/joint-state';
import { pinPointRefusal } from '$lib/pin-bounds';

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

const j = schema.joints;
const p = schema.pins;

/** The pins of one revision with their joints' states, as the overlay draws them. */
/** Prepared once: the overlay asks for its pins on every change anyone makes. */
function pinsQuery() {
	return db
		.select({
			pinId: p.id,
			jointId: j.id,
			number: j.number,
			repairCycle: j.repairCycle,
			kind: j.kind,
			location: j.location,
			pageIndex: p.pageIndex,
			x: p.x,
			y: p.y,
			state: j.state,
			needsReview: p.needsReview,
			reviewReason: p.reviewReason,
			version: j.version
		})
		.from(p)
		.innerJoin(j, eq(j.id, p.jointId))
		.where(eq(p.revisionId, sql.placeholder('revisionId')))
		.orderBy(asc(j.sortKey))
		.prepare();
}
let preparedPins: ReturnType<typeof pinsQuery> | undefined;

export function ofRevision(revisionId: number) {
	preparedPins ??= pinsQuery();
	return preparedPins
		.all({ revisionId })
		.map((row) => ({ ...row, label: displayWeldNumber(row.number, row.repairCycle) }));
}

function pinWithJoint(tx: Tx, pinId: number) {
	const pin = tx.select().from(p).where(eq(p.id, pinId)).get();
	if (!pin) throw new DomainError('There is no such pin.', 404);
	return pin;
}

/** Move a pin (drag on the sheet); confirms it when it was waiting for review. */
export function move(
	pinId: number,
	to: { x: number; y: number; pageIndex?: number; version: number },
	userId: string
) {
	return events.afterCommit((tx, tell) => {
		const pin = pinWithJoint(tx, pinId);
		const joint = lockedJoint(tx, pin.jointId, to.version);
		const revision = tx
			.select({ status: schema.revisions.status })
			.from(schema.revisions)
			.where(eq(schema.revisions.id, pin.revisionId))
			.get();
		if (revision?.status !== 'current')
			throw new DomainError('Pins on a superseded revision stay where they were recorded.', 409);
		if (joint.voidedAt)
			throw new DomainError(`Joint ${joint.number} is void; its pin stays where it was.`, 409);
		refuse(pinPointRefusal(pageBox(pin.revisionId, to.pageIndex ?? pin.pageIndex, tx), to));
		const now = Date.now();
		const moved = tx
			.update(p)
			.set({
				x: to.x,
				y: to.y,
				pageIndex: to.pageIndex ?? pin.pageIndex,
				needsReview: false,
				updatedAt: now
			})
			.where(eq(p.id, pinId))
			.returning()
			.get();
		const updated = tx
			.update(j)
			.set({ version: joint.version + 1, updatedAt: now })
			.where(eq(j.id, joint.id))
			.returning()
			.get();
		audit.record(
			{
				action: 'pin_move',
				entity: 'pin',
				entityId: pinId,
				projectId: joint.projectId,
				userId,
				before: { pageIndex: pin.pageIndex, x: pin.x, y: pin.y },
				after: { pageIndex: moved.pageIndex, x: moved.x, y: moved.y }
			},
			tx
		);
		tell(joint.projectId, {
			type: 'pin',
			action: 'moved',
			revisionId: pin.revisionId,
			jointId: joint.id,
			pinId,
			by: userId
		});
		return { pin: moved, version: updated.version };
	});
}

/** Confirm a pin carried to a new revision: the joint is where it was. */
export function confirm(pinId: number, version: number, userId: string) {
	return events.afterCommit((tx, tell) => {
		const pin = pinWithJoint(tx, pinId);
		const joint = lockedJoint(tx, pin.jointId, version);
		const now = Date.now();
		tx.update(p).set({ needsReview: false, updatedAt: now }).where(eq(p.id, pinId)).run();
		const updated = tx
			.update(j)
			.set({ version: joint.version + 1, updatedAt: now })
			.where(eq(j.id, joint.id))
			.returning()
			.get();
		audit.record(
			{
				action: 'pin_confirm',
				entity: 'pin',
				entityId: pinId,
				projectId: joint.projectId,
				userId,
				after: { revisionId: pin.revisionId }
			},
			tx
		);
		tell(joint.projectId, {
			type: 'pin',
			action: 'reviewed',
			revisionId: pin.revisionId,
			jointId: joint.id,
			pinId,
			by: userId
		});
		return { version: updated.version };
	});
}
