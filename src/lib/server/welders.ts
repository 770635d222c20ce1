/** The welder register of a project: stamps, names and qualified processes. */
import { asc, eq, inArray } from 'drizzle-orm';
import { db, schema } from './db';

export function list(projectId: number) {
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
	return rows.map((w) => ({
		id: w.id,
		stamp: w.stamp,
		name: w.name,
		employer: w.employer,
		status: w.status,
		processes: qualifications
			.filter((q) => q.welderId === w.id)
			.map(({ process, reference, qualifiedOn, expiresOn, lastUsedOn }) => ({
				process,
				reference,
				qualifiedOn,
				expiresOn,
				lastUsedOn
			}))
	}));
}
