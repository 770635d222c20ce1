import { asc, eq } from 'drizzle-orm';
import { db, schema } from '$lib/server/db';
import type { PageServerLoad } from './$types';

/** The existing drawings, so each dropped file can be matched to its drawing by number. */
export const load = (async ({ parent }) => {
	const { project } = await parent();
	const rows = db
		.select({
			id: schema.drawings.id,
			number: schema.drawings.number,
			title: schema.drawings.title,
			kind: schema.drawings.kind,
			label: schema.revisions.label,
			status: schema.revisions.status
		})
		.from(schema.drawings)
		.leftJoin(schema.revisions, eq(schema.revisions.drawingId, schema.drawings.id))
		.where(eq(schema.drawings.projectId, project.id))
		.orderBy(asc(schema.drawings.number), asc(schema.revisions.uploadedAt))
		.all();
	const drawings = new Map<
		string,
		{
			id: number;
			number: string;
			title: string;
			kind: string;
			labels: string[];
			current: string | null;
		}
	>();
	for (const row of rows) {
		const entry = drawings.get(row.number) ?? {
			id: row.id,
			number: row.number,
			title: row.title,
			kind: row.kind,
			labels: [],
			current: null
		};
		if (row.label) entry.labels.push(row.label);
		if (row.status === 'current') entry.current = row.label;
		drawings.set(row.number, entry);
	}
	return { title: `Upload drawings · ${project.code}`, existing: [...drawings.values()] };
}) satisfies PageServerLoad;
