/**
 * Joints: the weld register. A joint is created by placing its pin on a sheet; its state is
 * derived from the records and cached in the same transaction as every change. Every write
 * names the version it was based on; a stale one is refused with 409.
 */
import { CAUTION } from '$lib/caution';
import { DomainError, refuse } from './errors';
import { and, asc, desc, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import * as audit from './audit';
import * as projects from './projects';
import * as criteriaSets from './criteria-sets';
import * as events from './events';
import { lotSample } from './nde/standing';
import * as nde from './nde';
import * as wpsRegister from './wps';
import { jointDesign, rangeFlags, wpsLabel } from '$lib/wps-register';
import { config } from './config';
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
const rw = schema.retiredWeldNumbers;

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
		// NDE lots: a weld not itself selected stands or falls with its lot's sample.
		lotSample: lotSample(tx, jointId),
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
	const wpsRow = joint.wpsId ? wpsRegister.row(joint.wpsId) : undefined;
	const wpsRecord = wpsRow ? wpsRegister.recordOf(wpsRow) : undefined;
	// The hold points called on this weld and not yet inspected: who called them, when, why.
	const openRequests = db
		.select({
			stage: schema.inspectionRequests.stage,
			note: schema.inspectionRequests.note,
			requestedAt: schema.inspectionRequests.requestedAt,
			requestedBy: schema.users.name,
			requestedByEmail: schema.users.email
		})
		.from(schema.inspectionRequests)
		.leftJoin(schema.users, eq(schema.users.id, schema.inspectionRequests.requestedBy))
		.where(
			and(
				eq(schema.inspectionRequests.jointId, jointId),
				isNull(schema.inspectionRequests.closedAt)
			)
		)
		.all();
	return {
		...joint,
		openRequests,
		// The WPS the joint names, its joint design for the card's live verdict, and where the
		// joint lies outside the ranges it qualifies.
		wpsEntry:
			wpsRow && wpsRecord
				? {
						id: wpsRow.id,
						number: wpsRow.number,
						revision: wpsRow.revision,
						label: wpsLabel(wpsRow),
						status: wpsRow.status,
						processes: wpsRecord.processes,
						design: jointDesign(wpsRecord)
					}
				: null,
		wpsFlags: wpsRecord ? rangeFlags(wpsRecord, joint, projects.unitsOf(joint.projectId)) : [],
		wpsChoices: wpsRegister
			.approved(joint.projectId)
			.map((w) => ({ id: w.id, label: wpsLabel(w), title: w.title })),
		// A project's own set travels with the joint, so the card's live verdict judges by it.
		criteriaSet: criteriaSets.isBuiltIn(joint.criteriaSetId)
			? null
			: (criteriaSets.get(joint.projectId, joint.criteriaSetId) ?? null),
		label: displayWeldNumber(joint.number, joint.repairCycle),
		/** Until when the joint can be taken back (Undo), or null. */
		undoUntil: takeBackUntil(joint),
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
		changes,
		notice: CAUTION
	};
}

// Writing -------------------------------------------------------------------------------

/**
 * The register's WPS a joint is to name: one of the project's, approved (a superseded or
 * draft one only where the joint already names it). Its number becomes the joint's WPS text.
 */
function wpsChoiceOrThrow(projectId: number, wpsId: number, currentId: number | null, tx: Reader) {
	const chosen = wpsRegister.row(wpsId, tx);
	if (!chosen || chosen.projectId !== projectId) {
		throw new DomainError("Choose a WPS from this project's register.", 400, 'wpsId');
	}
	if (chosen.status !== 'approved' && chosen.id !== currentId) {
		throw new DomainError(
			`WPS ${wpsLabel(chosen)} is ${chosen.status}, not approved: choose an approved WPS.`,
			400,
			'wpsId'
		);
	}
	return chosen;
}

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

/** The numbers a drawing gave up when its joints were renumbered: never used again. */
function retiredOf(drawingId: number, tx: Reader) {
	return tx
		.select({ number: rw.number, key: rw.key, jointId: rw.jointId })
		.from(rw)
		.where(eq(rw.drawingId, drawingId))
		.all();
}

/**
 * Every number the drawing has used: its joints' (void ones too) and the retired ones. A
 * number is compared in capitals, so `fw-3` and `FW-3` are the same weld.
 */
export function usedNumbers(drawingId: number, tx: Reader = db): string[] {
	return numbersOf(drawingId, tx).concat(retiredOf(drawingId, tx).map((r) => r.number));
}

/** Refuse a number the drawing already uses or used before, naming which. */
function checkNumberFree(drawingId: number, number: string, tx: Reader, jointId?: number) {
	const key = number.toUpperCase();
	const holder = tx
		.select({ id: j.id, number: j.number, voidedAt: j.voidedAt })
		.from(j)
		.where(and(eq(j.drawingId, drawingId), sql`upper(${j.number}) = ${key}`))
		.get();
	if (holder && holder.id !== jointId)
		throw new DomainError(
			holder.voidedAt
				? `Weld number ${holder.number} belongs to a void joint on this drawing; numbers are never reused.`
				: `Weld number ${holder.number} is already used on this drawing.`,
			409,
			'number'
		);
	const retired = retiredOf(drawingId, tx).find((r) => r.key === key);
	if (retired && retired.jointId !== jointId)
		throw new DomainError(
			`Weld number ${retired.number} was used on this drawing before (its joint was renumbered); numbers are never reused.`,
			409,
			'number'
		);
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
		throw new DomainError('Welds are placed on the current revision only.', 409);
	if (input.pageIndex >= revision.pageCount)
		throw new DomainError(`The drawing has ${revision.pageCount} sheet(s).`, 400, 'pageIndex');
	refuse(pinPointRefusal(pageBox(revision.id, input.pageIndex), input));
	const location = input.joint.location ?? 'shop';
	const lengths = lengthsOrThrow(input.joint, revision.units);
	if (input.joint.criteriaSetId !== undefined) {
		checkCriteriaSet(revision.projectId, input.joint.criteriaSetId, 'joint.criteriaSetId', db);
	}
	return events.afterCommit((tx, tell) => {
		const used = usedNumbers(revision.drawingId, tx);
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
		checkNumberFree(revision.drawingId, number, tx);
		const wpsChosen =
			input.joint.wpsId != null
				? wpsChoiceOrThrow(revision.projectId, input.joint.wpsId, null, tx)
				: undefined;
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
				wps: wpsChosen?.number ?? input.joint.wps ?? '',
				wpsId: wpsChosen?.id ?? null,
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
	`Someone else changed weld ${number} since you opened it. Reload it and check what changed before you save again.`;

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
			throw new DomainError(`Weld ${joint.number} is void and can no longer change.`, 409);
		const { version: _version, size, thickness, requiredSize, number, ...plain } = changes;
		const lengths = lengthsOrThrow(
			{ size, thickness, requiredSize },
			projects.unitsOf(joint.projectId, tx)
		);
		if (plain.criteriaSetId !== undefined && plain.criteriaSetId !== joint.criteriaSetId) {
			checkCriteriaSet(joint.projectId, plain.criteriaSetId, 'criteriaSetId', tx);
		}
		if (plain.wpsId !== undefined && plain.wpsId !== joint.wpsId) {
			if (plain.wpsId !== null) {
				const chosen = wpsChoiceOrThrow(joint.projectId, plain.wpsId, joint.wpsId, tx);
				plain.wps = chosen.number;
			} else plain.wps ??= '';
		} else if (plain.wpsId === undefined && plain.wps !== undefined && joint.wpsId !== null) {
			// Text typed over a WPS of the register leaves the register's WPS.
			const current = wpsRegister.row(joint.wpsId, tx);
			if (current && plain.wps.trim() !== current.number) plain.wpsId = null;
		}
		const renumbered = number !== undefined && number !== joint.number ? number : undefined;
		if (renumbered !== undefined) renumber(tx, joint, renumbered, userId);
		const values = { ...plain, ...lengths };
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
		if (Object.keys(values).length > 0)
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

/**
 * Give a joint another weld number inside the caller's transaction: the new one must be free
 * on the drawing, and the old one is retired so it is never handed out again. A joint may take
 * back a number it gave up itself (a slip of the keyboard undone); nobody else may.
 */
function renumber(
	tx: Tx,
	joint: { id: number; number: string; drawingId: number; projectId: number },
	number: string,
	userId: string
) {
	const changesCase = number.toUpperCase() === joint.number.toUpperCase();
	if (!changesCase) checkNumberFree(joint.drawingId, number, tx, joint.id);
	tx.delete(rw)
		.where(and(eq(rw.drawingId, joint.drawingId), eq(rw.key, number.toUpperCase())))
		.run();
	if (!changesCase)
		tx.insert(rw)
			.values({
				drawingId: joint.drawingId,
				number: joint.number,
				key: joint.number.toUpperCase(),
				jointId: joint.id,
				retiredBy: userId
			})
			.onConflictDoNothing()
			.run();
	tx.update(j)
		.set({ number, sortKey: weldNumberSortKey(number) })
		.where(eq(j.id, joint.id))
		.run();
	audit.record(
		{
			action: 'renumber',
			entity: 'joint',
			entityId: joint.id,
			projectId: joint.projectId,
			userId,
			before: { number: joint.number },
			after: { number }
		},
		tx
	);
}

/**
 * Why a joint can no longer be taken back, or null while it can: placed in the last minutes
 * (`UNDO_PLACE_MINUTES`), not a cut-out's replacement, and with no weld, inspection, request
 * or NDE selection on it. Such a joint was a slip; its number was never used on a record.
 */
export function takeBackRefusal(
	joint: {
		id: number;
		number: string;
		createdAt: number;
		voidedAt: number | null;
		replacesJointId: number | null;
	},
	tx: Reader = db,
	at = Date.now()
): string | null {
	const minutes = config.undoPlaceMinutes;
	if (joint.voidedAt) return `Joint ${joint.number} is void; a void joint stays in the log.`;
	if (joint.replacesJointId)
		return `Joint ${joint.number} replaces a cut-out joint; void it instead if it was a mistake.`;
	if (at - joint.createdAt > minutes * 60_000)
		return `Joint ${joint.number} was placed more than ${minutes} minutes ago; void it instead, with the reason.`;
	const has = (
		table:
			| typeof schema.welds
			| typeof schema.inspections
			| typeof schema.inspectionRequests
			| typeof schema.ndeSelections
	) =>
		tx.select({ id: table.id }).from(table).where(eq(table.jointId, joint.id)).get() !== undefined;
	if (
		has(schema.welds) ||
		has(schema.inspections) ||
		has(schema.inspectionRequests) ||
		has(schema.ndeSelections)
	)
		return `Joint ${joint.number} already has records; void it instead, with the reason.`;
	return null;
}

/** Until when a joint can be taken back (UTC ms), or null when it cannot. */
export function takeBackUntil(joint: Parameters<typeof takeBackRefusal>[0], tx: Reader = db) {
	return takeBackRefusal(joint, tx) ? null : joint.createdAt + config.undoPlaceMinutes * 60_000;
}

/**
 * Take back a joint placed by mistake: the joint and its pins are deleted, so its number is
 * free again (the one exception to "never reused": it was never used on a record). A
 * suggestion it was accepted from is offered again. Audited.
 */
export function takeBack(jointId: number, version: number | undefined, userId: string) {
	return events.afterCommit((tx, tell) => {
		const joint = version === undefined ? row(jointId, tx) : lockedJoint(tx, jointId, version);
		if (!joint) throw new DomainError('There is no such joint.', 404);
		const refusal = takeBackRefusal(joint, tx);
		if (refusal) throw new DomainError(refusal, 409);
		const pins = tx
			.select({ id: p.id, revisionId: p.revisionId, pageIndex: p.pageIndex, x: p.x, y: p.y })
			.from(p)
			.where(eq(p.jointId, jointId))
			.all();
		tx.update(schema.sheetSuggestions)
			.set({ status: 'open', jointId: null, decidedBy: null, decidedAt: null })
			.where(eq(schema.sheetSuggestions.jointId, jointId))
			.run();
		tx.delete(j).where(eq(j.id, jointId)).run();
		audit.record(
			{
				action: 'take_back',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId,
				before: { number: joint.number, drawingId: joint.drawingId, pins }
			},
			tx
		);
		for (const pin of pins)
			tell(joint.projectId, {
				type: 'pin',
				action: 'removed',
				revisionId: pin.revisionId,
				jointId,
				pinId: pin.id,
				by: userId
			});
		return { number: joint.number };
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
		if (joint.voidedAt) throw new DomainError(`Weld ${joint.number} is already void.`, 409);
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
	'wpsId',
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
				`Weld ${joint.number} has already been cut out and replaced by ${replaced.number}.`,
				409
			);
		if (joint.voidedAt)
			throw new DomainError(
				`Weld ${joint.number} is void (${joint.voidReason ?? 'voided'}); a void weld is not cut out.`,
				409
			);
		const welded = tx
			.select({ id: schema.welds.id })
			.from(schema.welds)
			.where(eq(schema.welds.jointId, jointId))
			.get();
		if (!welded)
			throw new DomainError(
				`Weld ${label} has not been welded, so there is nothing to cut out. Record a new fit-up, or void the weld if it no longer exists.`,
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
				`Weld ${joint.number} has no mark on the drawing's current revision; place or review it there first, so the new weld can be marked at the same point.`,
				409
			);

		const number = cutOutWeldNumber(joint.number, usedNumbers(joint.drawingId, tx));
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
		// NDE lots: the replacement takes over the cut-out weld's lots and selections.
		nde.afterCutOut(tx, jointId, replacement.id, now);
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
