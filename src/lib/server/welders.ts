/**
 * The welder register of a project: stamps, names, qualified processes with their continuity,
 * and each welder's record (welds made, examined, rejected, repair rate on a joint basis).
 */
import { DomainError } from './errors';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { db, schema } from './db';
import * as audit from './audit';
import { stampKey } from '$lib/domain';
import { standingSql } from './inspections';
import { addDays, checkQualification, validThrough } from '$lib/welder-qualification';
import type { QualificationInput, WelderInput } from '$lib/schemas/outstanding';

/** Lapses within this many days are listed so the foreman can renew or reassign in time. */
export const LAPSE_WARNING_DAYS = 30;

function todayUtc(): string {
	return new Date().toISOString().slice(0, 10);
}

/** The last day a welder may weld a process, for the register. */
export { validThrough };

/** Per welder: welds stamped, welds with an NDE result, and of those, welds rejected. */
function records(projectId: number) {
	// Joint basis (trade practice §4): rejected welds ÷ welds examined by NDE, counting each
	// weld (original or repair cycle) once; a corrected result counts as corrected.
	return db.all<{ welderId: number; made: number; examined: number; rejected: number }>(sql`
		select ww.welder_id as welderId,
			count(distinct w.id) as made,
			count(distinct case when i.id is not null then w.id end) as examined,
			count(distinct case when i.decision = 'reject' then w.id end) as rejected
		from ${schema.weldWelders} ww
		join ${schema.welders} wr on wr.id = ww.welder_id
		join ${schema.welds} w on w.id = ww.weld_id
		left join ${schema.inspections} i on i.joint_id = w.joint_id and i.stage = 'nde'
			and i.repair_cycle = w.repair_cycle
			and ${standingSql(sql`i.id`)}
		where wr.project_id = ${projectId}
		group by ww.welder_id`);
}

export function list(projectId: number, options: { today?: string } = {}) {
	const today = options.today ?? todayUtc();
	const warnUntil = addDays(today, LAPSE_WARNING_DAYS);
	const rows = db
		.select()
		.from(schema.welders)
		.where(eq(schema.welders.projectId, projectId))
		.orderBy(asc(schema.welders.stamp))
		.all();
	const qualifications = rows.length
		? db
				.select()
				.from(schema.welderQualifications)
				.where(
					inArray(
						schema.welderQualifications.welderId,
						rows.map((w) => w.id)
					)
				)
				.orderBy(asc(schema.welderQualifications.process))
				.all()
		: [];
	const counted = new Map(records(projectId).map((r) => [r.welderId, r]));
	return rows.map((w) => {
		const record = counted.get(w.id);
		const examined = record?.examined ?? 0;
		const rejected = record?.rejected ?? 0;
		return {
			id: w.id,
			stamp: w.stamp,
			name: w.name,
			employer: w.employer,
			status: w.status,
			processes: qualifications
				.filter((q) => q.welderId === w.id)
				.map(({ process, reference, qualifiedOn, expiresOn, lastUsedOn }) => {
					const through = validThrough({ qualifiedOn, expiresOn, lastUsedOn });
					const check = checkQualification({ process, qualifiedOn, expiresOn, lastUsedOn }, today);
					return {
						process,
						reference,
						qualifiedOn,
						expiresOn,
						lastUsedOn,
						validThrough: through,
						current: check.ok,
						lapsingSoon: check.ok && through <= warnUntil
					};
				}),
			welds: {
				made: record?.made ?? 0,
				examined,
				rejected,
				/** Rejected ÷ examined, 0 to 1; null before any weld of theirs is examined. */
				repairRate: examined > 0 ? rejected / examined : null
			}
		};
	});
}

export type RegisterWelder = ReturnType<typeof list>[number];

/** Qualifications still current that lapse within LAPSE_WARNING_DAYS of today, soonest first. */
export function lapsing(projectId: number, options: { today?: string } = {}) {
	return lapsingOf(list(projectId, options));
}

function lapsingOf(items: RegisterWelder[]) {
	return items
		.filter((w) => w.status === 'active')
		.flatMap((w) =>
			w.processes
				.filter((p) => p.lapsingSoon)
				.map((p) => ({
					welderId: w.id,
					stamp: w.stamp,
					name: w.name,
					process: p.process,
					lastUsedOn: p.lastUsedOn,
					validThrough: p.validThrough
				}))
		)
		.sort((a, b) => a.validThrough.localeCompare(b.validThrough) || a.stamp.localeCompare(b.stamp));
}

/** The register as GET /api/projects/{id}/welders answers it. */
export function register(projectId: number, options: { today?: string } = {}) {
	const today = options.today ?? todayUtc();
	const items = list(projectId, { today });
	return {
		items,
		lapsing: lapsingOf(items),
		today,
		warningDays: LAPSE_WARNING_DAYS
	};
}

function ownWelder(projectId: number, welderId: number) {
	const welder = db
		.select()
		.from(schema.welders)
		.where(and(eq(schema.welders.id, welderId), eq(schema.welders.projectId, projectId)))
		.get();
	if (!welder) throw new DomainError('There is no such welder on this project.', 404, 'welderId');
	return welder;
}

/** Add a welder; the stamp is unique per project, read without regard to case as welds read it. */
export function create(projectId: number, input: WelderInput, userId: string) {
	return db.transaction((tx) => {
		const taken = tx
			.select({ stamp: schema.welders.stamp, name: schema.welders.name })
			.from(schema.welders)
			.where(
				and(
					eq(schema.welders.projectId, projectId),
					eq(schema.welders.stampKey, stampKey(input.stamp))
				)
			)
			.get();
		if (taken) {
			throw new DomainError(
				`Stamp ${taken.stamp} is already ${taken.name}'s on this project; each welder's stamp is unique so every weld traces to one person.`,
				409,
				'stamp'
			);
		}
		const welder = tx
			.insert(schema.welders)
			.values({
				projectId,
				stamp: input.stamp,
				stampKey: stampKey(input.stamp),
				name: input.name,
				employer: input.employer
			})
			.returning()
			.get();
		for (const q of input.processes) {
			tx.insert(schema.welderQualifications)
				.values({
					welderId: welder.id,
					process: q.process,
					reference: q.reference,
					qualifiedOn: q.qualifiedOn,
					expiresOn: q.expiresOn ?? null
				})
				.run();
		}
		audit.record(
			{
				action: 'create',
				entity: 'welder',
				entityId: welder.id,
				projectId,
				userId,
				after: { ...input }
			},
			tx
		);
		return welder;
	});
}

/**
 * Add a process qualification, or renew one: a new test date restarts continuity
 * (ASME IX QW-322.2: one test coupon renews the process).
 */
export function qualify(
	projectId: number,
	welderId: number,
	input: QualificationInput,
	userId: string
) {
	const welder = ownWelder(projectId, welderId);
	return db.transaction((tx) => {
		const existing = tx
			.select()
			.from(schema.welderQualifications)
			.where(
				and(
					eq(schema.welderQualifications.welderId, welder.id),
					eq(schema.welderQualifications.process, input.process)
				)
			)
			.get();
		const values = {
			reference: input.reference,
			qualifiedOn: input.qualifiedOn,
			expiresOn: input.expiresOn ?? null
		};
		if (existing) {
			tx.update(schema.welderQualifications)
				.set(values)
				.where(eq(schema.welderQualifications.id, existing.id))
				.run();
		} else {
			tx.insert(schema.welderQualifications)
				.values({ welderId: welder.id, process: input.process, ...values })
				.run();
		}
		audit.record(
			{
				action: existing ? 'requalify' : 'qualify',
				entity: 'welder',
				entityId: welder.id,
				projectId,
				userId,
				before: existing ?? null,
				after: { process: input.process, ...values }
			},
			tx
		);
	});
}

/** Active or inactive: an inactive welder's stamp is refused on new welds, history stays. */
export function setStatus(
	projectId: number,
	welderId: number,
	status: 'active' | 'inactive',
	userId: string
) {
	const welder = ownWelder(projectId, welderId);
	db.transaction((tx) => {
		tx.update(schema.welders).set({ status }).where(eq(schema.welders.id, welder.id)).run();
		audit.record(
			{
				action: 'status',
				entity: 'welder',
				entityId: welder.id,
				projectId,
				userId,
				before: { status: welder.status },
				after: { status }
			},
			tx
		);
	});
}
