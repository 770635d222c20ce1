/**
 * Inspection requests: hold points called by the foreman (trade practice: fit-up before
 * welding, final visual after). One row per joint, grouped by batch; the project's inspectors
 * get one e-mail per batch. A request closes itself when that inspection is recorded.
 */
import { STAGE_LABELS } from '$lib/domain';
import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import * as audit from './audit';
import * as events from './events';
import * as mail from './mail';
import * as mailTemplates from './mail-templates';
import { DomainError } from './errors';
import { displayWeldNumber, STATE_LOOKS, type InspectionStage } from '$lib/joint-state';
import { REQUESTABLE_STATES, type RequestStage } from '$lib/outstanding';
import type { InspectionRequestInput } from '$lib/schemas/outstanding';

const r = schema.inspectionRequests;
const j = schema.joints;

function projectInspectors(projectId: number) {
	return db
		.select({ email: schema.users.email, name: schema.users.name })
		.from(schema.memberships)
		.innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
		.where(
			and(
				eq(schema.memberships.projectId, projectId),
				eq(schema.memberships.role, 'inspector'),
				isNull(schema.users.disabledAt)
			)
		)
		.orderBy(asc(schema.users.email))
		.all();
}

/**
 * Request an inspection of the given joints. Every joint must be on the project, in a state
 * that stage inspects, and without an open request: else a DomainError (404, 409) naming it.
 */
export function create(projectId: number, input: InspectionRequestInput, userId: string) {
	const ids = [...new Set(input.jointIds)];
	return db.transaction((tx) => {
		const rows = tx
			.select({
				id: j.id,
				number: j.number,
				repairCycle: j.repairCycle,
				state: j.state,
				drawingId: j.drawingId,
				drawingNumber: schema.drawings.number
			})
			.from(j)
			.innerJoin(schema.drawings, eq(schema.drawings.id, j.drawingId))
			.where(and(eq(j.projectId, projectId), inArray(j.id, ids)))
			.all();
		const missing = ids.filter((id) => !rows.some((row) => row.id === id));
		if (missing.length > 0) {
			throw new DomainError(`Joint ${missing.join(', ')} is not on this project.`, 404, 'jointIds');
		}
		const name = (row: (typeof rows)[number]) =>
			`weld ${displayWeldNumber(row.number, row.repairCycle)} on ${row.drawingNumber}`;
		for (const row of rows) {
			if (!REQUESTABLE_STATES[input.stage].includes(row.state)) {
				throw new DomainError(
					`Cannot request a ${STAGE_LABELS[input.stage].word} inspection of ${name(row)}: it is ${STATE_LOOKS[row.state].label.toLowerCase()} (next: ${STATE_LOOKS[row.state].next.toLowerCase()}).`,
					409,
					'jointIds'
				);
			}
		}
		const open = tx
			.select({ jointId: r.jointId, requestedAt: r.requestedAt })
			.from(r)
			.where(and(inArray(r.jointId, ids), eq(r.stage, input.stage), isNull(r.closedAt)))
			.all();
		if (open.length > 0) {
			const row = rows.find((x) => x.id === open[0].jointId)!;
			throw new DomainError(
				`A ${STAGE_LABELS[input.stage].word} inspection of ${name(row)} is already requested (since ${new Date(open[0].requestedAt).toISOString().slice(0, 16).replace('T', ' ')} UTC).`,
				409,
				'jointIds'
			);
		}
		const batch = crypto.randomUUID();
		const now = Date.now();
		const note = input.note ?? '';
		const requests = rows.map((row) =>
			tx
				.insert(r)
				.values({
					projectId,
					batch,
					jointId: row.id,
					stage: input.stage,
					note,
					requestedBy: userId,
					requestedAt: now
				})
				.returning()
				.get()
		);
		audit.record(
			{
				action: 'inspection_request',
				entity: 'inspection_request',
				entityId: batch,
				projectId,
				userId,
				at: now,
				after: { stage: input.stage, jointIds: ids, note }
			},
			tx
		);
		return {
			batch,
			requests: requests.map((request) => {
				const row = rows.find((x) => x.id === request.jointId)!;
				return {
					...request,
					number: row.number,
					label: displayWeldNumber(row.number, row.repairCycle),
					drawingId: row.drawingId,
					drawingNumber: row.drawingNumber
				};
			})
		};
	});
}

export type CreatedBatch = ReturnType<typeof create>;

/**
 * Tell the project's inspectors, one e-mail each per batch. Sent after the requests are
 * stored: a mail server that is down does not lose the hold point, it shows on the board.
 */
export async function notify(
	projectId: number,
	created: CreatedBatch,
	stage: RequestStage,
	requestedBy: string,
	origin: string
): Promise<string[]> {
	const project = db
		.select({ code: schema.projects.code, name: schema.projects.name })
		.from(schema.projects)
		.where(eq(schema.projects.id, projectId))
		.get()!;
	const who =
		db
			.select({ name: schema.users.name, email: schema.users.email })
			.from(schema.users)
			.where(eq(schema.users.id, requestedBy))
			.get() ?? null;
	const pages = db
		.select({ jointId: schema.pins.jointId, pageIndex: schema.pins.pageIndex })
		.from(schema.pins)
		.innerJoin(schema.revisions, eq(schema.revisions.id, schema.pins.revisionId))
		.where(
			and(
				inArray(
					schema.pins.jointId,
					created.requests.map((q) => q.jointId)
				),
				eq(schema.revisions.status, 'current')
			)
		)
		.all();
	const welds = created.requests.map((q) => {
		const pageIndex = pages.find((p) => p.jointId === q.jointId)?.pageIndex;
		const query = new URLSearchParams({
			...(pageIndex === undefined ? {} : { page: String(pageIndex + 1) }),
			weld: q.number
		});
		return {
			label: q.label,
			drawingNumber: q.drawingNumber,
			url: `${origin}/projects/${projectId}/drawings/${q.drawingId}?${query}`
		};
	});
	const inspectors = projectInspectors(projectId);
	for (const inspector of inspectors) {
		await mail.send(
			mailTemplates.inspectionRequest(inspector.email, {
				project: `${project.code} ${project.name}`,
				stage: STAGE_LABELS[stage].word,
				requestedBy: who?.name ?? who?.email ?? 'The foreman',
				note: created.requests[0]?.note ?? '',
				welds,
				boardUrl: `${origin}/projects/${projectId}/outstanding`
			})
		);
	}
	for (const q of created.requests) {
		events.publish(projectId, {
			type: 'joint',
			action: 'updated',
			jointId: q.jointId,
			drawingId: q.drawingId,
			by: requestedBy
		});
	}
	return inspectors.map((i) => i.email);
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * Close the joint's open request of the stage just inspected, inside the transaction that
 * records the inspection, so a hold point is never released without its record. NDE is not
 * requested through the board, so an NDE result closes nothing.
 */
export function closeByInspection(
	tx: Pick<Tx, 'update'>,
	jointId: number,
	stage: InspectionStage,
	inspectionId: number,
	at: number
): void {
	if (stage === 'nde') return;
	tx.update(r)
		.set({ closedAt: at, closedByInspectionId: inspectionId })
		.where(and(eq(r.jointId, jointId), eq(r.stage, stage), isNull(r.closedAt)))
		.run();
}

/** A project's requests, newest first, with how long each waited (or has waited so far). */
export function list(projectId: number, options: { open?: boolean; limit?: number } = {}) {
	const now = Date.now();
	return db
		.select({
			id: r.id,
			batch: r.batch,
			stage: r.stage,
			jointId: r.jointId,
			number: j.number,
			drawingId: j.drawingId,
			note: r.note,
			requestedAt: r.requestedAt,
			closedAt: r.closedAt,
			closedByInspectionId: r.closedByInspectionId
		})
		.from(r)
		.innerJoin(j, eq(j.id, r.jointId))
		.where(and(eq(r.projectId, projectId), options.open ? isNull(r.closedAt) : undefined))
		.orderBy(asc(r.requestedAt))
		.limit(Math.min(options.limit ?? 100, 500))
		.all()
		.map((q) => ({ ...q, waitedMs: (q.closedAt ?? now) - q.requestedAt }));
}
