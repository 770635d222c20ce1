/** Projects and the counts their overview shows. */
import { and, asc, count, eq, inArray, ne } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import type { StateCounts } from '$lib/state-counts';
import * as counting from './state-counts';
import * as audit from './audit';
import type { z } from 'zod';
import type { UnitSystem } from '$lib/domain';
import { visibleProjectIds, type Principal } from '$lib/permissions';
import type { projectSettingsSchema } from '$lib/schemas/project';

export function list(projectIds?: readonly number[]) {
	const query = db.select().from(schema.projects);
	const rows = projectIds
		? query
				.where(inArray(schema.projects.id, [...projectIds]))
				.orderBy(asc(schema.projects.code))
				.all()
		: query.orderBy(asc(schema.projects.code)).all();
	return rows;
}

export type NewProject = Pick<typeof schema.projects.$inferInsert, 'code' | 'name'> &
	Partial<
		Pick<
			typeof schema.projects.$inferInsert,
			| 'client'
			| 'contractor'
			| 'site'
			| 'units'
			| 'defaultCriteriaSet'
			| 'weldNumberRule'
			| 'ndeLotRule'
		>
	>;

/** Open a project; what it was opened with goes to the audit trail. */
export function create(input: NewProject, userId: string) {
	return db.transaction((tx) => {
		const project = tx.insert(schema.projects).values(input).returning().get();
		audit.record(
			{
				action: 'create',
				entity: 'project',
				entityId: project.id,
				projectId: project.id,
				userId,
				after: { ...input }
			},
			tx
		);
		return project;
	});
}

export function get(projectId: number) {
	return db.select().from(schema.projects).where(eq(schema.projects.id, projectId)).get();
}

/** Joints per state for each of the given projects, from the kept counts. */
export function stateCounts(projectIds: readonly number[]): Map<number, StateCounts> {
	return counting.byProject(projectIds);
}

/** Joints per state and area, for the overview's breakdown. */
export function stateCountsByArea(projectId: number) {
	return counting.byArea(projectId);
}

/** Pins that a document controller still has to confirm on current revisions. */
export function pinsToReview(projectId: number): number {
	return (
		db
			.select({ n: count() })
			.from(schema.pins)
			.innerJoin(schema.joints, eq(schema.joints.id, schema.pins.jointId))
			.innerJoin(schema.revisions, eq(schema.revisions.id, schema.pins.revisionId))
			.where(
				and(
					eq(schema.joints.projectId, projectId),
					eq(schema.pins.needsReview, true),
					eq(schema.revisions.status, 'current'),
					ne(schema.joints.state, 'void')
				)
			)
			.get()?.n ?? 0
	);
}

/** Change a project's settings; the values before and after go to the audit trail. */
export function updateSettings(
	projectId: number,
	input: z.infer<typeof projectSettingsSchema>,
	userId: string
) {
	const before = get(projectId);
	if (!before) return undefined;
	const values = {
		name: input.name,
		client: input.client,
		contractor: input.contractor,
		site: input.site,
		defaultCriteriaSet: input.defaultCriteriaSet,
		weldNumberRule: {
			shopPrefix: input.shopPrefix,
			fieldPrefix: input.fieldPrefix,
			sequence: input.sequence
		}
	};
	return db.transaction((tx) => {
		const updated = tx
			.update(schema.projects)
			.set(values)
			.where(eq(schema.projects.id, projectId))
			.returning()
			.get();
		const changed = Object.keys(values).filter(
			(k) =>
				JSON.stringify(before[k as keyof typeof before]) !==
				JSON.stringify(values[k as keyof typeof values])
		);
		audit.record(
			{
				action: 'settings_change',
				entity: 'project',
				entityId: projectId,
				projectId,
				userId,
				before: Object.fromEntries(changed.map((k) => [k, before[k as keyof typeof before]])),
				after: Object.fromEntries(changed.map((k) => [k, values[k as keyof typeof values]]))
			},
			tx
		);
		return updated;
	});
}

/** The project's unit system: what a bare number typed on its forms means. */
export function unitsOf(projectId: number, reader: Pick<Db, 'select'> = db): UnitSystem {
	return (
		reader
			.select({ units: schema.projects.units })
			.from(schema.projects)
			.where(eq(schema.projects.id, projectId))
			.get()?.units ?? 'imperial'
	);
}

/** The projects the caller may see, as the project switcher and the API list them. */
export function visibleTo(principal: Principal) {
	return list(visibleProjectIds(principal));
}
