/**
 * Joints: the weld register. A joint is created by placing its pin on a sheet; its state is
 * derived from the records and cached in the same transaction as every change. Every write
 * names the version it was based on; a stale one is refused with 409.
 */
import { DomainError, refuse } from './errors';
import { and, asc, desc, eq, inArray, isNull, or } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import * as audit from './audit';
import * as projects from './projects';
import * as criteriaSets from './criteria-sets';
import * as events from './events';
import * as photos from './photos';
import {
	deriveJointState,
	displayWeldNumber,
	parseNdeRequirement,
	STATE_LOOKS,
	type DerivedState,
	type NdeMethod
} from '$lib/joint-state';
import {
	cutOutWeldNumber,
	insertedWeldNumber,
	nextWeldNumber,
	weldNumberSortKey
} from '$lib/weld-numbers';
import { jointLengths, type JointFields } from '$lib/schemas/joint';
import { pinPointRefusal, type PageBox } from '$lib/pin-bounds';
import type { UnitSystem } from './db/schema';

type Reader = Pick<Db, 'select'>;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

const j = schema.joints;
const p = schema.pins;

/** Everything deriveJointState needs about one joint, read in one go. */
export function stateInput(jointId: number, tx: Reader = db) {
	const joint = tx
		.select({ voidedAt: j.voidedAt, ndeRequired: j.ndeRequired })
		.from(j)
		.where(eq(j.id, jointId))
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
		.select({ state: j.state, repairCycle: j.repairCycle })
		.from(j)
		.where(eq(j.id, jointId))
		.get();
	if (current && (current.state !== derived.state || current.repairCycle !== derived.repairCycle)) {
		tx.update(j)
			.set({
				state: derived.state,
				repairCycle: derived.repairCycle,
				stateSince: at,
				updatedAt: at
			})
			.where(eq(j.id, jointId))
			.run();
	}
	return derived;
}

// Reading -------------------------------------------------------------------------------

export function row(jointId: number, tx: Reader = db) {
	return tx.select().from(j).where(eq(j.id, jointId)).get();
}

/** The joint with its state, next step, pins on every revision, and its whole history. */
export function detail(jointId: number) {
	const joint = row(jointId);
	if (!joint) return undefined;
	const look = STATE_LOOKS[joint.state];
	const pins = db
		.select({
			pinId: p.id,
			revisionId: p.revisionId,
			label: schema.revisions.label,
			status: schema.revisions.status,
			pageIndex: p.pageIndex,
			x: p.x,
			y: p.y,
			needsReview: p.needsReview
		})
		.from(p)
		.innerJoin(schema.revisions, eq(schema.revisions.id, p.revisionId))
		.where(eq(p.jointId, jointId))
		.orderBy(desc(schema.revisions.uploadedAt))
		.all();
	const welds = db
		.select({
			id: schema.welds.id,
			repairCycle: schema.welds.repairCycle,
			weldedOn: schema.welds.weldedOn,
			wps: schema.welds.wps,
			process: schema.welds.process,
			recordedAt: schema.welds.recordedAt,
			overrideReason: schema.welds.overrideReason
		})
		.from(schema.welds)
		.where(eq(schema.welds.jointId, jointId))
		.orderBy(asc(schema.welds.repairCycle))
		.all();
	const stamps = welds.length
		? db
				.select({
					weldId: schema.weldWelders.weldId,
					pass: schema.weldWelders.pass,
					stamp: schema.welders.stamp,
					name: schema.welders.name
				})
				.from(schema.weldWelders)
				.innerJoin(schema.welders, eq(schema.welders.id, schema.weldWelders.welderId))
				.where(
					inArray(
						schema.weldWelders.weldId,
						welds.map((w) => w.id)
					)
				)
				.all()
		: [];
	const inspections = db
		.select({
			id: schema.inspections.id,
			stage: schema.inspections.stage,
			method: schema.inspections.method,
			repairCycle: schema.inspections.repairCycle,
			readings: schema.inspections.readings,
			verdict: schema.inspections.verdict,
			findings: schema.inspections.findings,
			criteriaSetId: schema.inspections.criteriaSetId,
			criteriaSetVersion: schema.inspections.criteriaSetVersion,
			decision: schema.inspections.decision,
			reason: schema.inspections.reason,
			againstVerdict: schema.inspections.againstVerdict,
			reportNo: schema.inspections.reportNo,
			technician: schema.inspections.technician,
			inspectedAt: schema.inspections.inspectedAt,
			supersedesId: schema.inspections.supersedesId,
			inspector: schema.users.name
		})
		.from(schema.inspections)
		.innerJoin(schema.users, eq(schema.users.id, schema.inspections.inspectorId))
		.where(eq(schema.inspections.jointId, jointId))
		.orderBy(asc(schema.inspections.inspectedAt), asc(schema.inspections.id))
		.all();
	const photosOf = photos.byInspection(inspections.map((record) => record.id));
	const pinIds = pins.map((pin) => String(pin.pinId));
	const changes = db
		.select({
			at: schema.auditEvents.at,
			action: schema.auditEvents.action,
			entity: schema.auditEvents.entity,
			before: schema.auditEvents.before,
			after: schema.auditEvents.after,
			by: schema.users.name
		})
		.from(schema.auditEvents)
		.leftJoin(schema.users, eq(schema.users.id, schema.auditEvents.userId))
		.where(
			or(
				and(
					eq(schema.auditEvents.entity, 'joint'),
					eq(schema.auditEvents.entityId, String(jointId))
				),
				pinIds.length
					? and(eq(schema.auditEvents.entity, 'pin'), inArray(schema.auditEvents.entityId, pinIds))
					: undefined
			)
		)
		.orderBy(asc(schema.auditEvents.at), asc(schema.auditEvents.id))
		.all();
	const replaces = joint.replacesJointId
		? (db
				.select({ id: j.id, number: j.number })
				.from(j)
				.where(eq(j.id, joint.replacesJointId))
				.get() ?? null)
		: null;
	const replacedBy =
		db.select({ id: j.id, number: j.number }).from(j).where(eq(j.replacesJointId, jointId)).get() ??
		null;
	return {
		...joint,
		// A project's own set travels with the joint, so the card's live verdict judges by it.
		criteriaSet: criteriaSets.isBuiltIn(joint.criteriaSetId)
			? null
			: (criteriaSets.get(joint.projectId, joint.criteriaSetId) ?? null),
		label: displayWeldNumber(joint.number, joint.repairCycle),
		stateLabel: look.label,
		replaces,
		replacedBy,
		next: look.next,
		owner: look.owner,
		pins,
		welds: welds.map((w) => ({
			...w,
			welders: stamps
				.filter((s) => s.weldId === w.id)
				.map(({ pass, stamp, name }) => ({ pass, stamp, name }))
		})),
		inspections: inspections.map((record) => ({
			...record,
			photos: photosOf.get(record.id) ?? []
		})),
		changes
	};
}

// Writing -------------------------------------------------------------------------------

function lengthsOrThrow(fields: Partial<JointFields>, units: UnitSystem) {
	const result = jointLengths(fields, units);
	if (!result.ok) throw new DomainError(result.message, 400, result.field);
	return result.values;
}

/** A criteria set chosen for a joint is a built-in one or one of the project's own. */
function checkCriteriaSet(projectId: number, id: string, field: string, tx: Reader) {
	if (criteriaSets.resolve(projectId, id, undefined, tx)) return;
	const problem = criteriaSets.unknownSet(projectId, id, field, tx);
	throw new DomainError(problem.message, 400, field);
}

/** The view box of one sheet, in PDF points. */
export function pageBox(revisionId: number, pageIndex: number, tx: Reader = db): PageBox {
	const page = tx
		.select({ x0: schema.pages.x0, y0: schema.pages.y0, x1: schema.pages.x1, y1: schema.pages.y1 })
		.from(schema.pages)
		.where(and(eq(schema.pages.revisionId, revisionId), eq(schema.pages.pageIndex, pageIndex)))
		.get();
	if (!page) throw new DomainError(`The revision has no sheet ${pageIndex + 1}.`, 400, 'pageIndex');
	return page;
}

function numbersOf(drawingId: number, tx: Reader): string[] {
	return tx
		.select({ number: j.number })
		.from(j)
		.where(eq(j.drawingId, drawingId))
		.all()
		.map((r) => r.number);
}

export interface PlacePin {
	revisionId: number;
	pageIndex: number;
	x: number;
	y: number;
	number?: string;
	insertAfter?: string;
	joint: Partial<JointFields>;
}

/** Place a pin: a new joint at that point with the next weld number, or the one asked for. */
export function place(input: PlacePin, userId: string) {
	const revision = db
		.select({
			id: schema.revisions.id,
			status: schema.revisions.status,
			pageCount: schema.revisions.pageCount,
			drawingId: schema.drawings.id,
			projectId: schema.drawings.projectId,
			line: schema.drawings.line,
			rule: schema.projects.weldNumberRule,
			criteria: schema.projects.defaultCriteriaSet,
			units: schema.projects.units
		})
		.from(schema.revisions)
		.innerJoin(schema.drawings, eq(schema.drawings.id, schema.revisions.drawingId))
		.innerJoin(schema.projects, eq(schema.projects.id, schema.drawings.projectId))
		.where(eq(schema.revisions.id, input.revisionId))
		.get();
	if (!revision) throw new DomainError('There is no such revision.', 404);
	if (revision.status !== 'current')
		throw new DomainError('Joints are placed on the current revision only.', 409);
	if (input.pageIndex >= revision.pageCount)
		throw new DomainError(`The drawing has ${revision.pageCount} sheet(s).`, 400, 'pageIndex');
	refuse(pinPointRefusal(pageBox(revision.id, input.pageIndex), input));
	const location = input.joint.location ?? 'shop';
	const lengths = lengthsOrThrow(input.joint, revision.units);
	if (input.joint.criteriaSetId !== undefined) {
		checkCriteriaSet(revision.projectId, input.joint.criteriaSetId, 'joint.criteriaSetId', db);
	}
	return events.afterCommit((tx, tell) => {
		const used = numbersOf(revision.drawingId, tx);
		const line = input.joint.line ?? revision.line;
		// Numbers run per drawing, or on along the whole line across its drawings.
		const sequence =
			revision.rule.sequence === 'line' && line
				? tx
						.select({ number: j.number })
						.from(j)
						.where(and(eq(j.projectId, revision.projectId), eq(j.line, line)))
						.all()
						.map((r) => r.number)
						// Still unique on the drawing, whatever other lines already use there.
						.concat(used)
				: used;
		let number = input.number;
		if (!number && input.insertAfter) {
			number = insertedWeldNumber(input.insertAfter, used) ?? undefined;
			if (!number)
				throw new DomainError(
					`No letter is left to insert after ${input.insertAfter}.`,
					409,
					'insertAfter'
				);
		}
		number ??= nextWeldNumber(
			sequence,
			location === 'field' ? revision.rule.fieldPrefix : revision.rule.shopPrefix
		);
		if (used.some((n) => n.toUpperCase() === number!.toUpperCase())) {
			throw new DomainError(
				`Weld number ${number} is already used on this drawing (numbers are never reused, also after a joint is voided).`,
				409,
				'number'
			);
		}
		const now = Date.now();
		const joint = tx
			.insert(j)
			.values({
				projectId: revision.projectId,
				drawingId: revision.drawingId,
				number,
				sortKey: weldNumberSortKey(number),
				kind: input.joint.kind ?? 'butt',
				location,
				line,
				spool: input.joint.spool ?? '',
				material: input.joint.material ?? '',
				wps: input.joint.wps ?? '',
				criteriaSetId: input.joint.criteriaSetId ?? revision.criteria,
				ndeRequired: input.joint.ndeRequired ?? '',
				...lengths,
				createdBy: userId,
				createdAt: now,
				updatedAt: now,
				stateSince: now
			})
			.returning()
			.get();
		const pin = tx
			.insert(p)
			.values({
				jointId: joint.id,
				revisionId: revision.id,
				pageIndex: input.pageIndex,
				x: input.x,
				y: input.y,
				createdBy: userId
			})
			.returning()
			.get();
		audit.record(
			{
				action: 'create',
				entity: 'joint',
				entityId: joint.id,
				projectId: revision.projectId,
				userId,
				after: {
					number,
					kind: joint.kind,
					revisionId: revision.id,
					pageIndex: pin.pageIndex,
					x: pin.x,
					y: pin.y
				}
			},
			tx
		);
		tell(revision.projectId, {
			type: 'pin',
			action: 'created',
			revisionId: revision.id,
			jointId: joint.id,
			pinId: pin.id,
			by: userId
		});
		return { joint, pin };
	});
}

/** What every joint write answers when the joint changed after the caller read it. */
export const STALE_JOINT = (number: string) =>
	`Someone else changed joint ${number} since you opened it. Reload it and check before you save again.`;

/**
 * The joint, read inside the write's transaction, refused unless it is still at the version
 * the caller read: every write that changes a joint goes through here, so two people never
 * overwrite each other unseen.
 */
export function lockedJoint(tx: Tx, jointId: number, version: number) {
	const joint = row(jointId, tx);
	if (!joint) throw new DomainError('There is no such joint.', 404);
	if (joint.version !== version) throw new DomainError(STALE_JOINT(joint.number), 409, 'version');
	return joint;
}

/** Change what the joint card says about a joint. */
export function update(
	jointId: number,
	changes: Partial<JointFields> & { number?: string; version: number },
	userId: string
) {
	return events.afterCommit((tx, tell) => {
		const joint = lockedJoint(tx, jointId, changes.version);
		if (joint.voidedAt)
			throw new DomainError(`Joint ${joint.number} is void and can no longer change.`, 409);
		const { version: _version, size, thickness, requiredSize, number, ...plain } = changes;
		const lengths = lengthsOrThrow(
			{ size, thickness, requiredSize },
			projects.unitsOf(joint.projectId, tx)
		);
		if (plain.criteriaSetId !== undefined && plain.criteriaSetId !== joint.criteriaSetId) {
			checkCriteriaSet(joint.projectId, plain.criteriaSetId, 'criteriaSetId', tx);
		}
		if (number && number !== joint.number) {
			if (numbersOf(joint.drawingId, tx).some((n) => n.toUpperCase() === number.toUpperCase())) {
				throw new DomainError(
					`Weld number ${number} is already used on this drawing.`,
					409,
					'number'
				);
			}
		}
		const values = {
			...plain,
			...lengths,
			...(number ? { number, sortKey: weldNumberSortKey(number) } : {})
		};
		const before = Object.fromEntries(
			Object.keys(values).map((k) => [k, joint[k as keyof typeof joint]])
		);
		const updated = tx
			.update(j)
			.set({ ...values, version: joint.version + 1, updatedAt: Date.now() })
			.where(eq(j.id, jointId))
			.returning()
			.get();
		refreshState(jointId, tx);
		audit.record(
			{
				action: 'update',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId,
				before,
				after: values
			},
			tx
		);
		tell(joint.projectId, {
			type: 'joint',
			action: 'updated',
			jointId,
			drawingId: joint.drawingId,
			by: userId
		});
		return updated;
	});
}

/** The joint void with its reason, its pins out of review, its state cached: one transaction's part. */
function markVoid(
	tx: Tx,
	joint: { id: number; version: number },
	reason: string,
	userId: string,
	now: number
) {
	tx.update(j)
		.set({
			voidReason: reason,
			voidedAt: now,
			voidedBy: userId,
			version: joint.version + 1,
			updatedAt: now
		})
		.where(eq(j.id, joint.id))
		.run();
	tx.update(p).set({ needsReview: false }).where(eq(p.jointId, joint.id)).run();
	refreshState(joint.id, tx, now);
}

/** Void a joint: it stays in the log, greyed, and its number is never used again. */
export function voidJoint(jointId: number, reason: string, version: number, userId: string) {
	return events.afterCommit((tx, tell) => {
		const joint = lockedJoint(tx, jointId, version);
		if (joint.voidedAt) throw new DomainError(`Joint ${joint.number} is already void.`, 409);
		const now = Date.now();
		markVoid(tx, joint, reason, userId, now);
		audit.record(
			{
				action: 'void',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId,
				before: { state: joint.state },
				after: { reason }
			},
			tx
		);
		tell(joint.projectId, {
			type: 'joint',
			action: 'voided',
			jointId,
			drawingId: joint.drawingId,
			by: userId
		});
		return row(jointId, tx)!;
	});
}

/** What a cut-out copies from the joint it replaces: everything but its records. */
const CARRIED = [
	'kind',
	'location',
	'line',
	'spool',
	'sizeText',
	'diameterMm',
	'thicknessText',
	'thicknessMm',
	'requiredSizeText',
	'requiredSizeMm',
	'material',
	'wps',
	'criteriaSetId',
	'ndeRequired'
] as const;

/**
 * Cut out a welded joint: it is voided with the reason, and a new joint with the N-suffixed
 * number (`12` → `12N`) takes its place, on the same drawing, pinned at the same point of the
 * current revision, with the same kind, sizes, material, WPS, criteria set and NDE
 * requirement. One transaction, audited on both joints; the new one starts awaiting fit-up.
 */
export function cutOut(jointId: number, reason: string, version: number, userId: string) {
	return events.afterCommit((tx, tell) => {
		const joint = lockedJoint(tx, jointId, version);
		const label = displayWeldNumber(joint.number, joint.repairCycle);
		const replaced = tx
			.select({ number: j.number })
			.from(j)
			.where(eq(j.replacesJointId, jointId))
			.get();
		if (replaced)
			throw new DomainError(
				`Joint ${joint.number} has already been cut out and replaced by ${replaced.number}.`,
				409
			);
		if (joint.voidedAt)
			throw new DomainError(
				`Joint ${joint.number} is void (${joint.voidReason ?? 'voided'}); a void joint is not cut out.`,
				409
			);
		const welded = tx
			.select({ id: schema.welds.id })
			.from(schema.welds)
			.where(eq(schema.welds.jointId, jointId))
			.get();
		if (!welded)
			throw new DomainError(
				`Joint ${label} has not been welded, so there is nothing to cut out. Record a new fit-up, or void the joint if it no longer exists.`,
				409
			);
		const pin = tx
			.select({ pageIndex: p.pageIndex, x: p.x, y: p.y, revisionId: p.revisionId })
			.from(p)
			.innerJoin(schema.revisions, eq(schema.revisions.id, p.revisionId))
			.where(and(eq(p.jointId, jointId), eq(schema.revisions.status, 'current')))
			.get();
		if (!pin)
			throw new DomainError(
				`Joint ${joint.number} has no pin on the drawing's current revision; place or review it there first, so the new joint can be pinned at the same point.`,
				409
			);

		const number = cutOutWeldNumber(joint.number, numbersOf(joint.drawingId, tx));
		const now = Date.now();
		const voidReason = `Cut out: ${reason}; replaced by ${number}`;
		markVoid(tx, joint, voidReason, userId, now);
		const carried = Object.fromEntries(CARRIED.map((key) => [key, joint[key]])) as Pick<
			typeof joint,
			(typeof CARRIED)[number]
		>;
		const replacement = tx
			.insert(j)
			.values({
				...carried,
				projectId: joint.projectId,
				drawingId: joint.drawingId,
				number,
				sortKey: weldNumberSortKey(number),
				replacesJointId: jointId,
				createdBy: userId,
				createdAt: now,
				updatedAt: now,
				stateSince: now
			})
			.returning()
			.get();
		const newPin = tx
			.insert(p)
			.values({
				jointId: replacement.id,
				revisionId: pin.revisionId,
				pageIndex: pin.pageIndex,
				x: pin.x,
				y: pin.y,
				createdBy: userId,
				createdAt: now,
				updatedAt: now
			})
			.returning()
			.get();
		refreshState(replacement.id, tx, now);
		audit.record(
			{
				action: 'cut_out',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId,
				at: now,
				before: { state: joint.state, repairCycle: joint.repairCycle },
				after: { reason, replacedBy: { id: replacement.id, number } }
			},
			tx
		);
		audit.record(
			{
				action: 'create',
				entity: 'joint',
				entityId: replacement.id,
				projectId: joint.projectId,
				userId,
				at: now,
				after: {
					number,
					kind: replacement.kind,
					replaces: { id: jointId, number: joint.number },
					revisionId: newPin.revisionId,
					pageIndex: newPin.pageIndex,
					x: newPin.x,
					y: newPin.y
				}
			},
			tx
		);
		tell(joint.projectId, {
			type: 'joint',
			action: 'voided',
			jointId,
			drawingId: joint.drawingId,
			by: userId
		});
		tell(joint.projectId, {
			type: 'pin',
			action: 'created',
			revisionId: newPin.revisionId,
			jointId: replacement.id,
			pinId: newPin.id,
			by: userId
		});
		return { voided: row(jointId, tx)!, joint: row(replacement.id, tx)!, pin: newPin };
	});
}
