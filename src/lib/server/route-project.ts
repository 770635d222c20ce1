/** Which project a request belongs to, from its route parameters. */
import { eq } from 'drizzle-orm';
import { db, schema } from './db';

/** The project's id, or null when the route has no project or it does not exist. */
export function projectOf(params: Partial<Record<string, string>>): number | null {
	if (params.projectId) {
		const id = Number(params.projectId);
		const row = db
			.select({ id: schema.projects.id })
			.from(schema.projects)
			.where(eq(schema.projects.id, id))
			.get();
		return row?.id ?? null;
	}
	return null;
}
